import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { z } from "zod";
import { signInWithPassword } from "@/lib/services/sign-in";
import { endSessions } from "@/lib/services/users";
import { sessionSecret } from "./secret";
import { env, secureCookies, trustRequestHostUnlessUrlPinned } from "@/lib/env";
import { sameOriginRedirect } from "./callback-url";
import { continueSessionToken, startSessionToken, type SessionLimits } from "./session-policy";
import { decodeSessionToken, encodeSessionToken } from "./session-token";

trustRequestHostUnlessUrlPinned();

const credentialsSchema = z.object({
  email: z.string().trim().email(),
  password: z.string().min(1),
});

export function sessionLimits(): SessionLimits {
  const { PAPIN_SESSION_IDLE_MINUTES, PAPIN_SESSION_MAX_HOURS } = env();
  return { idleMs: PAPIN_SESSION_IDLE_MINUTES * 60_000, maxMs: PAPIN_SESSION_MAX_HOURS * 3_600_000 };
}

let cached: NextAuthOptions | undefined;

export function authOptions(): NextAuthOptions {
  if (cached) return cached;
  cached = {
    secret: sessionSecret(),
    // The cookie lives no longer than the absolute lifetime; the jwt callback enforces both limits itself.
    session: { strategy: "jwt", maxAge: Math.ceil(sessionLimits().maxMs / 1000) },
    jwt: { decode: decodeSessionToken, encode: encodeSessionToken },
    useSecureCookies: secureCookies(),
    pages: { signIn: "/sign-in", error: "/sign-in" },
    providers: [
      CredentialsProvider({
        name: "Papin account",
        credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
        async authorize(raw, request) {
          const parsed = credentialsSchema.safeParse(raw);
          if (!parsed.success) return null;
          const result = await signInWithPassword({ ...parsed.data, headers: request?.headers });
          // next-auth passes a thrown message on to the form as its error code (lib/auth/messages.ts).
          if (!result.ok) {
            if (result.code === "CredentialsSignin") return null;
            throw new Error(result.code);
          }
          const { user } = result;
          return { id: user.id, email: user.email, name: user.name, role: user.role, siteId: user.siteId, sessionVersion: user.sessionVersion };
        },
      }),
    ],
    callbacks: {
      async redirect(params) {
        return sameOriginRedirect(params);
      },
      async jwt({ token, user }) {
        if (user) return startSessionToken(token, { id: user.id, role: user.role, siteId: user.siteId, sessionVersion: user.sessionVersion }, Date.now());
        return continueSessionToken(token, Date.now(), sessionLimits());
      },
      async session({ session, token }) {
        session.user = {
          id: token.uid ?? "",
          email: token.email ?? "",
          name: token.name ?? "",
          role: token.role ?? "technician",
          siteId: token.siteId ?? null,
          sessionVersion: token.sv,
        };
        return session;
      },
    },
    events: {
      // Signing out ends every session of the account, not only this browser's cookie.
      async signOut({ token }) {
        if (token?.uid && typeof token.sv === "number") await endSessions({ userId: token.uid, sessionVersion: token.sv });
      },
    },
  };
  return cached;
}

import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { z } from "zod";
import { getUserByEmail, markSignedIn } from "@/db/queries/users";
import { recordAuditEvent } from "@/db/queries/audit";
import { randomUUID } from "node:crypto";
import { hashPassword, verifyPassword } from "./password";
import { sessionSecret } from "./secret";
import { secureCookies, trustRequestHostUnlessUrlPinned } from "@/lib/env";
import { sameOriginRedirect } from "./callback-url";

trustRequestHostUnlessUrlPinned();

const credentialsSchema = z.object({
  email: z.string().trim().email(),
  password: z.string().min(1),
});

// Checking a password that belongs to no account still costs one hash, so timing tells nothing.
let dummyHash: Promise<string> | undefined;
const timingDecoy = () => (dummyHash ??= hashPassword(randomUUID()));

let cached: NextAuthOptions | undefined;

export function authOptions(): NextAuthOptions {
  if (cached) return cached;
  cached = {
    secret: sessionSecret(),
    session: { strategy: "jwt", maxAge: 8 * 60 * 60 },
    useSecureCookies: secureCookies(),
    pages: { signIn: "/sign-in", error: "/sign-in" },
    providers: [
      CredentialsProvider({
        name: "Papin account",
        credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
        async authorize(raw) {
          const parsed = credentialsSchema.safeParse(raw);
          if (!parsed.success) return null;
          const { email, password } = parsed.data;
          const user = await getUserByEmail({ email });
          const ok = await verifyPassword(user?.passwordHash ?? (await timingDecoy()), password);
          if (!user || !ok) {
            await recordAuditEvent({
              actorId: user?.id ?? null,
              actorEmail: email.toLowerCase(),
              siteId: user?.siteId ?? null,
              action: "auth.sign-in-failed",
              entityType: "user",
              entityId: user?.id ?? null,
              reason: user ? "wrong password" : "unknown e-mail",
            });
            return null;
          }
          if (user.disabled) {
            await recordAuditEvent({
              actorId: user.id,
              actorEmail: user.email,
              siteId: user.siteId,
              action: "auth.sign-in-refused",
              entityType: "user",
              entityId: user.id,
              reason: "account disabled",
            });
            throw new Error("AccountDisabled");
          }
          await markSignedIn({ id: user.id });
          await recordAuditEvent({
            actorId: user.id,
            actorEmail: user.email,
            siteId: user.siteId,
            action: "auth.sign-in",
            entityType: "user",
            entityId: user.id,
          });
          return { id: user.id, email: user.email, name: user.name, role: user.role, siteId: user.siteId };
        },
      }),
    ],
    callbacks: {
      async redirect(params) {
        return sameOriginRedirect(params);
      },
      async jwt({ token, user }) {
        if (user) {
          token.uid = user.id;
          token.role = user.role;
          token.siteId = user.siteId;
        }
        return token;
      },
      async session({ session, token }) {
        session.user = {
          id: token.uid ?? "",
          email: token.email ?? "",
          name: token.name ?? "",
          role: token.role ?? "technician",
          siteId: token.siteId ?? null,
        };
        return session;
      },
    },
  };
  return cached;
}

import "server-only";
import { cookies } from "next/headers";
import { authOptions, sessionLimits } from "./options";
import { continueSessionToken } from "./session-policy";
import { decodeSessionToken } from "./session-token";

/** Who a session names, as next-auth's session callback (lib/auth/options.ts) puts it. */
export type SessionClaims = { id: string; sessionVersion: number };

/**
 * The session read straight from its cookie when next-auth would only hand back what the cookie already says: the
 * cookie decodes (lib/auth/session-token.ts keeps decoded cookies) and the session policy leaves the token unchanged
 * (within its limits, last activity written less than a minute ago). Undefined in every other case — no cookie, a
 * split or unreadable cookie, activity to write back, a session past its limits — and the caller then asks next-auth
 * (getServerSession), which answers those and writes the new cookie. next-auth's own path costs a request its
 * machinery (CSRF token, callbacks, a fresh cookie) even when nothing changes.
 */
export async function sessionFromCookie(): Promise<SessionClaims | undefined> {
  const options = authOptions();
  const name = `${options.useSecureCookies ? "__Secure-" : ""}next-auth.session-token`;
  let store: Awaited<ReturnType<typeof cookies>>;
  try {
    store = await cookies();
  } catch {
    // Outside a request (a script, or a test calling a handler directly) there are no cookies; next-auth's path answers.
    return undefined;
  }
  const value = store.get(name)?.value;
  if (!value || store.has(`${name}.0`)) return undefined;
  const claims = await decodeSessionToken({ token: value, secret: options.secret! }).catch(() => null);
  if (!claims) return undefined;
  if (continueSessionToken(claims, Date.now(), sessionLimits()) !== claims) return undefined;
  if (typeof claims.uid !== "string" || typeof claims.sv !== "number") return undefined;
  return { id: claims.uid, sessionVersion: claims.sv };
}

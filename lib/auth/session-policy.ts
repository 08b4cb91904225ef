import type { JWT } from "next-auth/jwt";

/** How long a session lives: idle limit and absolute lifetime, in milliseconds. */
export type SessionLimits = { idleMs: number; maxMs: number };

/** The last activity is written back into the token at most this often (each write is a new cookie). */
export const ACTIVITY_REFRESH_MS = 60_000;

export type SessionAccount = { id: string; role: JWT["role"]; siteId: string | null; sessionVersion: number };

/** The token of a new session: who, under which session version, signed in when. */
export function startSessionToken(token: JWT, account: SessionAccount, nowMs: number): JWT {
  return { ...token, uid: account.id, role: account.role, siteId: account.siteId, sv: account.sessionVersion, authAt: nowMs, seenAt: nowMs };
}

/**
 * The token on a later request: still valid (activity refreshed at most once a minute), or an empty token, which
 * reads as signed out, when it is idle too long, past its absolute lifetime, or lacks the session fields.
 */
export function continueSessionToken(token: JWT, nowMs: number, limits: SessionLimits): JWT {
  const { uid, sv, authAt, seenAt } = token;
  if (!uid || typeof sv !== "number" || typeof authAt !== "number" || typeof seenAt !== "number") return {};
  if (nowMs - authAt > limits.maxMs || nowMs - seenAt > limits.idleMs) return {};
  if (nowMs - seenAt >= ACTIVITY_REFRESH_MS) return { ...token, seenAt: nowMs };
  return token;
}

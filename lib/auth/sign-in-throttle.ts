import { env } from "@/lib/env";

export type ThrottleSettings = { maxFailures: number; addressMaxFailures: number; lockMs: number };

/**
 * From the configuration. One client address may hold several people (a ward behind one gateway), so its bucket
 * allows four times the failures of one account before it locks.
 */
export function throttleSettings(): ThrottleSettings {
  const { PAPIN_SIGNIN_MAX_FAILURES, PAPIN_SIGNIN_LOCK_MINUTES } = env();
  return { maxFailures: PAPIN_SIGNIN_MAX_FAILURES, addressMaxFailures: 4 * PAPIN_SIGNIN_MAX_FAILURES, lockMs: PAPIN_SIGNIN_LOCK_MINUTES * 60_000 };
}

/** Longest wait between two attempts of one bucket before the lock (seconds). */
export const MAX_DELAY_S = 30;

/** The wait before the next attempt after `failures` failures in a row: 0, 0, 1, 2, 4, 8, 16, 30, 30… seconds. */
export function delayAfterFailuresS(failures: number): number {
  if (failures < 2) return 0;
  return Math.min(MAX_DELAY_S, 2 ** (failures - 2));
}

/** The failure counts whose delay is below the cap, so a query can spell the table out (the rest wait MAX_DELAY_S). */
export const DELAY_TABLE_FAILURES = [0, 1, 2, 3, 4, 5, 6] as const;

export const DIRECT = "direct";

/**
 * The client's address as the sign-in request shows it. Only behind a proxy the operator vouches for
 * (PAPIN_TRUST_PROXY=true) is X-Forwarded-For believed, and then its last entry, the one that proxy added itself;
 * otherwise the request carries no address Papin can trust and it is the single bucket "direct".
 */
export function clientAddress(headers: Record<string, string | string[] | undefined> | undefined, trustProxy = env().PAPIN_TRUST_PROXY === "true"): string {
  if (!trustProxy || !headers) return DIRECT;
  const raw = headers["x-forwarded-for"];
  const value = Array.isArray(raw) ? raw.join(",") : raw;
  const last = value
    ?.split(",")
    .map((part) => part.trim())
    .filter((part) => part !== "")
    .at(-1);
  return last && last.length <= 64 ? last.toLowerCase() : DIRECT;
}

export const accountKey = (email: string) => `account:${email.trim().toLowerCase()}`;
export const addressKey = (address: string) => `address:${address}`;

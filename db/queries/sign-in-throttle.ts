import "server-only";
import { and, eq, inArray, isNotNull, isNull, lt, lte, or, sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db";
import { signInThrottle, type SignInThrottleRow } from "@/db/schema";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";

/** Forgets buckets whose lock has run out, and unlocked ones with no failure since `staleBeforeIso`. */
export async function deleteExpiredThrottleRows({ nowIso, staleBeforeIso }: { nowIso: string; staleBeforeIso: string }) {
  await getDb()
    .delete(signInThrottle)
    .where(or(and(isNotNull(signInThrottle.lockedUntil), lte(signInThrottle.lockedUntil, nowIso)), and(isNull(signInThrottle.lockedUntil), lt(signInThrottle.lastFailureAt, staleBeforeIso))));
}

export async function getThrottleRows({ keys }: { keys: string[] }): Promise<SignInThrottleRow[]> {
  if (keys.length === 0) return [];
  return getDb().select().from(signInThrottle).where(inArray(signInThrottle.key, keys));
}

/**
 * Claims one attempt for a bucket in ONE statement, before any password is checked: the bucket's failures go up by
 * one unless it is locked, already at `maxFailures`, or its last attempt is more recent than the delay its failure
 * count asks for (`notAfterIso[n]`: the latest last-attempt time that lets an attempt with n failures through;
 * `otherwiseNotAfterIso` beyond the table). Parallel attempts therefore cannot all be evaluated at once.
 * Returns the failure count including this attempt, or null when the attempt must not be made.
 */
export async function claimSignInAttempt(input: { key: string; nowIso: string; maxFailures: number; notAfterIso: readonly string[]; otherwiseNotAfterIso: string }): Promise<number | null> {
  const { key, nowIso, maxFailures, notAfterIso, otherwiseNotAfterIso } = input;
  const t = signInThrottle;
  const latestAllowed: SQL = sql`CASE ${sql.join(
    notAfterIso.map((iso, failures) => sql`WHEN ${t.failures} = ${failures} THEN ${iso}`),
    sql` `,
  )} ELSE ${otherwiseNotAfterIso} END`;
  const rows = await getDb()
    .insert(t)
    .values({ key, failures: 1, lockedUntil: null, lastFailureAt: nowIso })
    .onConflictDoUpdate({
      target: t.key,
      set: { failures: sql`${t.failures} + 1`, lastFailureAt: nowIso },
      setWhere: sql`${t.lockedUntil} IS NULL AND ${t.failures} < ${maxFailures} AND ${t.lastFailureAt} <= ${latestAllowed}`,
    })
    .returning({ failures: t.failures });
  return rows[0]?.failures ?? null;
}

/** A right password from this bucket: its claimed attempt was not a failure after all. */
export async function releaseSignInAttempt({ key }: { key: string }) {
  await getDb()
    .update(signInThrottle)
    .set({ failures: sql`max(${signInThrottle.failures} - 1, 0)` })
    .where(eq(signInThrottle.key, key));
}

/** A right password for the account: its run of failures is over. */
export async function clearSignInBucket({ key }: { key: string }) {
  await getDb().delete(signInThrottle).where(eq(signInThrottle.key, key));
}

/**
 * Locks a bucket until `lockedUntilIso`; the audit event (if any) is written only by the call that set the lock,
 * so a lock leaves exactly one ledger row however many attempts raced into it. True when this call locked it.
 */
export async function lockSignInBucket({ key, lockedUntilIso, audit }: { key: string; lockedUntilIso: string; audit?: AuditInput }): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    const locked = await tx
      .update(signInThrottle)
      .set({ lockedUntil: lockedUntilIso })
      .where(and(eq(signInThrottle.key, key), isNull(signInThrottle.lockedUntil)))
      .returning({ key: signInThrottle.key });
    if (locked.length === 0) return false;
    if (audit) await appendAuditEvent(tx, audit);
    return true;
  });
}

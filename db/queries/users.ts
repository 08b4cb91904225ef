import "server-only";
import { and, asc, desc, eq, gt, isNull, lt, or, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { passwordHistory, signInThrottle, users, sites, type NewUser, type Role, type User } from "@/db/schema";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";

export type Actor = { id: string; email: string; siteId: string | null; role: Role; name: string };

/** Across every site: e-mail addresses are unique in the whole portal, and sign-in has no site yet. */
export async function getUserByEmail({ email }: { email: string }): Promise<User | undefined> {
  const [row] = await getDb()
    .select()
    .from(users)
    .where(eq(sql`lower(${users.email})`, email.trim().toLowerCase()))
    .limit(1);
  return row;
}

/** Across every site: the session names the user; guards re-read the account with it. */
export async function getUserById({ id }: { id: string }): Promise<User | undefined> {
  const [row] = await getDb().select().from(users).where(eq(users.id, id)).limit(1);
  return row;
}

export async function getUserOnSite({ siteId, id }: { siteId: string; id: string }): Promise<User | undefined> {
  const [row] = await getDb()
    .select()
    .from(users)
    .where(and(eq(users.id, id), eq(users.siteId, siteId)))
    .limit(1);
  return row;
}

export async function listUsersOfSite({ siteId }: { siteId: string }) {
  return getDb()
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      role: users.role,
      disabled: users.disabled,
      lastSignInAt: users.lastSignInAt,
      mustChangePassword: users.mustChangePassword,
      signInLockedUntil: signInThrottle.lockedUntil,
      signingLockedUntil: users.signingLockedUntil,
      siteName: sites.name,
      createdAt: users.createdAt,
    })
    .from(users)
    .leftJoin(sites, eq(users.siteId, sites.id))
    .leftJoin(signInThrottle, eq(signInThrottle.key, sql`'account:' || lower(${users.email})`))
    .where(eq(users.siteId, siteId))
    .orderBy(asc(users.name));
}

type AuditWithoutEntity = Omit<AuditInput, "entityType" | "entityId">;

export async function insertUser({ values, audit }: { values: NewUser; audit: AuditWithoutEntity }) {
  return getDb().transaction(async (tx) => {
    const [created] = await tx.insert(users).values(values).returning({ id: users.id });
    await appendAuditEvent(tx, { ...audit, entityType: "user", entityId: created.id });
    return created;
  });
}

/**
 * Changes one account of the site; the WHERE holds the site, so another site's account is never touched.
 * `endSessions` bumps the session version in the same statement: every session issued before is refused.
 */
export async function updateUserOnSite(input: { siteId: string; id: string; values: Partial<NewUser>; endSessions?: boolean; audit: AuditWithoutEntity }) {
  const { siteId, id, values, endSessions, audit } = input;
  return getDb().transaction(async (tx) => {
    const changed = await tx
      .update(users)
      .set(endSessions ? { ...values, sessionVersion: sql`${users.sessionVersion} + 1` } : values)
      .where(and(eq(users.id, id), eq(users.siteId, siteId)))
      .returning({ id: users.id });
    if (changed.length === 0) return false;
    await appendAuditEvent(tx, { ...audit, entityType: "user", entityId: id });
    return true;
  });
}

export async function markSignedIn({ id }: { id: string }) {
  await getDb().update(users).set({ lastSignInAt: new Date().toISOString() }).where(eq(users.id, id));
}

/** Sign-out: ends every session of the user, once (a token of an older version changes nothing and writes nothing). */
export async function endSessionsAtSignOut({ id, sessionVersion, audit }: { id: string; sessionVersion: number; audit: AuditWithoutEntity }) {
  await getDb().transaction(async (tx) => {
    const ended = await tx
      .update(users)
      .set({ sessionVersion: sql`${users.sessionVersion} + 1` })
      .where(and(eq(users.id, id), eq(users.sessionVersion, sessionVersion)))
      .returning({ id: users.id });
    if (ended.length > 0) await appendAuditEvent(tx, { ...audit, entityType: "user", entityId: id });
  });
}

/**
 * Lifts the sign-in lock (the account's throttle bucket) and the signing lock of one account of the site, with
 * its ledger event. False when the account is not on the site.
 */
export async function unlockUserOnSite({ siteId, id, throttleKey, audit }: { siteId: string; id: string; throttleKey: string; audit: AuditWithoutEntity }) {
  return getDb().transaction(async (tx) => {
    const changed = await tx
      .update(users)
      .set({ failedSigningAttempts: 0, signingLockedUntil: null })
      .where(and(eq(users.id, id), eq(users.siteId, siteId)))
      .returning({ id: users.id });
    if (changed.length === 0) return false;
    await tx.delete(signInThrottle).where(eq(signInThrottle.key, throttleKey));
    await appendAuditEvent(tx, { ...audit, entityType: "user", entityId: id });
    return true;
  });
}

/** The hashes of the user's most recent own passwords, newest first. */
export async function listRecentPasswordHashes({ userId, limit }: { userId: string; limit: number }): Promise<string[]> {
  const rows = await getDb()
    .select({ passwordHash: passwordHistory.passwordHash })
    .from(passwordHistory)
    .where(eq(passwordHistory.userId, userId))
    .orderBy(desc(passwordHistory.createdAt), desc(passwordHistory.id))
    .limit(limit);
  return rows.map((r) => r.passwordHash);
}

/**
 * The person's own new password: stored, remembered in the history (only the newest `keep` are kept), the one-time
 * flag and the signing lockout cleared, every other session ended, and the ledger told, in one transaction.
 * False when the password changed meanwhile (`previousHash` no longer current).
 */
export async function setOwnPassword(input: { id: string; previousHash: string; passwordHash: string; keep: number; audit: AuditWithoutEntity }) {
  const { id, previousHash, passwordHash, keep, audit } = input;
  return getDb().transaction(async (tx) => {
    const changed = await tx
      .update(users)
      .set({ passwordHash, mustChangePassword: false, failedSigningAttempts: 0, signingLockedUntil: null, updatedAt: new Date().toISOString(), sessionVersion: sql`${users.sessionVersion} + 1` })
      .where(and(eq(users.id, id), eq(users.passwordHash, previousHash)))
      .returning({ sessionVersion: users.sessionVersion });
    if (changed.length === 0) return null;
    await tx.insert(passwordHistory).values({ userId: id, passwordHash });
    const kept = tx.select({ id: passwordHistory.id }).from(passwordHistory).where(eq(passwordHistory.userId, id)).orderBy(desc(passwordHistory.createdAt), desc(passwordHistory.id)).limit(keep);
    await tx.delete(passwordHistory).where(and(eq(passwordHistory.userId, id), sql`${passwordHistory.id} NOT IN ${kept}`));
    await appendAuditEvent(tx, { ...audit, entityType: "user", entityId: id });
    return { sessionVersion: changed[0].sessionVersion };
  });
}

/**
 * Claims one signing attempt in ONE statement, before the password is checked: the failure count goes up by one,
 * and the attempt that reaches `maxFailures` also sets the lock, unless signing is locked (then nothing changes and
 * null comes back). A lock that has run out starts a new count. So N parallel wrong passwords evaluate at most
 * `maxFailures` of them.
 */
export async function claimSigningAttempt({ id, nowIso, maxFailures, lockUntilIso }: { id: string; nowIso: string; maxFailures: number; lockUntilIso: string }) {
  const expired = sql`(${users.signingLockedUntil} IS NOT NULL AND ${users.signingLockedUntil} <= ${nowIso})`;
  const next = sql`CASE WHEN ${expired} THEN 1 ELSE ${users.failedSigningAttempts} + 1 END`;
  const [row] = await getDb()
    .update(users)
    .set({
      failedSigningAttempts: next,
      signingLockedUntil: sql`CASE WHEN ${next} >= ${maxFailures} THEN ${lockUntilIso} WHEN ${expired} THEN NULL ELSE ${users.signingLockedUntil} END`,
    })
    .where(and(eq(users.id, id), or(and(isNull(users.signingLockedUntil), lt(users.failedSigningAttempts, maxFailures)), expired)))
    .returning({ failures: users.failedSigningAttempts, lockedUntil: users.signingLockedUntil });
  return row ?? null;
}

/**
 * The right password at signing: the run of failures is over. A lock stays unless this very attempt set it
 * (`lockSetByThisAttempt`, the instant it wrote): then the right password lifts it again.
 */
export async function clearSigningFailures({ id, lockSetByThisAttempt }: { id: string; lockSetByThisAttempt?: string }) {
  const lock = lockSetByThisAttempt ? eq(users.signingLockedUntil, lockSetByThisAttempt) : isNull(users.signingLockedUntil);
  await getDb()
    .update(users)
    .set({ failedSigningAttempts: 0, signingLockedUntil: null })
    .where(and(eq(users.id, id), lock));
}

/** A wrong password at signing, claimed already: its ledger event; the attempt that locked signing restarts the count. */
export async function recordSigningFailure({ id, locked, audit }: { id: string; locked: boolean; audit: AuditInput }) {
  await getDb().transaction(async (tx) => {
    if (locked)
      await tx
        .update(users)
        .set({ failedSigningAttempts: 0 })
        .where(and(eq(users.id, id), gt(users.failedSigningAttempts, 0)));
    await appendAuditEvent(tx, audit);
  });
}

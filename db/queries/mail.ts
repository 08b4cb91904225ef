import "server-only";
import { and, asc, count, desc, eq, inArray, isNull, lte, ne, or } from "drizzle-orm";
import { getDb, type Executor } from "@/db";
import { cycles, mailOutbox, sterilizers, users, type OutboxMail } from "@/db/schema";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";

export type OutboxStatus = OutboxMail["status"];

/** Inserts one mail in the caller's transaction, so it is written with the change that causes it. */
export async function insertMail(tx: Executor, values: typeof mailOutbox.$inferInsert): Promise<{ id: string }> {
  const [row] = await tx.insert(mailOutbox).values(values).returning({ id: mailOutbox.id });
  return row;
}

// ── Recipients ──────────────────────────────────────────────────────────────────────────────

/** Addresses of the site's validation engineers whose accounts are enabled. */
export async function engineersOfSite(tx: Executor, siteId: string): Promise<string[]> {
  const rows = await tx
    .select({ email: users.email })
    .from(users)
    .where(and(eq(users.siteId, siteId), eq(users.role, "engineer"), eq(users.disabled, false)))
    .orderBy(asc(users.email));
  return rows.map((r) => r.email);
}

/** The address of one enabled user, or null (unknown or disabled). */
export async function emailOfUser(tx: Executor, userId: string): Promise<string | null> {
  const [row] = await tx
    .select({ email: users.email })
    .from(users)
    .where(and(eq(users.id, userId), eq(users.disabled, false)))
    .limit(1);
  return row?.email ?? null;
}

/** A cycle with its sterilizer's name and the account of whoever submitted it, else created it. */
export async function getCycleMailFacts(tx: Executor, cycleId: string) {
  const [row] = await tx
    .select({
      id: cycles.id,
      siteId: cycles.siteId,
      cycleNumber: cycles.cycleNumber,
      sterilizerName: sterilizers.name,
      submittedBy: cycles.submittedBy,
      createdBy: cycles.createdBy,
    })
    .from(cycles)
    .innerJoin(sterilizers, eq(cycles.sterilizerId, sterilizers.id))
    .where(eq(cycles.id, cycleId))
    .limit(1);
  if (!row) return undefined;
  const submitterId = row.submittedBy ?? row.createdBy;
  const [submitter] = await tx.select({ name: users.name, email: users.email, disabled: users.disabled }).from(users).where(eq(users.id, submitterId)).limit(1);
  return { ...row, submitterId, submitter };
}

// ── Delivery bookkeeping (used by lib/mail/delivery.ts) ────────────────────────────────────

const dueAt = (now: string) => and(eq(mailOutbox.status, "pending"), or(isNull(mailOutbox.nextAttemptAt), lte(mailOutbox.nextAttemptAt, now)));

/**
 * Takes up to `limit` due pending mails for sending by pushing their next attempt to `leaseUntil`,
 * so a second sender (another request, another process) skips them; if this sender dies, the
 * lease runs out and the mail is tried again.
 */
export async function claimDueMail({ now, leaseUntil, limit, ids }: { now: string; leaseUntil: string; limit: number; ids?: string[] }): Promise<OutboxMail[]> {
  const db = getDb();
  const due = dueAt(now);
  const candidates = await db
    .select({ id: mailOutbox.id })
    .from(mailOutbox)
    .where(ids ? and(due, inArray(mailOutbox.id, ids)) : due)
    .orderBy(asc(mailOutbox.createdAt))
    .limit(limit);
  const claimed: OutboxMail[] = [];
  for (const { id } of candidates) {
    const [row] = await db
      .update(mailOutbox)
      .set({ nextAttemptAt: leaseUntil })
      .where(and(eq(mailOutbox.id, id), due))
      .returning();
    if (row) claimed.push(row);
  }
  return claimed;
}

export async function markMailSent({ id, providerId, attempts, sentAt }: { id: string; providerId: string; attempts: number; sentAt: string }) {
  await getDb().update(mailOutbox).set({ status: "sent", providerId, attempts, sentAt, nextAttemptAt: null }).where(eq(mailOutbox.id, id));
}

/** One failed attempt: pending again at `nextAttemptAt`, or failed for good when that is null. */
export async function markMailAttemptFailed({ id, attempts, lastError, nextAttemptAt }: { id: string; attempts: number; lastError: string; nextAttemptAt: string | null }) {
  await getDb()
    .update(mailOutbox)
    .set({ attempts, lastError, nextAttemptAt, status: nextAttemptAt ? "pending" : "failed" })
    .where(eq(mailOutbox.id, id));
}

/** When the next pending mail falls due (null when nothing waits). */
export async function getNextMailAttemptAt(): Promise<string | null> {
  const [row] = await getDb().select({ at: mailOutbox.nextAttemptAt }).from(mailOutbox).where(eq(mailOutbox.status, "pending")).orderBy(asc(mailOutbox.nextAttemptAt)).limit(1);
  if (!row) return null;
  return row.at ?? new Date(0).toISOString();
}

// ── One site's outbox, for its administrators ─────────────────────────────────────────────

export async function getOutboxMailOnSite({ siteId, id }: { siteId: string; id: string }): Promise<OutboxMail | undefined> {
  const [row] = await getDb()
    .select()
    .from(mailOutbox)
    .where(and(eq(mailOutbox.id, id), eq(mailOutbox.siteId, siteId)))
    .limit(1);
  return row;
}

export async function listOutboxMailOfSite({ siteId, status, limit = 100 }: { siteId: string; status?: OutboxStatus; limit?: number }): Promise<OutboxMail[]> {
  return getDb()
    .select()
    .from(mailOutbox)
    .where(and(eq(mailOutbox.siteId, siteId), status ? eq(mailOutbox.status, status) : undefined))
    .orderBy(desc(mailOutbox.createdAt))
    .limit(limit);
}

export async function countOutboxMailOfSite({ siteId }: { siteId: string }): Promise<Record<OutboxStatus, number>> {
  const rows = await getDb().select({ status: mailOutbox.status, n: count() }).from(mailOutbox).where(eq(mailOutbox.siteId, siteId)).groupBy(mailOutbox.status);
  const counts: Record<OutboxStatus, number> = { pending: 0, sent: 0, failed: 0 };
  for (const r of rows) counts[r.status] = r.n;
  return counts;
}

/** The site's mails due now, oldest first. */
export async function listDueMailIdsOfSite({ siteId, now, limit }: { siteId: string; now: string; limit: number }): Promise<string[]> {
  const rows = await getDb()
    .select({ id: mailOutbox.id })
    .from(mailOutbox)
    .where(and(eq(mailOutbox.siteId, siteId), dueAt(now)))
    .orderBy(asc(mailOutbox.createdAt))
    .limit(limit);
  return rows.map((r) => r.id);
}

/** Makes one unsent mail of the site due now, audited; undefined when it was sent meanwhile. */
export async function markMailDueNow({ siteId, id, audit }: { siteId: string; id: string; audit: Omit<AuditInput, "entityType" | "entityId" | "newValue"> }) {
  return getDb().transaction(async (tx) => {
    const [after] = await tx
      .update(mailOutbox)
      .set({ status: "pending", nextAttemptAt: null })
      .where(and(eq(mailOutbox.id, id), eq(mailOutbox.siteId, siteId), ne(mailOutbox.status, "sent")))
      .returning();
    if (!after) return undefined;
    await appendAuditEvent(tx, { ...audit, entityType: "mail", entityId: id, newValue: { status: after.status, nextAttemptAt: null } });
    return after;
  });
}

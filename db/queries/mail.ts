import "server-only";
import { and, asc, count, desc, eq, inArray, isNull, lte, ne, or } from "drizzle-orm";
import { getDb, type Executor } from "@/db";
import { cycles, mailOutbox, sterilizers, users, type OutboxMail } from "@/db/schema";
import { appendAuditEvent } from "@/db/ledger";
import type { Actor } from "@/db/queries/users";
import { AppError } from "@/lib/errors";
import { analysisFailedMail, cycleApprovedMail, cycleRejectedMail, cycleSubmittedMail, cycleUrl } from "@/lib/mail/templates";

export type OutboxStatus = OutboxMail["status"];
export type NewMail = { to: string | string[]; subject: string; html: string; text: string; relatedCycleId?: string | null };

const ADDRESS = /^[^\s@<>]+@[^\s@<>]+\.[^\s@<>]+$/;

/** Trimmed, lower-cased, de-duplicated; anything that is not an address is dropped with a warning. */
function cleanRecipients(to: string | string[]): string[] {
  const seen = new Set<string>();
  for (const raw of Array.isArray(to) ? to : [to]) {
    const address = raw.trim().toLowerCase();
    if (!address) continue;
    if (!ADDRESS.test(address)) {
      console.warn(`[papin] mail: "${raw}" is not an e-mail address; it was left out.`);
      continue;
    }
    seen.add(address);
  }
  return [...seen];
}

/**
 * Queues one e-mail in the caller's transaction, so it is written with the change that causes it
 * and sent after the commit (kickMailDelivery). Without any recipient nothing is queued: null.
 */
export async function enqueueMail(tx: Executor, mail: NewMail): Promise<{ id: string } | null> {
  const to = cleanRecipients(mail.to);
  if (to.length === 0) {
    console.warn(`[papin] mail: "${mail.subject}" has no recipient; nothing was queued.`);
    return null;
  }
  const [row] = await tx
    .insert(mailOutbox)
    .values({ to, subject: mail.subject, html: mail.html, text: mail.text, relatedCycleId: mail.relatedCycleId ?? null })
    .returning({ id: mailOutbox.id });
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

type CycleMailFacts = {
  id: string;
  siteId: string;
  cycleNumber: string;
  sterilizerName: string;
  submitterId: string;
  submitterName: string;
  submitterEmail: string | null;
};

/** What the cycle e-mails say about a cycle; the submitter is who submitted it, else who created it. */
async function cycleMailFacts(tx: Executor, cycleId: string): Promise<CycleMailFacts> {
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
  if (!row) throw new AppError(404, "That cycle was not found.");
  const submitterId = row.submittedBy ?? row.createdBy;
  const [submitter] = await tx
    .select({ name: users.name, email: users.email, disabled: users.disabled })
    .from(users)
    .where(eq(users.id, submitterId))
    .limit(1);
  return {
    id: row.id,
    siteId: row.siteId,
    cycleNumber: row.cycleNumber,
    sterilizerName: row.sterilizerName,
    submitterId,
    submitterName: submitter?.name ?? "Someone",
    submitterEmail: submitter && !submitter.disabled ? submitter.email : null,
  };
}

// Each of these runs in the caller's transaction (the submit, the signature, the analysis) and
// returns the queued mail's id, or null when nobody is there to receive it.

/** Submitted → the site's engineers, except the one who submitted (nobody reviews their own upload). */
export async function enqueueCycleSubmittedMail(tx: Executor, { cycleId, origin }: { cycleId: string; origin?: string | null }) {
  const facts = await cycleMailFacts(tx, cycleId);
  const to = (await engineersOfSite(tx, facts.siteId)).filter((e) => e !== facts.submitterEmail);
  const content = cycleSubmittedMail({ ...facts, url: cycleUrl(cycleId, origin) });
  return enqueueMail(tx, { to, ...content, relatedCycleId: cycleId });
}

/** Rejected → the submitter, with the reason. */
export async function enqueueCycleRejectedMail(
  tx: Executor,
  { cycleId, reason, signerName, origin }: { cycleId: string; reason: string; signerName: string; origin?: string | null },
) {
  const facts = await cycleMailFacts(tx, cycleId);
  const content = cycleRejectedMail({ ...facts, reason, signerName, url: cycleUrl(cycleId, origin) });
  return enqueueMail(tx, { to: facts.submitterEmail ? [facts.submitterEmail] : [], ...content, relatedCycleId: cycleId });
}

/** Approved → the submitter, with the report's number. */
export async function enqueueCycleApprovedMail(
  tx: Executor,
  { cycleId, signerName, reportNumber, origin }: { cycleId: string; signerName: string; reportNumber: string; origin?: string | null },
) {
  const facts = await cycleMailFacts(tx, cycleId);
  const content = cycleApprovedMail({ ...facts, signerName, reportNumber, url: cycleUrl(cycleId, origin) });
  return enqueueMail(tx, { to: facts.submitterEmail ? [facts.submitterEmail] : [], ...content, relatedCycleId: cycleId });
}

/** A failing analysis → every engineer of the site at once. */
export async function enqueueAnalysisFailedMail(
  tx: Executor,
  { cycleId, summary, failedChecks, origin }: { cycleId: string; summary: string; failedChecks: string[]; origin?: string | null },
) {
  const facts = await cycleMailFacts(tx, cycleId);
  const to = await engineersOfSite(tx, facts.siteId);
  const content = analysisFailedMail({ ...facts, summary, failedChecks, url: cycleUrl(cycleId, origin) });
  return enqueueMail(tx, { to, ...content, relatedCycleId: cycleId });
}

// ── Delivery bookkeeping (used by lib/mail/delivery.ts) ────────────────────────────────────

/**
 * Takes up to `limit` due pending mails for sending by pushing their next attempt to `leaseUntil`,
 * so a second sender (another request, another process) skips them; if this sender dies, the
 * lease runs out and the mail is tried again.
 */
export async function claimDueMail({ now, leaseUntil, limit, ids }: { now: string; leaseUntil: string; limit: number; ids?: string[] }): Promise<OutboxMail[]> {
  const db = getDb();
  const due = and(eq(mailOutbox.status, "pending"), or(isNull(mailOutbox.nextAttemptAt), lte(mailOutbox.nextAttemptAt, now)));
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
  const [row] = await getDb()
    .select({ at: mailOutbox.nextAttemptAt })
    .from(mailOutbox)
    .where(eq(mailOutbox.status, "pending"))
    .orderBy(asc(mailOutbox.nextAttemptAt))
    .limit(1);
  if (!row) return null;
  return row.at ?? new Date(0).toISOString();
}

// ── The administrator's view ──────────────────────────────────────────────────────────────

export async function getOutboxMail({ id }: { id: string }): Promise<OutboxMail | undefined> {
  const [row] = await getDb().select().from(mailOutbox).where(eq(mailOutbox.id, id)).limit(1);
  return row;
}

export async function listOutboxMail({ status, limit = 100 }: { status?: OutboxStatus; limit?: number } = {}): Promise<OutboxMail[]> {
  return getDb()
    .select()
    .from(mailOutbox)
    .where(status ? eq(mailOutbox.status, status) : undefined)
    .orderBy(desc(mailOutbox.createdAt))
    .limit(limit);
}

export async function countOutboxMail(): Promise<Record<OutboxStatus, number>> {
  const rows = await getDb().select({ status: mailOutbox.status, n: count() }).from(mailOutbox).groupBy(mailOutbox.status);
  const counts: Record<OutboxStatus, number> = { pending: 0, sent: 0, failed: 0 };
  for (const r of rows) counts[r.status] = r.n;
  return counts;
}

/**
 * Makes a pending or failed mail due now (the attempts so far stay counted), audited. A sent
 * mail is not sent twice.
 */
export async function retryMail({ actor, id }: { actor: Actor; id: string }): Promise<OutboxMail> {
  return getDb().transaction(async (tx) => {
    const [before] = await tx.select().from(mailOutbox).where(eq(mailOutbox.id, id)).limit(1);
    if (!before) throw new AppError(404, "That e-mail is not in the outbox.");
    if (before.status === "sent") throw new AppError(409, "That e-mail was already sent; it is not sent twice.");
    const [after] = await tx
      .update(mailOutbox)
      .set({ status: "pending", nextAttemptAt: null })
      .where(and(eq(mailOutbox.id, id), ne(mailOutbox.status, "sent")))
      .returning();
    await appendAuditEvent(tx, {
      actorId: actor.id,
      actorEmail: actor.email,
      siteId: actor.siteId,
      action: "mail.retry",
      entityType: "mail",
      entityId: id,
      oldValue: { status: before.status, attempts: before.attempts, nextAttemptAt: before.nextAttemptAt },
      newValue: { status: after.status, nextAttemptAt: null },
    });
    return after;
  });
}

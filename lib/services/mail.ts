import "server-only";
import type { Executor } from "@/db";
import type { Actor } from "@/db/queries/users";
import {
  countOutboxMailOfSite,
  engineersOfSite,
  getCycleMailFacts,
  getOutboxMailOnSite,
  insertMail,
  listDueMailIdsOfSite,
  listOutboxMailOfSite,
  markMailDueNow,
  type OutboxStatus,
} from "@/db/queries/mail";
import { AppError } from "@/lib/errors";
import { formatDateTime } from "@/lib/format";
import { deliverPendingMail, mailTransport } from "@/lib/mail/delivery";
import { readFakeMailbox } from "@/lib/mail/fake-mailbox";
import { analysisFailedMail, cycleApprovedMail, cycleFailureConfirmedMail, cycleRejectedMail, cycleSubmittedMail, cycleUrl } from "@/lib/mail/templates";
import { auditActor, siteIdOf } from "./site";
import { plural } from "@/lib/domain";

export type { OutboxStatus };

type NewMail = { to: string | string[]; subject: string; html: string; text: string; siteId: string | null; relatedCycleId?: string | null };

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
  return insertMail(tx, { to, subject: mail.subject, html: mail.html, text: mail.text, relatedCycleId: mail.relatedCycleId ?? null, siteId: mail.siteId });
}

/** What the cycle e-mails say about a cycle; the submitter is who submitted it, else who created it. */
async function cycleMailFacts(tx: Executor, cycleId: string) {
  const row = await getCycleMailFacts(tx, cycleId);
  if (!row) throw new AppError(404, "That cycle was not found.");
  const { submitter } = row;
  return {
    id: row.id,
    siteId: row.siteId,
    cycleNumber: row.cycleNumber,
    sterilizerName: row.sterilizerName,
    submitterId: row.submitterId,
    submitterName: submitter?.name ?? "Someone",
    submitterEmail: submitter && !submitter.disabled ? submitter.email : null,
  };
}

// Each of these runs in the caller's transaction (the submit, the signature, the analysis) and
// returns the queued mail's id, or null when nobody is there to receive it. The mail belongs to
// the cycle's site.

/** Submitted → the site's engineers, except the one who submitted (nobody reviews their own upload). */
export async function enqueueCycleSubmittedMail(tx: Executor, { cycleId }: { cycleId: string }) {
  const facts = await cycleMailFacts(tx, cycleId);
  const to = (await engineersOfSite(tx, facts.siteId)).filter((e) => e !== facts.submitterEmail);
  const content = cycleSubmittedMail({ ...facts, url: cycleUrl(cycleId) });
  return enqueueMail(tx, { to, ...content, siteId: facts.siteId, relatedCycleId: cycleId });
}

/** Returned → the submitter, with the reason. */
export async function enqueueCycleRejectedMail(tx: Executor, { cycleId, reason, signerName }: { cycleId: string; reason: string; signerName: string }) {
  const facts = await cycleMailFacts(tx, cycleId);
  const content = cycleRejectedMail({ ...facts, reason, signerName, url: cycleUrl(cycleId) });
  return enqueueMail(tx, { to: facts.submitterEmail ? [facts.submitterEmail] : [], ...content, siteId: facts.siteId, relatedCycleId: cycleId });
}

/** Approved → the submitter, with the report's number. */
export async function enqueueCycleApprovedMail(tx: Executor, { cycleId, signerName, reportNumber }: { cycleId: string; signerName: string; reportNumber: string }) {
  const facts = await cycleMailFacts(tx, cycleId);
  const content = cycleApprovedMail({ ...facts, signerName, reportNumber, url: cycleUrl(cycleId) });
  return enqueueMail(tx, { to: facts.submitterEmail ? [facts.submitterEmail] : [], ...content, siteId: facts.siteId, relatedCycleId: cycleId });
}

/** Failure confirmed → the submitter, with the report's number. */
export async function enqueueCycleFailureConfirmedMail(tx: Executor, input: { cycleId: string; signerName: string; reportNumber: string; reason: string | null }) {
  const facts = await cycleMailFacts(tx, input.cycleId);
  const content = cycleFailureConfirmedMail({ ...facts, signerName: input.signerName, reportNumber: input.reportNumber, reason: input.reason, url: cycleUrl(input.cycleId) });
  return enqueueMail(tx, { to: facts.submitterEmail ? [facts.submitterEmail] : [], ...content, siteId: facts.siteId, relatedCycleId: input.cycleId });
}

/** A failing analysis → every engineer of the site at once. */
export async function enqueueAnalysisFailedMail(tx: Executor, { cycleId, summary, failedChecks }: { cycleId: string; summary: string; failedChecks: string[] }) {
  const facts = await cycleMailFacts(tx, cycleId);
  const to = await engineersOfSite(tx, facts.siteId);
  const content = analysisFailedMail({ ...facts, summary, failedChecks, url: cycleUrl(cycleId) });
  return enqueueMail(tx, { to, ...content, siteId: facts.siteId, relatedCycleId: cycleId });
}

// ── The administrator's outbox: the own site's mail only ─────────────────────────────────────

const NO_SITE = "mail";
export const MAIL_NOT_CONFIGURED = "Mail is not configured (RESEND_API_KEY, or RESEND_BASE_URL for the local fake), so nothing can be sent yet.";

/** The mail page: the site's outbox (newest 100), its counts, the transport and the development mailbox. */
export async function getMailOutbox({ actor, status }: { actor: Actor; status?: OutboxStatus }) {
  const siteId = siteIdOf(actor, NO_SITE);
  const [counts, rows, mailbox] = await Promise.all([countOutboxMailOfSite({ siteId }), listOutboxMailOfSite({ siteId, status, limit: 100 }), readFakeMailbox({ limit: 50 })]);
  return { counts, rows, mailbox, transport: mailTransport() };
}

/**
 * Makes a pending or failed mail of the site due now (the attempts so far stay counted), audited.
 * A sent mail is not sent twice; another site's mail is "not in the outbox".
 */
export async function retryMail({ actor, id }: { actor: Actor; id: string }) {
  const siteId = siteIdOf(actor, NO_SITE);
  const before = await getOutboxMailOnSite({ siteId, id });
  if (!before) throw new AppError(404, "That e-mail is not in the outbox.");
  const sentTwice = new AppError(409, "That e-mail was already sent; it is not sent twice.");
  if (before.status === "sent") throw sentTwice;
  const after = await markMailDueNow({
    siteId,
    id,
    audit: { ...auditActor(actor), action: "mail.retry", oldValue: { status: before.status, attempts: before.attempts, nextAttemptAt: before.nextAttemptAt } },
  });
  if (!after) throw sentTwice;
  return after;
}

const sentence = (text: string | null | undefined) => (text ?? "no reason given").replace(/[.\s]+$/, "");

/** Retries one mail now and says what came of it; a failure is an AppError with the service's reason. */
export async function retryMailNow({ actor, id }: { actor: Actor; id: string }): Promise<string> {
  await retryMail({ actor, id });
  const report = await deliverPendingMail({ ids: [id] });
  if (!report.configured) throw new AppError(503, `The e-mail is queued again. ${MAIL_NOT_CONFIGURED}`);
  const row = await getOutboxMailOnSite({ siteId: siteIdOf(actor, NO_SITE), id });
  if (row?.status === "sent") return `Sent to ${row.to.join(", ")}.`;
  if (row?.status === "failed") throw new AppError(503, `Tried again and gave up after ${plural(row.attempts, "attempt")}: ${sentence(row.lastError)}.`);
  if (report.attempted === 0) return "The e-mail is queued again; another sender is handling it right now.";
  throw new AppError(503, `Tried again without success: ${sentence(row?.lastError)}. Next try ${formatDateTime(row?.nextAttemptAt)} UTC.`);
}

/** Sends the site's mail that is due now (up to 50). */
export async function sendDueMail({ actor }: { actor: Actor }) {
  const ids = await listDueMailIdsOfSite({ siteId: siteIdOf(actor, NO_SITE), now: new Date().toISOString(), limit: 50 });
  return deliverPendingMail({ ids, limit: 50 });
}

/** What the local fake mail service received; 404 unless RESEND_BASE_URL points at the fake. */
export async function readDevelopmentMailbox({ limit }: { limit: number }) {
  const mailbox = await readFakeMailbox({ limit });
  if (mailbox.state === "not-configured" || mailbox.state === "not-fake") {
    throw new AppError(404, "There is no development mailbox: RESEND_BASE_URL does not point at the local fake mail service.");
  }
  if (mailbox.state === "unreachable") {
    throw new AppError(503, `The local fake mail service at ${mailbox.baseUrl} does not answer (${mailbox.problem}) Start it with: npx tsx lib/mail/fake-resend-server.ts --port 3025`);
  }
  return { baseUrl: mailbox.baseUrl, messages: mailbox.messages, hasMore: mailbox.hasMore };
}

import "server-only";
import { Resend } from "resend";
import { claimDueMail, getNextMailAttemptAt, markMailAttemptFailed, markMailSent } from "@/db/queries/mail";
import type { OutboxMail } from "@/db/schema";
import { env } from "@/lib/env";

/** After this many failed attempts a mail is marked failed and waits for an administrator. */
export const MAX_MAIL_ATTEMPTS = 8;
/** How long a sender may hold a claimed mail before another sender may take it. */
const LEASE_MS = 2 * 60_000;
const MAX_DELAY_MS = 2 * 60 * 60_000;

/** Wait before the next try after `attempts` failures: 1, 2, 4, 8 … minutes, at most 2 hours. */
export function retryDelayMs(attempts: number): number {
  return Math.min(MAX_DELAY_MS, 60_000 * 2 ** Math.max(0, attempts - 1));
}

export type MailTransport = { configured: boolean; apiKey: string; baseUrl?: string; from: string };

/** Read at each delivery, so a changed RESEND_BASE_URL (a test, a restarted fake) is honoured. */
export function mailTransport(): MailTransport {
  const { RESEND_API_KEY: apiKey, RESEND_BASE_URL: baseUrl, PAPIN_MAIL_FROM: from } = env();
  return {
    configured: Boolean(apiKey || baseUrl),
    apiKey: apiKey ?? "re_dev_fake",
    baseUrl,
    from,
  };
}

export type DeliveryReport = {
  configured: boolean;
  attempted: number;
  sent: number;
  /** Failed this time, to be tried again later. */
  retrying: number;
  /** Failed for good this time (attempts used up, or refused as invalid). */
  failed: number;
};

type SendError = { message: string; permanent: boolean };

// Resend answers 400/422 for a message it will never accept (a malformed address, a missing
// field): trying again cannot help. Everything else (no answer, 401/403 key trouble, 409
// concurrent idempotent request, 429, 5xx) may pass later.
function describeFailure(error: { name?: string; message?: string; statusCode?: number | null }): SendError {
  const status = error.statusCode ?? null;
  const text = `${error.name ?? "error"}${status ? ` (${status})` : ""}: ${error.message ?? "no message"}`;
  return { message: text.slice(0, 500), permanent: status === 400 || status === 422 };
}

async function sendOne(resend: Resend, from: string, mail: OutboxMail): Promise<{ id: string } | SendError> {
  try {
    const { data, error } = await resend.emails.send(
      { from, to: mail.to, subject: mail.subject, html: mail.html, text: mail.text, headers: { "X-Entity-Ref-ID": mail.id } },
      // The same key on every try: if an earlier try reached Resend but its answer was lost,
      // Resend returns that first message's id instead of sending it again.
      { idempotencyKey: `papin-outbox/${mail.id}` },
    );
    if (error) return describeFailure(error);
    if (!data?.id) return { message: "The mail service answered without a message id.", permanent: false };
    return { id: data.id };
  } catch (error) {
    return { message: `The mail client failed: ${(error as Error).message}`.slice(0, 500), permanent: false };
  }
}

const state = globalThis as unknown as {
  __papinMail?: { warnedUnconfigured: boolean; running: boolean; again: boolean; timer?: ReturnType<typeof setTimeout> };
};
state.__papinMail ??= { warnedUnconfigured: false, running: false, again: false };
const mailState = state.__papinMail;

/**
 * Sends the pending mails that are due, oldest first: sent ones are marked with the provider's
 * id; a failure counts an attempt, records the error and backs off; after MAX_MAIL_ATTEMPTS the
 * mail is marked failed. Without RESEND_API_KEY or RESEND_BASE_URL nothing is sent and mail
 * stays pending. Never throws for a mail-service failure.
 */
export async function deliverPendingMail({ now, limit = 20, ids }: { now?: Date; limit?: number; ids?: string[] } = {}): Promise<DeliveryReport> {
  const transport = mailTransport();
  const report: DeliveryReport = { configured: transport.configured, attempted: 0, sent: 0, retrying: 0, failed: 0 };
  if (!transport.configured) {
    if (!mailState.warnedUnconfigured) {
      mailState.warnedUnconfigured = true;
      console.warn("[papin] mail is not configured (set RESEND_API_KEY, or RESEND_BASE_URL for the local fake); notifications stay in the outbox as pending.");
    }
    return report;
  }
  const at = now ?? new Date();
  const claimed = await claimDueMail({ now: at.toISOString(), leaseUntil: new Date(at.getTime() + LEASE_MS).toISOString(), limit, ids });
  if (claimed.length === 0) return report;
  const resend = new Resend(transport.apiKey, { baseUrl: transport.baseUrl });
  for (const mail of claimed) {
    report.attempted++;
    const attempts = mail.attempts + 1;
    const outcome = await sendOne(resend, transport.from, mail);
    const finishedAt = now ?? new Date();
    if ("id" in outcome) {
      await markMailSent({ id: mail.id, providerId: outcome.id, attempts, sentAt: finishedAt.toISOString() });
      report.sent++;
      continue;
    }
    const giveUp = outcome.permanent || attempts >= MAX_MAIL_ATTEMPTS;
    const nextAttemptAt = giveUp ? null : new Date(finishedAt.getTime() + retryDelayMs(attempts)).toISOString();
    await markMailAttemptFailed({ id: mail.id, attempts, lastError: outcome.message, nextAttemptAt });
    if (giveUp) {
      report.failed++;
      console.error(`[papin] mail ${mail.id} ("${mail.subject}") failed for good after ${attempts} attempt(s): ${outcome.message}`);
    } else {
      report.retrying++;
      console.warn(`[papin] mail ${mail.id} attempt ${attempts} failed, next try at ${nextAttemptAt}: ${outcome.message}`);
    }
  }
  return report;
}

async function scheduleNextRun() {
  if (mailState.timer) clearTimeout(mailState.timer);
  mailState.timer = undefined;
  const next = await getNextMailAttemptAt();
  if (!next) return;
  const waitMs = Math.min(MAX_DELAY_MS, Math.max(1_000, new Date(next).getTime() - Date.now()));
  mailState.timer = setTimeout(kickMailDelivery, waitMs);
  // A waiting retry must not keep a script or a test run alive.
  mailState.timer.unref?.();
}

/**
 * Starts sending in the background; call it after the transaction that queued mail commits.
 * Returns at once, never throws, and coalesces calls that arrive while a run is going. Mail that
 * is still pending afterwards (a retry later) is picked up by a timer in this process.
 */
export function kickMailDelivery(): void {
  if (mailState.running) {
    mailState.again = true;
    return;
  }
  mailState.running = true;
  void (async () => {
    try {
      do {
        mailState.again = false;
        const report = await deliverPendingMail();
        if (!report.configured) return;
        // A full batch means more may be due right now.
        if (report.attempted >= 20) mailState.again = true;
      } while (mailState.again);
      await scheduleNextRun();
    } catch (error) {
      console.error("[papin] mail delivery run failed; the mail stays in the outbox.", error);
    } finally {
      mailState.running = false;
    }
  })();
}

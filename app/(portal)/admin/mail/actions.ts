"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { formAction } from "@/lib/actions";
import { AppError } from "@/lib/errors";
import { getOutboxMail, retryMail } from "@/db/queries/mail";
import { deliverPendingMail } from "@/lib/mail/delivery";
import { formatDateTime } from "@/lib/format";

const sentence = (text: string | null | undefined) => (text ?? "no reason given").replace(/[.\s]+$/, "");
const NOT_CONFIGURED = "Mail is not configured (RESEND_API_KEY, or RESEND_BASE_URL for the local fake), so nothing can be sent yet.";

export const retryMailAction = formAction(
  "mail:read-outbox",
  z.object({ id: z.string().trim().min(1, "Choose an e-mail to retry.") }),
  async ({ id }, actor) => {
    await retryMail({ actor, id });
    const report = await deliverPendingMail({ ids: [id] });
    revalidatePath("/admin/mail");
    if (!report.configured) throw new AppError(503, `The e-mail is queued again. ${NOT_CONFIGURED}`);
    const row = await getOutboxMail({ id });
    if (row?.status === "sent") return `Sent to ${row.to.join(", ")}.`;
    if (row?.status === "failed") throw new AppError(503, `Tried again and gave up after ${row.attempts} attempts: ${sentence(row.lastError)}.`);
    if (report.attempted === 0) return "The e-mail is queued again; another sender is handling it right now.";
    throw new AppError(503, `Tried again without success: ${sentence(row?.lastError)}. Next try ${formatDateTime(row?.nextAttemptAt)} UTC.`);
  },
);

export const sendDueMailAction = formAction("mail:read-outbox", z.object({}), async () => {
  const report = await deliverPendingMail({ limit: 50 });
  revalidatePath("/admin/mail");
  if (!report.configured) throw new AppError(503, NOT_CONFIGURED);
  if (report.attempted === 0) return "Nothing was due: every pending e-mail is waiting for its next try.";
  const parts = [`${report.sent} sent`];
  if (report.retrying) parts.push(`${report.retrying} to be tried again later`);
  if (report.failed) parts.push(`${report.failed} failed for good`);
  return `${parts.join(", ")}.`;
});

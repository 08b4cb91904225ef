"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { formAction } from "@/lib/actions";
import { AppError } from "@/lib/errors";
import { MAIL_NOT_CONFIGURED, retryMailNow, sendDueMail } from "@/lib/services/mail";

export const retryMailAction = formAction("mail:read-outbox", z.object({ id: z.string().trim().min(1, "Choose an e-mail to retry.") }), async ({ id }, actor) => {
  try {
    return await retryMailNow({ actor, id });
  } finally {
    revalidatePath("/admin/mail");
  }
});

export const sendDueMailAction = formAction("mail:read-outbox", z.object({}), async (_input, actor) => {
  const report = await sendDueMail({ actor });
  revalidatePath("/admin/mail");
  if (!report.configured) throw new AppError(503, MAIL_NOT_CONFIGURED);
  if (report.attempted === 0) return "Nothing was due: every pending e-mail is waiting for its next try.";
  const parts = [`${report.sent} sent`];
  if (report.retrying) parts.push(`${report.retrying} to be tried again later`);
  if (report.failed) parts.push(`${report.failed} failed for good`);
  return `${parts.join(", ")}.`;
});

"use server";

import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/actions";
import { createSterilizerSchema, removeScheduleSchema, saveScheduleSchema, sterilizerStatusSchema, updateSterilizerSchema } from "@/lib/validations/equipment";
import { createSterilizer, removeSchedule, saveSchedule, updateSterilizer } from "@/lib/services/equipment";
import { setSterilizerStatus } from "@/lib/services/sterilizer-status";
import { testKindLabel, plural } from "@/lib/domain";
import { z } from "zod";

export const createSterilizerAction = formAction("equipment:manage", createSterilizerSchema, async (input, actor) => {
  await createSterilizer({ actor, input });
  revalidatePath("/sterilizers");
  return `${input.name} was added. Open it to set its test schedule.`;
});

export const updateSterilizerAction = formAction("equipment:manage", updateSterilizerSchema, async ({ id, active, reason, ...input }, actor) => {
  const { changed } = await updateSterilizer({ actor, id, input, active, reason });
  revalidatePath("/sterilizers");
  revalidatePath(`/sterilizers/${id}`);
  return changed ? "The sterilizer was updated." : "Nothing changed.";
});

export const saveScheduleAction = formAction("equipment:manage", saveScheduleSchema, async ({ sterilizerId, kind, intervalDays, requiredBeforeUse, reason }, actor) => {
  const { changed } = await saveSchedule({ actor, sterilizerId, kind, intervalDays, requiredBeforeUse, reason });
  revalidatePath(`/sterilizers/${sterilizerId}`);
  revalidatePath("/periodic-tests");
  const required = requiredBeforeUse ? ", required before use" : "";
  return changed ? `${testKindLabel(kind)}: every ${intervalDays === 1 ? "day" : plural(intervalDays, "day")}${required}.` : "Nothing changed.";
});

export const removeScheduleAction = formAction("equipment:manage", removeScheduleSchema, async ({ sterilizerId, kind, reason }, actor) => {
  await removeSchedule({ actor, sterilizerId, kind, reason });
  revalidatePath(`/sterilizers/${sterilizerId}`);
  revalidatePath("/periodic-tests");
  return `${testKindLabel(kind)} was taken off the schedule.`;
});

export const setSterilizerStatusAction = formAction(
  "equipment:manage",
  sterilizerStatusSchema.extend({ sterilizerId: z.string().min(1) }),
  async ({ sterilizerId, status, reason, password }, actor) => {
    const after = await setSterilizerStatus({ actor, sterilizerId, status, reason, password });
    revalidatePath("/sterilizers");
    revalidatePath(`/sterilizers/${sterilizerId}`);
    revalidatePath("/");
    return after.status === "in-use" ? `${after.name} is released and back in use.` : `${after.name} is out of use. ${after.statusReason}`;
  },
);

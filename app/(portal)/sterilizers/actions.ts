"use server";

import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/actions";
import { createSterilizerSchema, removeScheduleSchema, saveScheduleSchema, updateSterilizerSchema } from "@/lib/validations/equipment";
import { createSterilizer, removeSchedule, saveSchedule, updateSterilizer } from "@/lib/services/equipment";
import { testKindLabel } from "@/lib/domain";

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

export const saveScheduleAction = formAction("equipment:manage", saveScheduleSchema, async ({ sterilizerId, kind, intervalDays, reason }, actor) => {
  const { changed } = await saveSchedule({ actor, sterilizerId, kind, intervalDays, reason });
  revalidatePath(`/sterilizers/${sterilizerId}`);
  revalidatePath("/periodic-tests");
  return changed ? `${testKindLabel(kind)}: every ${intervalDays} day${intervalDays === 1 ? "" : "s"}.` : "Nothing changed.";
});

export const removeScheduleAction = formAction("equipment:manage", removeScheduleSchema, async ({ sterilizerId, kind, reason }, actor) => {
  await removeSchedule({ actor, sterilizerId, kind, reason });
  revalidatePath(`/sterilizers/${sterilizerId}`);
  revalidatePath("/periodic-tests");
  return `${testKindLabel(kind)} was taken off the schedule.`;
});

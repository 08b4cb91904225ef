"use server";

import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/actions";
import { createProfileSchema, updateProfileSchema } from "@/lib/validations/equipment";
import { createProfile, updateProfile } from "@/lib/services/profiles";

export const createProfileAction = formAction("equipment:manage", createProfileSchema, async (input, actor) => {
  await createProfile({ actor, input });
  revalidatePath("/profiles");
  return `The profile “${input.name}” was added.`;
});

export const updateProfileAction = formAction("equipment:manage", updateProfileSchema, async ({ id, reason, ...input }, actor) => {
  const outcome = await updateProfile({ actor, id, input, reason });
  revalidatePath("/profiles");
  revalidatePath("/sterilizers");
  revalidatePath(`/profiles/${id}`);
  if (outcome.mode === "unchanged") return "Nothing changed.";
  if (outcome.mode === "in-place") return "The profile was updated. No cycle had been analysed against it yet.";
  return `Cycles were analysed against the old limits, so a new version was created and the old one retired${outcome.moved ? `; ${outcome.moved} sterilizer${outcome.moved === 1 ? " now uses" : "s now use"} the new version by default` : ""}.`;
});

"use server";

import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/actions";
import { createStudy } from "@/lib/services/studies";
import { createStudyFormSchema } from "@/lib/validations/study-forms";

export const createStudyAction = formAction("study:plan", createStudyFormSchema, async ({ pattern, ...input }, actor) => {
  const { id, studyNumber } = await createStudy({ actor, input: { ...input, loadingPattern: pattern } });
  revalidatePath("/studies");
  return { message: `${studyNumber} was saved as a draft.`, href: `/studies/${id}` };
});

"use server";

import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/actions";
import { STUDY_SIGNATURE_MEANING_LABELS, STUDY_STATUS_LABELS } from "@/lib/domain";
import { attachRun, signStudy, updateStudyDraft } from "@/lib/services/studies";
import { attachRunFormSchema, signStudyFormSchema, updateDraftFormSchema } from "@/lib/validations/study-forms";

function refresh(id: string) {
  revalidatePath("/studies");
  revalidatePath(`/studies/${id}`);
}

export const updateStudyDraftAction = formAction("study:plan", updateDraftFormSchema, async ({ id, reason, pattern, ...changes }, actor) => {
  await updateStudyDraft({ actor, id, changes: { ...changes, ...(pattern ? { loadingPattern: pattern } : {}) }, reason });
  refresh(id);
  return "The draft was saved; each change is in the audit ledger.";
});

export const attachRunAction = formAction("study:run", attachRunFormSchema, async ({ id, cycleId, sensorMap }, actor) => {
  const { runNumber, judgement } = await attachRun({ actor, id, cycleId, sensorMap });
  refresh(id);
  const words = judgement === "pass" ? "it passes" : judgement === "fail" ? "it fails, and a deviation was opened" : "it is pending until its indicators are read";
  return { message: `Attached as run ${runNumber}: ${words}.`, href: `/studies/${id}#runs` };
});

export const signStudyAction = formAction("study:sign", signStudyFormSchema, async ({ id, meaning, password, reason }, actor) => {
  const { status } = await signStudy({ actor, id, password, meaning, reason });
  refresh(id);
  revalidatePath("/");
  return `Signed "${STUDY_SIGNATURE_MEANING_LABELS[meaning]}" by ${actor.name}. The study is now: ${STUDY_STATUS_LABELS[status as keyof typeof STUDY_STATUS_LABELS].toLowerCase()}.`;
});

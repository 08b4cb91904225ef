"use server";

import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/actions";
import { closeDeviationSchema, indicatorFormSchema, raiseDeviationSchema, updateDeviationSchema } from "@/lib/validations/study-evidence";
import { closeDeviation, raiseDeviation, recordIndicator, updateDeviation } from "@/lib/services/studies";
import { INDICATOR_KIND_LABELS, INDICATOR_RESULT_LABELS, isPositiveIndicator } from "@/lib/domain";

/** The study's evidence: indicator readings and deviations (issue 14 §4, §5). Each action: guard → parse → one service call. */

const refreshStudy = (studyId: string) => {
  revalidatePath(`/studies/${studyId}`);
  revalidatePath("/studies");
};

export const recordIndicatorAction = formAction("study:run", indicatorFormSchema, async ({ studyId, runId, ...input }, actor) => {
  await recordIndicator({ actor, id: studyId, runId, input });
  refreshStudy(studyId);
  const what = `${INDICATOR_KIND_LABELS[input.kind]} at ${input.positionId}: ${INDICATOR_RESULT_LABELS[input.result]}`;
  return isPositiveIndicator(input.result) ? `${what} recorded. A positive indicator fails the run and opens a deviation.` : `${what} recorded.`;
});

export const raiseDeviationAction = formAction("study:run", raiseDeviationSchema, async ({ studyId, ...input }, actor) => {
  await raiseDeviation({ actor, id: studyId, input });
  refreshStudy(studyId);
  return "Deviation raised. The study cannot be approved until it is closed.";
});

export const updateDeviationAction = formAction("study:run", updateDeviationSchema, async ({ studyId, deviationId, ...changes }, actor) => {
  await updateDeviation({ actor, id: studyId, deviationId, changes });
  refreshStudy(studyId);
  return "Deviation updated.";
});

export const closeDeviationAction = formAction("deviation:close", closeDeviationSchema, async ({ studyId, deviationId, reason }, actor) => {
  await closeDeviation({ actor, id: studyId, deviationId, reason });
  refreshStudy(studyId);
  return "Deviation closed.";
});

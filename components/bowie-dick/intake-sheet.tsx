"use client";

import { Panel } from "@/components/ui/panel";
import { fetchJson } from "@/lib/client/fetch-json";
import { IndicatorPhotoField } from "./photo-field";
import { IndicatorSheetFields } from "./sheet-fields";

/** Intake of a Bowie-Dick cycle: the test is judged by its sheet, so its result, lot and photo are asked for with the logged file. */
export function IntakeSheetPanel({ step, errors, busy }: { step: number; errors: Record<string, string>; busy: boolean }) {
  return (
    <Panel title={`${step} · Indicator sheet`}>
      <p className="mb-3 text-sm text-ink-soft">
        A Bowie-Dick test passes only on a uniform colour change of its indicator sheet. The logged file is kept for its chart; its plateau analysis does not decide this test.
      </p>
      <fieldset disabled={busy} className="space-y-3">
        <IndicatorSheetFields idPrefix="intake-sheet" errors={errors} />
        <IndicatorPhotoField id="intake-sheet-photo" error={errors.photo} />
      </fieldset>
    </Panel>
  );
}

/** What is missing from the sheet part of the intake form, by field; empty when complete. */
export function intakeSheetProblems(form: HTMLFormElement): Record<string, string> {
  const data = new FormData(form);
  const problems: Record<string, string> = {};
  if (!data.get("outcome")) problems.outcome = "Say whether the indicator sheet changed colour uniformly.";
  if (!String(data.get("indicatorLot") ?? "").trim()) problems.indicatorLot = "Enter the indicator's lot number.";
  const photo = data.get("photo");
  if (!(photo instanceof File) || photo.size === 0) problems.photo = "Attach a photo of the indicator sheet (JPEG or PNG, up to 10 MB).";
  return problems;
}

/** Sends the sheet of a newly created Bowie-Dick cycle; the answer's plain sentence when it was refused. */
export async function sendIntakeSheet(cycleId: string, form: HTMLFormElement): Promise<string | null> {
  const data = new FormData(form);
  const sheet = new FormData();
  for (const name of ["outcome", "indicatorLot", "photo"]) {
    const value = data.get(name);
    if (value !== null) sheet.append(name, value);
  }
  try {
    await fetchJson(`/api/cycles/${cycleId}/indicator-sheet`, { form: sheet, what: "the indicator sheet" });
    return null;
  } catch (error) {
    return error instanceof Error ? error.message : "The indicator sheet could not be saved.";
  }
}

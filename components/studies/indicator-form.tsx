"use client";

import { useEffect, useState } from "react";
import { recordIndicatorAction } from "@/app/(portal)/studies/[id]/evidence-actions";
import { Field, TextInput, useFormAction } from "@/components/equipment/form-bits";
import { ActionMessage } from "@/components/ui/action-message";
import { INDICATOR_KINDS, INDICATOR_KIND_LABELS, INDICATOR_RESULT_LABELS, RESULTS_OF_KIND, type IndicatorKind, type PatternPosition } from "@/lib/domain";
import { DEFAULT_BI_INCUBATION, DEFAULT_BI_ORGANISM, formatPopulation, isIndicatorCorrection, parsePopulation } from "@/lib/domain/study-evidence";

type Run = { id: string; runNumber: number; cycleNumber: string };

function toLocalInput(d: Date): string {
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}T${pad(d.getHours())}:${pad(d.getMinutes())}`;
}

/** Records one indicator reading; a second reading of the same run, position and kind is a correction and needs a reason. */
export function IndicatorForm({
  studyId,
  runs,
  positions,
  recorded,
}: {
  studyId: string;
  runs: Run[];
  positions: PatternPosition[];
  recorded: Array<{ runId: string; positionId: string; kind: IndicatorKind }>;
}) {
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(recordIndicatorAction);
  // Start at the first place still without a biological reading, so the usual next entry needs no choosing.
  const unread = runs.flatMap((r) => positions.map((p) => ({ runId: r.id, positionId: p.id }))).find((slot) => !isIndicatorCorrection(recorded, { ...slot, kind: "biological" }));
  const [runId, setRunId] = useState(unread?.runId ?? runs[runs.length - 1]?.id ?? "");
  const [positionId, setPositionId] = useState(unread?.positionId ?? positions[0]?.id ?? "");
  const [kind, setKind] = useState<IndicatorKind>("biological");
  const [population, setPopulation] = useState("");
  const [local, setLocal] = useState("");
  // The reader's clock is the browser's, not the server's: set after hydration.
  // eslint-disable-next-line react-hooks/set-state-in-effect -- one update after mount, to avoid a hydration mismatch
  useEffect(() => setLocal(toLocalInput(new Date())), []);
  const readAtIso = local && !Number.isNaN(new Date(local).getTime()) ? new Date(local).toISOString() : "";
  const correction = isIndicatorCorrection(recorded, { runId, positionId, kind });
  const populationCount = parsePopulation(population);

  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="space-y-3 rounded-md border border-ink-line p-3" aria-label="Record an indicator reading" data-testid="indicator-form">
      <h3 className="text-sm font-semibold">Record a reading</h3>
      <input type="hidden" name="studyId" value={studyId} />
      <div className="grid gap-3 sm:grid-cols-3">
        <Field id="ind-run" label="Run" error={errors.runId}>
          <select id="ind-run" name="runId" className="field-input" value={runId} onChange={(e) => setRunId(e.target.value)}>
            {runs.map((r) => (
              <option key={r.id} value={r.id}>
                Run {r.runNumber} ({r.cycleNumber})
              </option>
            ))}
          </select>
        </Field>
        <Field id="ind-position" label="Position" error={errors.positionId}>
          <select id="ind-position" name="positionId" className="field-input" value={positionId} onChange={(e) => setPositionId(e.target.value)}>
            {positions.map((p) => (
              <option key={p.id} value={p.id}>
                {p.id} — {p.label}
              </option>
            ))}
          </select>
        </Field>
        <Field id="ind-kind" label="Indicator" error={errors.kind}>
          <select id="ind-kind" name="kind" className="field-input" value={kind} onChange={(e) => setKind(e.target.value as IndicatorKind)}>
            {INDICATOR_KINDS.map((k) => (
              <option key={k} value={k}>
                {INDICATOR_KIND_LABELS[k]}
              </option>
            ))}
          </select>
        </Field>
      </div>
      <fieldset aria-describedby={errors.result ? "ind-result-error" : undefined}>
        <legend className="field-label">Result</legend>
        <div className="flex flex-wrap gap-4">
          {RESULTS_OF_KIND[kind].map((r) => (
            <label key={r} className="flex items-center gap-2 text-sm">
              <input type="radio" name="result" value={r} required />
              {INDICATOR_RESULT_LABELS[r]}
            </label>
          ))}
        </div>
        {errors.result && (
          <p className="field-error" id="ind-result-error">
            {errors.result}
          </p>
        )}
      </fieldset>
      <div className="grid gap-3 sm:grid-cols-2">
        {kind === "biological" && (
          <>
            <TextInput id="ind-organism" name="organism" label="Test organism" defaultValue={DEFAULT_BI_ORGANISM} error={errors.organism} />
            <TextInput
              id="ind-population"
              name="population"
              label="Population per carrier"
              value={population}
              onChange={setPopulation}
              placeholder="e.g. 1.5e6 or 1.5 × 10^6"
              error={errors.population}
              hint={populationCount === null ? "From the indicator's certificate." : `Reads as ${formatPopulation(populationCount)}.`}
            />
            <TextInput id="ind-incubation" name="incubation" label="Incubation" defaultValue={DEFAULT_BI_INCUBATION} error={errors.incubation} />
          </>
        )}
        <TextInput id="ind-lot" name="lot" label="Lot" error={errors.lot} />
        <TextInput id="ind-read-by" name="readBy" label="Read by" error={errors.readBy} />
        <Field id="ind-read-at" label="Read at (your local time)" error={errors.readAt}>
          <input id="ind-read-at" type="datetime-local" className="field-input" value={local} onChange={(e) => setLocal(e.target.value)} aria-invalid={!!errors.readAt} />
          <input type="hidden" name="readAt" value={readAtIso} />
        </Field>
      </div>
      {correction && (
        <Field id="ind-reason" label="Why is the earlier reading corrected? (required)" error={errors.reason} hint="The earlier reading stays in the history; this one counts from now on.">
          <textarea id="ind-reason" name="reason" rows={2} required className="field-input" aria-invalid={!!errors.reason} />
        </Field>
      )}
      <ActionMessage state={state} />
      <button className="btn-primary" disabled={pending}>
        {pending ? "Saving…" : correction ? "Record the correction" : "Record the reading"}
      </button>
    </form>
  );
}

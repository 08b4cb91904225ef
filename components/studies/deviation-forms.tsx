"use client";

import { closeDeviationAction, raiseDeviationAction, updateDeviationAction } from "@/app/(portal)/studies/[id]/evidence-actions";
import { Field, TextInput, useFormAction } from "@/components/equipment/form-bits";
import { ActionMessage } from "@/components/ui/action-message";

type DeviationFields = { id: string; impact: string; rootCause: string; capaReference: string };

/** The investigation of an open deviation: impact, root cause and the CAPA reference, each change audited old → new. */
export function DeviationEditForm({ studyId, deviation: d }: { studyId: string; deviation: DeviationFields }) {
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(updateDeviationAction);
  const field = (name: string) => `dev-${d.id}-${name}`;
  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="mt-2 space-y-2" aria-label="Investigation of the deviation" data-testid="deviation-edit">
      <input type="hidden" name="studyId" value={studyId} />
      <input type="hidden" name="deviationId" value={d.id} />
      <Field id={field("impact")} label="Impact assessment" error={errors.impact} hint="What this means for the load and the study's conclusion.">
        <textarea id={field("impact")} name="impact" rows={2} className="field-input" defaultValue={d.impact} aria-invalid={!!errors.impact} />
      </Field>
      <Field id={field("root-cause")} label="Root cause" error={errors.rootCause}>
        <textarea id={field("root-cause")} name="rootCause" rows={2} className="field-input" defaultValue={d.rootCause} aria-invalid={!!errors.rootCause} />
      </Field>
      <TextInput id={field("capa")} name="capaReference" label="CAPA reference (corrective and preventive action)" defaultValue={d.capaReference} error={errors.capaReference} />
      <ActionMessage state={state} compact />
      <button className="btn-secondary" disabled={pending}>
        {pending ? "Saving…" : "Save the investigation"}
      </button>
    </form>
  );
}

/** Closing is for engineers, with a reason, once impact and root cause are saved; a closed deviation stays closed. */
export function CloseDeviationForm({ studyId, deviation: d }: { studyId: string; deviation: DeviationFields }) {
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(closeDeviationAction);
  const missing = [!d.impact.trim() && "the impact", !d.rootCause.trim() && "the root cause"].filter(Boolean);
  const id = `dev-${d.id}-close`;
  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="mt-3 space-y-2 border-t border-ink-line pt-3" aria-label="Close the deviation" data-testid="deviation-close">
      <input type="hidden" name="studyId" value={studyId} />
      <input type="hidden" name="deviationId" value={d.id} />
      {missing.length > 0 ? (
        <p className="text-sm text-caution-700">▲ To close this deviation, first write and save {missing.join(" and ")}.</p>
      ) : (
        <Field id={id} label="Why is the deviation closed? (required)" error={errors.reason}>
          <textarea id={id} name="reason" rows={2} required className="field-input" aria-invalid={!!errors.reason} />
        </Field>
      )}
      <ActionMessage state={state} compact />
      <button className="btn-secondary" disabled={pending || missing.length > 0}>
        {pending ? "Closing…" : "Close the deviation"}
      </button>
    </form>
  );
}

/** A deviation raised by hand: what happened, for one run or the study as a whole. */
export function RaiseDeviationForm({ studyId, runs }: { studyId: string; runs: Array<{ id: string; runNumber: number; cycleNumber: string }> }) {
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(raiseDeviationAction, { resetOnSuccess: true });
  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="space-y-2 rounded-md border border-ink-line p-3" aria-label="Raise a deviation" data-testid="deviation-raise">
      <h3 className="text-sm font-semibold">Raise a deviation</h3>
      <input type="hidden" name="studyId" value={studyId} />
      <Field id="dev-raise-run" label="Concerns" error={errors.runId}>
        <select id="dev-raise-run" name="runId" className="field-input" defaultValue="">
          <option value="">The study as a whole</option>
          {runs.map((r) => (
            <option key={r.id} value={r.id}>
              Run {r.runNumber} ({r.cycleNumber})
            </option>
          ))}
        </select>
      </Field>
      <Field id="dev-raise-what" label="What happened (required)" error={errors.what}>
        <textarea id="dev-raise-what" name="what" rows={2} required className="field-input" aria-invalid={!!errors.what} />
      </Field>
      <Field id="dev-raise-impact" label="Impact assessment (optional now)" error={errors.impact}>
        <textarea id="dev-raise-impact" name="impact" rows={2} className="field-input" aria-invalid={!!errors.impact} />
      </Field>
      <ActionMessage state={state} compact />
      <button className="btn-secondary" disabled={pending}>
        {pending ? "Saving…" : "Raise the deviation"}
      </button>
    </form>
  );
}

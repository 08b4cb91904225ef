"use client";

import { setPatternRequiredBeforeUseAction } from "@/app/(portal)/sterilizers/[id]/actions";
import { TextInput, useFormAction } from "@/components/equipment/form-bits";
import { ActionMessage } from "@/components/ui/action-message";

/** An engineer marks a loading pattern "required before use" (or lifts the mark), with a reason for the ledger. */
export function RequiredBeforeUseToggle({ patternId, patternName, requiredBeforeUse }: { patternId: string; patternName: string; requiredBeforeUse: boolean }) {
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(setPatternRequiredBeforeUseAction, { resetOnSuccess: true });
  const next = !requiredBeforeUse;
  const label = next ? `Require requalification of ${patternName} before use` : `Lift the before-use requirement of ${patternName}`;
  return (
    <details className="rounded-md border border-ink-line px-3 py-2">
      <summary className="cursor-pointer text-sm font-medium text-steam-700">{label}</summary>
      <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="mt-3 space-y-3" noValidate aria-label={label}>
        <input type="hidden" name="patternId" value={patternId} />
        <input type="hidden" name="requiredBeforeUse" value={next ? "true" : "false"} />
        <p className="text-sm text-ink-soft">
          {next
            ? "Once its requalification is overdue (or while it was never qualified), the status board says this load may not be run until a study is approved."
            : "An overdue requalification will show as a reminder only; the load is no longer held."}
        </p>
        <TextInput id={`pattern-reason-${patternId}`} name="reason" label="Reason (kept in the audit ledger)" error={errors.reason} />
        <ActionMessage state={state} />
        <button className="btn-secondary w-full" disabled={pending}>
          {pending ? "Saving…" : next ? "Mark required before use" : "Lift the requirement"}
        </button>
      </form>
    </details>
  );
}

"use client";

import { setSterilizerStatusAction } from "@/app/(portal)/sterilizers/actions";
import { ActionMessage } from "@/components/ui/action-message";
import type { SterilizerStatus } from "@/lib/domain";
import { TextInput, useFormAction } from "./form-bits";

/** An engineer's signed decision: take the sterilizer out of use, or release it (password and reason). */
export function StatusDecisionForm({ sterilizerId, status }: { sterilizerId: string; status: SterilizerStatus }) {
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(setSterilizerStatusAction, { resetOnSuccess: true });
  const next: SterilizerStatus = status === "in-use" ? "out-of-use" : "in-use";
  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="space-y-3" noValidate aria-label={next === "in-use" ? "Release the sterilizer" : "Take the sterilizer out of use"}>
      <input type="hidden" name="sterilizerId" value={sterilizerId} />
      <input type="hidden" name="status" value={next} />
      <p className="text-sm text-ink-soft">
        {next === "in-use"
          ? "Releasing clears an engineer's hold and acknowledges the confirmed failures on record. It cannot stand in for a required test that is due: that test must pass and be approved."
          : "Taking it out of use stays in force until an engineer releases it, whatever the tests show."}
      </p>
      <TextInput id="status-reason" name="reason" label={next === "in-use" ? "Why may it be used again?" : "Why is it out of use?"} error={errors.reason} />
      <TextInput id="status-password" name="password" type="password" label="Your password (re-entered to sign)" error={errors.password} />
      <ActionMessage state={state} />
      <button className={next === "in-use" ? "btn-primary w-full" : "btn-danger w-full"} disabled={pending}>
        {pending ? "Signing…" : next === "in-use" ? "Sign and release" : "Sign and take out of use"}
      </button>
    </form>
  );
}

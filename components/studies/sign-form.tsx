"use client";

import { useState } from "react";
import { signStudyAction } from "@/app/(portal)/studies/[id]/actions";
import { TextInput, useFormAction } from "@/components/equipment/form-bits";
import { ActionMessage } from "@/components/ui/action-message";
import { STUDY_SIGNATURE_MEANING_LABELS, type StudySignatureMeaning } from "@/lib/domain";

/** Meanings that close or send back the study: the signer says why. */
const NEEDS_REASON: StudySignatureMeaning[] = ["failed", "returned"];

const WHAT_IT_DOES: Record<StudySignatureMeaning, string> = {
  "protocol-approved": "Freezes the protocol, criteria and loading pattern; runs can be attached.",
  "submitted-for-review": "Sends the complete series to review; no more runs.",
  reviewed: "You have checked the runs, figures, indicators and deviations.",
  "qa-approved": "Approves the study, archives its signed report and sets the pattern's requalification date.",
  failed: "Closes the study as failed; it changes no more.",
  returned: "Sends the study back to the author; runs can be attached again.",
};

/** An engineer's electronic signature on a study: only the meanings this person may sign now, the reason, the password. */
export function StudySignForm({ studyId, meanings, signerName }: { studyId: string; meanings: StudySignatureMeaning[]; signerName: string }) {
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(signStudyAction, { resetOnSuccess: true });
  const [meaning, setMeaning] = useState<StudySignatureMeaning>(meanings[0]);
  const reasonRequired = NEEDS_REASON.includes(meaning);
  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="space-y-3" noValidate aria-label="Sign the study" data-testid="study-sign">
      <input type="hidden" name="id" value={studyId} />
      <fieldset>
        <legend className="field-label">Meaning of your signature</legend>
        <div className="space-y-1">
          {meanings.map((m) => (
            <label key={m} className="flex items-start gap-2 text-sm">
              <input type="radio" name="meaning" value={m} checked={meaning === m} onChange={() => setMeaning(m)} className="mt-1" />
              <span>
                {STUDY_SIGNATURE_MEANING_LABELS[m]}
                <span className="block text-xs text-ink-muted">{WHAT_IT_DOES[m]}</span>
              </span>
            </label>
          ))}
        </div>
        {errors.meaning && <p className="field-error">{errors.meaning}</p>}
      </fieldset>
      <TextInput id="study-sign-reason" name="reason" label={`Reason ${reasonRequired ? "(required)" : "(optional)"}`} error={errors.reason} />
      <TextInput id="study-sign-password" name="password" type="password" label="Your password (re-entered to sign)" error={errors.password} />
      <p className="text-xs text-ink-muted">
        Signing as <strong>{signerName}</strong>. Your printed name, role, the meaning, the reason and the time (UTC) are stored with the signature and the audit ledger.
      </p>
      <ActionMessage state={state} />
      <button className={meaning === "failed" ? "btn-danger" : "btn-primary"} disabled={pending}>
        {pending ? "Signing…" : "Sign"}
      </button>
    </form>
  );
}

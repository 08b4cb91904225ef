"use client";

import { useRouter } from "next/navigation";
import { useState, type FormEvent } from "react";
import { fetchJson, RequestError } from "@/lib/client/fetch-json";
import { IDLE_FORM_STATE, type FormState } from "@/lib/form-state";
import { ActionMessage } from "@/components/ui/action-message";
import { IndicatorPhotoField } from "./photo-field";
import { IndicatorSheetFields } from "./sheet-fields";

/** Records (or, with a reason, re-records) the indicator sheet of a Bowie-Dick cycle: POST /api/cycles/{id}/indicator-sheet. */
export function CycleSheetForm({ cycleId, replacing }: { cycleId: string; replacing: boolean }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<FormState>(IDLE_FORM_STATE);
  const [saved, setSaved] = useState(0);

  async function save(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    setBusy(true);
    setMessage(IDLE_FORM_STATE);
    try {
      const answer = await fetchJson<{ verdict: "pass" | "fail" }>(`/api/cycles/${cycleId}/indicator-sheet`, { form, what: "the indicator sheet" });
      setMessage({ status: "ok", message: `Sheet recorded: the Bowie-Dick test ${answer.verdict === "pass" ? "passed" : "FAILED"}.` });
      setSaved((n) => n + 1);
      router.refresh();
    } catch (error) {
      const text = error instanceof Error ? error.message : "Something went wrong.";
      const field = error instanceof RequestError ? error.field : undefined;
      setMessage({ status: "error", message: text, fieldErrors: field ? { [field]: text } : undefined });
    } finally {
      setBusy(false);
    }
  }

  const errors = message.fieldErrors ?? {};
  return (
    <form onSubmit={save} noValidate className="space-y-3" aria-label="Record the indicator sheet" key={saved}>
      <IndicatorSheetFields idPrefix="cycle-sheet" errors={errors} />
      <IndicatorPhotoField id="cycle-sheet-photo" error={errors.photo} />
      {replacing && (
        <div>
          <label htmlFor="cycle-sheet-reason" className="field-label">
            Reason for recording the sheet again (required)
          </label>
          <textarea id="cycle-sheet-reason" name="reason" rows={2} className="field-input" aria-invalid={!!errors.reason} />
          {errors.reason && <p className="field-error">{errors.reason}</p>}
        </div>
      )}
      <button type="submit" className="btn-primary" disabled={busy}>
        {busy ? "Saving…" : replacing ? "Record the sheet again" : "Record the sheet"}
      </button>
      <ActionMessage state={message} />
    </form>
  );
}

"use client";

import { addCertificateAction, clearMappingAction, createInstrumentAction } from "@/app/(portal)/instruments/actions";
import { Field, TextInput, useFormAction } from "./form-bits";
import { ActionMessage } from "@/components/ui/action-message";
import { INSTRUMENT_KIND_LABELS as KIND_LABELS } from "@/lib/domain";

export function InstrumentForm() {
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(createInstrumentAction, { resetOnSuccess: true });
  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="space-y-3" noValidate aria-label="Add an instrument">
      <TextInput id="inst-name" name="name" label="Name" error={errors.name} placeholder="e.g. Thermocouple logger (unit C)" />
      <TextInput id="inst-serial" name="serialNumber" label="Serial number" error={errors.serialNumber} />
      <Field id="inst-kind" label="Kind" error={errors.kind}>
        <select id="inst-kind" name="kind" className="field-input" defaultValue="logger">
          {Object.entries(KIND_LABELS).map(([k, v]) => (
            <option key={k} value={k}>
              {v}
            </option>
          ))}
        </select>
      </Field>
      <TextInput id="inst-channels" name="channelCount" label="Channels (optional)" inputMode="numeric" error={errors.channelCount} />
      <ActionMessage state={state} />
      <button className="btn-primary w-full" disabled={pending}>
        {pending ? "Adding…" : "Add instrument"}
      </button>
    </form>
  );
}

export function CertificateForm({ instrumentId, today }: { instrumentId: string; today: string }) {
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(addCertificateAction, { resetOnSuccess: true });
  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="space-y-3" noValidate aria-label="Record a calibration certificate">
      <input type="hidden" name="instrumentId" value={instrumentId} />
      <TextInput id="cert-number" name="certificateNumber" label="Certificate number" error={errors.certificateNumber} />
      <TextInput id="cert-issuer" name="issuedBy" label="Issued by (calibration laboratory)" error={errors.issuedBy} />
      <div className="grid grid-cols-2 gap-3">
        <TextInput id="cert-calibrated" name="calibratedOn" type="date" label="Calibrated on" defaultValue={today} error={errors.calibratedOn} />
        <TextInput id="cert-due" name="dueOn" type="date" label="Due on" error={errors.dueOn} />
      </div>
      <TextInput
        id="cert-uncertainty"
        name="uncertaintyK"
        label="Expanded uncertainty (optional)"
        suffix="K"
        inputMode="decimal"
        error={errors.uncertaintyK}
        hint="For temperature channels; note a pressure sensor's uncertainty in the notes."
      />
      <TextInput id="cert-notes" name="notes" label="Notes (optional)" error={errors.notes} />
      <ActionMessage state={state} />
      <button className="btn-primary w-full" disabled={pending}>
        {pending ? "Saving…" : "Record certificate"}
      </button>
    </form>
  );
}

export function ClearMappingForm({ instrumentId }: { instrumentId: string }) {
  const { state, pending, onSubmit, onChange, errors } = useFormAction(clearMappingAction);
  return (
    <form onSubmit={onSubmit} onChange={onChange} className="space-y-2" noValidate aria-label="Clear the saved channel mapping">
      <input type="hidden" name="instrumentId" value={instrumentId} />
      <TextInput id="clear-reason" name="reason" label="Reason" error={errors.reason} hint="e.g. probes re-wired, logger re-configured." />
      <ActionMessage state={state} />
      <button className="btn-danger" disabled={pending}>
        {pending ? "Clearing…" : "Clear saved mapping"}
      </button>
    </form>
  );
}

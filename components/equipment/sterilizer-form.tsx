"use client";

import { useState } from "react";
import { createSterilizerAction, updateSterilizerAction } from "@/app/(portal)/sterilizers/actions";
import { sizeClassOf } from "@/lib/periodic-tests/sterilizer-class";
import { Field, TextInput, useFormAction } from "./form-bits";
import { ActionMessage } from "@/components/ui/action-message";

type ProfileChoice = { id: string; name: string };
type SterilizerValues = {
  id: string;
  name: string;
  serialNumber: string;
  model: string | null;
  location: string | null;
  chamberVolumeL: number;
  airDetectorFitted: boolean;
  defaultProfileId: string | null;
  active: boolean;
};

export function SterilizerForm({ profiles, sterilizer }: { profiles: ProfileChoice[]; sterilizer?: SterilizerValues }) {
  const editing = !!sterilizer;
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(editing ? updateSterilizerAction : createSterilizerAction, { resetOnSuccess: !editing });
  const [volume, setVolume] = useState(sterilizer ? String(sterilizer.chamberVolumeL) : "");
  const volumeNumber = Number(volume.replace(",", "."));
  const sizeClass = volume && Number.isFinite(volumeNumber) && volumeNumber > 0 ? sizeClassOf(volumeNumber) : null;
  const p = editing ? `edit-${sterilizer.id}` : "new-sterilizer";
  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="space-y-3" noValidate aria-label={editing ? "Edit sterilizer" : "Add a sterilizer"}>
      {editing && <input type="hidden" name="id" value={sterilizer.id} />}
      <TextInput id={`${p}-name`} name="name" label="Name" error={errors.name} defaultValue={sterilizer?.name} placeholder="e.g. Porous load 3" />
      <TextInput id={`${p}-serial`} name="serialNumber" label="Serial number" error={errors.serialNumber} defaultValue={sterilizer?.serialNumber} />
      <TextInput id={`${p}-model`} name="model" label="Model (optional)" error={errors.model} defaultValue={sterilizer?.model} />
      <TextInput id={`${p}-location`} name="location" label="Location (optional)" error={errors.location} defaultValue={sterilizer?.location} />
      <TextInput
        id={`${p}-volume`}
        name="chamberVolumeL"
        label="Chamber volume"
        suffix="l"
        inputMode="decimal"
        error={errors.chamberVolumeL}
        value={volume}
        onChange={setVolume}
        hint={sizeClass ? `${sizeClass.label}. ${sizeClass.note}` : "Under 60 l is a small sterilizer (EN 13060); 60 l and over falls under EN 285."}
      />
      <Field id={`${p}-profile`} label="Default acceptance profile" error={errors.defaultProfileId} hint="Preselected when a cycle of this sterilizer is registered.">
        <select id={`${p}-profile`} name="defaultProfileId" className="field-input" defaultValue={sterilizer?.defaultProfileId ?? ""}>
          <option value="">— none —</option>
          {profiles.map((pr) => (
            <option key={pr.id} value={pr.id}>
              {pr.name}
            </option>
          ))}
        </select>
      </Field>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" name="airDetectorFitted" defaultChecked={sterilizer?.airDetectorFitted ?? true} /> Air detector fitted
      </label>
      {!editing && (
        <div>
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" name="vacuumAirRemoval" defaultChecked /> Removes air by vacuum (porous-load, type B)
          </label>
          <p className="mt-1 text-xs text-ink-muted">
            Starts its schedule with a daily Bowie-Dick test and a weekly air leakage test, both required before use: until they pass and are approved it shows as out of use. Untick for a fluids or
            non-vacuum sterilizer.
          </p>
        </div>
      )}
      {editing && (
        <>
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" name="active" defaultChecked={sterilizer.active} /> In service (untick to retire it; its records stay)
          </label>
          <TextInput id={`${p}-reason`} name="reason" label="Reason for the change" error={errors.reason} hint="Written to the audit ledger with the old and new values." />
        </>
      )}
      <ActionMessage state={state} />
      <button className="btn-primary w-full" disabled={pending}>
        {pending ? "Saving…" : editing ? "Save changes" : "Add sterilizer"}
      </button>
    </form>
  );
}

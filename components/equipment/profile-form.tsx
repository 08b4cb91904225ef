"use client";

import { useState } from "react";
import { createProfileAction, updateProfileAction } from "@/app/(portal)/profiles/actions";
import { Field, TextInput, useFormAction } from "./form-bits";
import { ActionMessage } from "@/components/ui/action-message";
import { PROFILE_BASES, PROFILE_BASIS_LABELS, PROFILE_BASIS_SCOPES, summariseBasisMinimums, type ProfileBasis } from "@/lib/domain";

type Values = Record<(typeof KEYS)[number], string>;
const KEYS = [
  "name",
  "sterilizationTempC",
  "bandK",
  "holdingTimeS",
  "maxEquilibrationS",
  "maxSpreadK",
  "saturationLimitK",
  "f0ReferenceC",
  "f0ZK",
  "maxSampleIntervalS",
  "freeSpaceEarlyK",
  "freeSpaceEarlyS",
  "freeSpaceK",
  "basis",
  "basisReason",
] as const;

// DOMAIN.md §2.2 / §2.3 / §2.10: EN 285 and EN 13060 bands and minimum holding times; F0 at 121.1 °C, z = 10 K (US/PDA practice).
const PRESETS: Array<{ label: string; values: Partial<Values> }> = [
  { label: "134 °C / 3 min", values: { name: "134 °C / 3 min", sterilizationTempC: "134", holdingTimeS: "180", basis: "en-285" } },
  { label: "126 °C / 10 min", values: { name: "126 °C / 10 min", sterilizationTempC: "126", holdingTimeS: "600", basis: "en-285" } },
  { label: "121 °C / 15 min", values: { name: "121 °C / 15 min", sterilizationTempC: "121", holdingTimeS: "900", basis: "en-285" } },
  { label: "Benchtop 134 °C / 3 min", values: { name: "134 °C / 3 min benchtop", sterilizationTempC: "134", holdingTimeS: "180", basis: "en-13060" } },
];

const DEFAULTS: Values = {
  name: "",
  sterilizationTempC: "134",
  bandK: "3",
  holdingTimeS: "180",
  maxEquilibrationS: "15",
  maxSpreadK: "2",
  saturationLimitK: "2",
  f0ReferenceC: "121.1",
  f0ZK: "10",
  maxSampleIntervalS: "",
  freeSpaceEarlyK: "5",
  freeSpaceEarlyS: "60",
  freeSpaceK: "2",
  basis: "en-285",
  basisReason: "",
};

export type ProfileFormValues = { id: string; cycleCount: number } & { [K in (typeof KEYS)[number]]: string | number | null };

export function ProfileForm({ profile }: { profile?: ProfileFormValues }) {
  const editing = !!profile;
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(editing ? updateProfileAction : createProfileAction);
  const [values, setValues] = useState<Values>(() => (profile ? (Object.fromEntries(KEYS.map((k) => [k, String(profile[k] ?? "")])) as Values) : DEFAULTS));
  const set = (k: keyof Values) => (v: string) => setValues((old) => ({ ...old, [k]: v }));
  const p = editing ? "edit-profile" : "new-profile";
  const ts = Number(values.sterilizationTempC);
  const band = Number(values.bandK);
  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="space-y-3" noValidate aria-label={editing ? "Edit acceptance profile" : "New acceptance profile"}>
      {editing && <input type="hidden" name="id" value={profile.id} />}
      {!editing && (
        <div>
          <p className="field-label">Start from</p>
          <div className="flex flex-wrap gap-2">
            {PRESETS.map((pr) => (
              <button key={pr.label} type="button" className="btn-secondary px-2 py-1 text-xs" onClick={() => setValues({ ...DEFAULTS, ...pr.values })}>
                {pr.label}
              </button>
            ))}
          </div>
        </div>
      )}
      {editing && profile.cycleCount > 0 && (
        <p className="rounded-md bg-caution-50 px-3 py-2 text-sm text-caution-700" role="note">
          ▲ {profile.cycleCount} cycle{profile.cycleCount === 1 ? " was" : "s were"} analysed against this profile. Saving creates a <strong>new version</strong> with these limits and retires this
          one, so those records keep the limits they were judged by. Sterilizers that use it by default move to the new version.
        </p>
      )}
      <TextInput id={`${p}-name`} name="name" label="Name" error={errors.name} value={values.name} onChange={set("name")} />
      <div className="grid grid-cols-2 gap-3">
        <TextInput
          id={`${p}-ts`}
          name="sterilizationTempC"
          label="Sterilization temperature"
          suffix="°C"
          inputMode="decimal"
          error={errors.sterilizationTempC}
          value={values.sterilizationTempC}
          onChange={set("sterilizationTempC")}
          hint="100–140 °C"
        />
        <TextInput
          id={`${p}-band`}
          name="bandK"
          label="Band width"
          suffix="K"
          inputMode="decimal"
          error={errors.bandK}
          value={values.bandK}
          onChange={set("bandK")}
          hint={Number.isFinite(ts + band) ? `Band ${ts}–${+(ts + band).toFixed(2)} °C` : undefined}
        />
        <TextInput
          id={`${p}-hold`}
          name="holdingTimeS"
          label="Minimum holding time"
          suffix="s"
          inputMode="decimal"
          error={errors.holdingTimeS}
          value={values.holdingTimeS}
          onChange={set("holdingTimeS")}
          hint={Number(values.holdingTimeS) > 0 ? `${+(Number(values.holdingTimeS) / 60).toFixed(2)} min` : undefined}
        />
        <TextInput
          id={`${p}-eq`}
          name="maxEquilibrationS"
          label="Longest equilibration"
          suffix="s"
          inputMode="decimal"
          error={errors.maxEquilibrationS}
          value={values.maxEquilibrationS}
          onChange={set("maxEquilibrationS")}
          hint={values.basis === "en-285" ? "EN 285: 15 s up to 800 l, 30 s above" : undefined}
        />
        <TextInput
          id={`${p}-spread`}
          name="maxSpreadK"
          label="Largest spread"
          suffix="K"
          inputMode="decimal"
          error={errors.maxSpreadK}
          value={values.maxSpreadK}
          onChange={set("maxSpreadK")}
          hint="Between channels during holding"
        />
        <TextInput
          id={`${p}-sat`}
          name="saturationLimitK"
          label="Saturation limit"
          suffix="K"
          inputMode="decimal"
          error={errors.saturationLimitK}
          value={values.saturationLimitK}
          onChange={set("saturationLimitK")}
          hint="|reference − Tsat(p)|"
        />
        <TextInput
          id={`${p}-f0ref`}
          name="f0ReferenceC"
          label="F0 reference"
          suffix="°C"
          inputMode="decimal"
          error={errors.f0ReferenceC}
          value={values.f0ReferenceC}
          onChange={set("f0ReferenceC")}
          hint="121.1 (US/PDA) or 121 (Ph. Eur.)"
        />
        <TextInput id={`${p}-z`} name="f0ZK" label="z-value" suffix="K" inputMode="decimal" error={errors.f0ZK} value={values.f0ZK} onChange={set("f0ZK")} />
      </div>
      <RecordFields idPrefix={p} values={values} errors={errors} set={set} />
      <BasisFields idPrefix={p} values={values} errors={errors} set={set} />
      {editing && <TextInput id={`${p}-reason`} name="reason" label="Reason for the change" error={errors.reason} hint="Written to the audit ledger with the old and new limits." />}
      <ActionMessage state={state} />
      <button className="btn-primary w-full" disabled={pending}>
        {pending ? "Saving…" : editing ? (profile.cycleCount > 0 ? "Save as a new version" : "Save changes") : "Create profile"}
      </button>
    </form>
  );
}

/** The standard the limits claim, or local practice with its reason; the chosen basis' minimums shown as a hint. */
function BasisFields({ idPrefix: p, values, errors, set }: { idPrefix: string; values: Values; errors: Record<string, string>; set: (k: keyof Values) => (v: string) => void }) {
  const basis = (PROFILE_BASES as readonly string[]).includes(values.basis) ? (values.basis as ProfileBasis) : null;
  const local = basis === "local";
  return (
    <>
      <Field id={`${p}-basis`} label="Basis of these limits" error={errors.basis} hint={basis ? summariseBasisMinimums(basis) : undefined}>
        <select
          id={`${p}-basis`}
          name="basis"
          className="field-input"
          value={values.basis}
          onChange={(e) => set("basis")(e.target.value)}
          aria-invalid={Boolean(errors.basis)}
          aria-describedby={errors.basis ? `${p}-basis-error` : `${p}-basis-hint`}
        >
          {PROFILE_BASES.map((b) => (
            <option key={b} value={b}>
              {PROFILE_BASIS_LABELS[b]} — {PROFILE_BASIS_SCOPES[b]}
            </option>
          ))}
        </select>
      </Field>
      <TextInput
        id={`${p}-basis-reason`}
        name="basisReason"
        label={local ? "Why local practice" : "Note on the basis (optional)"}
        error={errors.basisReason}
        value={values.basisReason}
        onChange={set("basisReason")}
        hint={local ? "Required: the protocol or validation these limits come from. Printed with the basis on every record." : "e.g. the clause or the site protocol; printed with the basis."}
      />
    </>
  );
}

/** How complete the record must be, and the free-space sensor's allowances (small-load test, DOMAIN.md §2.3 e, from memory). */
function RecordFields({ idPrefix: p, values, errors, set }: { idPrefix: string; values: Values; errors: Record<string, string>; set: (k: keyof Values) => (v: string) => void }) {
  return (
    <div className="grid grid-cols-2 gap-3">
      <TextInput
        id={`${p}-interval`}
        name="maxSampleIntervalS"
        label="Longest sampling interval (optional)"
        suffix="s"
        inputMode="decimal"
        error={errors.maxSampleIntervalS}
        value={values.maxSampleIntervalS}
        onChange={set("maxSampleIntervalS")}
        hint="Inside the plateau. Empty: 3× the record's usual interval"
      />
      <TextInput
        id={`${p}-fs-early`}
        name="freeSpaceEarlyK"
        label="Free space, at the plateau start"
        suffix="K"
        inputMode="decimal"
        error={errors.freeSpaceEarlyK}
        value={values.freeSpaceEarlyK}
        onChange={set("freeSpaceEarlyK")}
        hint="Largest excess over the reference"
      />
      <TextInput
        id={`${p}-fs-early-s`}
        name="freeSpaceEarlyS"
        label="Free space, start allowance lasts"
        suffix="s"
        inputMode="decimal"
        error={errors.freeSpaceEarlyS}
        value={values.freeSpaceEarlyS}
        onChange={set("freeSpaceEarlyS")}
        hint="From the plateau start"
      />
      <TextInput
        id={`${p}-fs`}
        name="freeSpaceK"
        label="Free space, after that"
        suffix="K"
        inputMode="decimal"
        error={errors.freeSpaceK}
        value={values.freeSpaceK}
        onChange={set("freeSpaceK")}
        hint="Largest excess over the reference"
      />
    </div>
  );
}

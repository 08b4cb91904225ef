"use client";

import { useState } from "react";
import { createProfileAction, updateProfileAction } from "@/app/(portal)/profiles/actions";
import { Field, TextInput, useFormAction } from "./form-bits";
import { ActionMessage } from "@/components/ui/action-message";
import {
  AIR_LEAKAGE_TEST,
  LEAK_LIMIT_PRESETS,
  PROFILE_BASES,
  PROFILE_BASIS_LABELS,
  PROFILE_BASIS_SCOPES,
  PROFILE_FIELDS,
  summariseBasisMinimums,
  type ProfileBasis,
  type ProfileField,
} from "@/lib/domain";

type Values = Record<ProfileField, string>;

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
  leakRateLimitKpaPerMin: String(AIR_LEAKAGE_TEST.maxLeakRateKpaPerMin),
  leakVacuumSetPointKpaAbs: String(AIR_LEAKAGE_TEST.vacuumSetPointKpaAbs),
  basis: "en-285",
  basisReason: "",
};

export type ProfileFormValues = { id: string; cycleCount: number } & { [K in ProfileField]: string | number | null };

export function ProfileForm({ profile }: { profile?: ProfileFormValues }) {
  const editing = !!profile;
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(editing ? updateProfileAction : createProfileAction);
  const [values, setValues] = useState<Values>(() => (profile ? (Object.fromEntries(PROFILE_FIELDS.map((k) => [k, String(profile[k] ?? "")])) as Values) : DEFAULTS));
  const set = (k: keyof Values) => (v: string) => setValues((old) => ({ ...old, [k]: v }));
  const p = editing ? "edit-profile" : "new-profile";
  const ts = Number(values.sterilizationTempC);
  const band = Number(values.bandK);
  const limit = (field: ProfileField, label: string, suffix: string, hint?: string) => (
    <TextInput id={`${p}-${field}`} name={field} label={label} suffix={suffix} inputMode="decimal" error={errors[field]} value={values[field]} onChange={set(field)} hint={hint} />
  );
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
        {limit("sterilizationTempC", "Sterilization temperature", "°C", "100–140 °C")}
        {limit("bandK", "Band width", "K", Number.isFinite(ts + band) ? `Band ${ts}–${+(ts + band).toFixed(2)} °C` : undefined)}
        {limit("holdingTimeS", "Minimum holding time", "s", Number(values.holdingTimeS) > 0 ? `${+(Number(values.holdingTimeS) / 60).toFixed(2)} min` : undefined)}
        {limit("maxEquilibrationS", "Longest equilibration", "s", values.basis === "en-285" ? "EN 285: 15 s up to 800 l, 30 s above" : undefined)}
        {limit("maxSpreadK", "Largest spread", "K", "Between channels during holding")}
        {limit("saturationLimitK", "Saturation limit", "K", "|reference − Tsat(p)|")}
        {limit("f0ReferenceC", "F0 reference", "°C", "121.1 (US/PDA) or 121 (Ph. Eur.)")}
        {limit("f0ZK", "z-value", "K")}
      </div>
      {/* How complete the record must be, and the free-space sensor's allowances (small-load test, DOMAIN.md §2.3 e, from memory). */}
      <div className="grid grid-cols-2 gap-3">
        {limit("maxSampleIntervalS", "Longest sampling interval (optional)", "s", "Inside the plateau. Empty: 3× the record's usual interval")}
        {limit("freeSpaceEarlyK", "Free space, at the plateau start", "K", "Largest excess over the reference")}
        {limit("freeSpaceEarlyS", "Free space, start allowance lasts", "s", "From the plateau start")}
        {limit("freeSpaceK", "Free space, after that", "K", "Largest excess over the reference")}
      </div>
      {/* The logged air leakage test (DOMAIN.md §2.5): the leak-rate limit and the vacuum the test starts from. */}
      <div className="grid grid-cols-2 gap-3">
        {limit("leakRateLimitKpaPerMin", "Air leakage: highest leak rate", "kPa/min", "(p3 − p2) / 10 min")}
        {limit("leakVacuumSetPointKpaAbs", "Air leakage: vacuum set point", "kPa abs", "The evacuation must reach it")}
      </div>
      <div className="flex flex-wrap gap-2" aria-label="Air leakage limit presets">
        {LEAK_LIMIT_PRESETS.map((pr) => (
          <button key={pr.label} type="button" className="btn-secondary px-2 py-1 text-xs" onClick={() => set("leakRateLimitKpaPerMin")(String(pr.kpaPerMin))}>
            {pr.label}
          </button>
        ))}
      </div>
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

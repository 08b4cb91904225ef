"use client";

import { useActionState, useState } from "react";
import { updateSiteAction } from "@/app/(portal)/admin/site/actions";
import { ActionMessage } from "@/components/ui/action-message";
import { IDLE_FORM_STATE } from "@/lib/form-state";

export type SiteFormValues = { name: string; timeZone: string; atmosphereKpa: number | null; altitudeM: number | null; address: string | null };

const asText = (v: number | string | null) => (v === null ? "" : String(v));

export function SiteSettingsForm({ site, timeZones }: { site: SiteFormValues; timeZones: string[] }) {
  const [state, action, pending] = useActionState(updateSiteAction, IDLE_FORM_STATE);
  // Controlled fields: React resets an uncontrolled form after each action, which would drop what was typed when the server refuses it.
  const [values, setValues] = useState({
    name: site.name,
    timeZone: site.timeZone,
    atmosphereKpa: asText(site.atmosphereKpa),
    altitudeM: asText(site.altitudeM),
    address: site.address ?? "",
    reason: "",
  });
  const [seen, setSeen] = useState(state);
  if (state !== seen) {
    setSeen(state);
    if (state.status === "ok") setValues((v) => ({ ...v, reason: "" }));
  }
  const err = state.fieldErrors ?? {};
  const bind = (key: keyof typeof values) => ({
    id: `site-${key}`,
    name: key,
    value: values[key],
    onChange: (e: { target: { value: string } }) => setValues((v) => ({ ...v, [key]: e.target.value })),
    "aria-invalid": !!err[key],
    "aria-describedby": err[key] ? `site-${key}-error` : undefined,
  });
  const fieldError = (key: string) =>
    err[key] && (
      <p id={`site-${key}-error`} className="field-error">
        {err[key]}
      </p>
    );

  return (
    <form action={action} className="space-y-4" noValidate data-testid="site-settings-form">
      <div>
        <label className="field-label" htmlFor="site-name">
          Site name (printed on reports)
        </label>
        <input {...bind("name")} className="field-input" />
        {fieldError("name")}
      </div>
      <div>
        <label className="field-label" htmlFor="site-timeZone">
          Time zone (IANA name)
        </label>
        <input {...bind("timeZone")} list="site-time-zones" autoComplete="off" spellCheck={false} className="field-input mono" placeholder="Europe/London" />
        <datalist id="site-time-zones">
          {timeZones.map((z) => (
            <option key={z} value={z} />
          ))}
        </datalist>
        {fieldError("timeZone")}
      </div>
      <div className="grid gap-4 sm:grid-cols-2">
        <div>
          <label className="field-label" htmlFor="site-atmosphereKpa">
            Measured atmospheric pressure (kPa)
          </label>
          <input {...bind("atmosphereKpa")} inputMode="decimal" className="field-input" placeholder="e.g. 100.8" />
          <p className="mt-1 text-xs text-ink-muted">Optional, 50–110 kPa. Used first when given.</p>
          {fieldError("atmosphereKpa")}
        </div>
        <div>
          <label className="field-label" htmlFor="site-altitudeM">
            Altitude above sea level (m)
          </label>
          <input {...bind("altitudeM")} inputMode="decimal" className="field-input" placeholder="e.g. 45" />
          <p className="mt-1 text-xs text-ink-muted">Optional, −400 to 5000 m. Used when no pressure is given.</p>
          {fieldError("altitudeM")}
        </div>
      </div>
      <div>
        <label className="field-label" htmlFor="site-address">
          Address
        </label>
        <textarea {...bind("address")} rows={3} className="field-input" />
        {fieldError("address")}
      </div>
      <div>
        <label className="field-label" htmlFor="site-reason">
          Reason for the change (goes into the audit ledger)
        </label>
        <input {...bind("reason")} className="field-input" placeholder="e.g. barometer reading from the plant room, 3 March" />
        {fieldError("reason")}
      </div>
      <ActionMessage state={state} />
      <button className="btn-primary" disabled={pending}>
        {pending ? "Saving…" : "Save site settings"}
      </button>
    </form>
  );
}

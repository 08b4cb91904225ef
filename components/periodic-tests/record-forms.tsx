"use client";

import { useEffect, useState, type ReactNode } from "react";
import { recordAirLeakageAction, recordBowieDickAction, recordDrynessAction, recordNonCondensableGasAction, recordSuperheatAction } from "@/app/(portal)/periodic-tests/actions";
import { Field, TextInput, useFormAction } from "@/components/equipment/form-bits";
import { ActionMessage } from "@/components/ui/action-message";
import type { FormState } from "@/lib/form-state";
import { PRESSURE_UNITS, type PressureUnit } from "@/lib/steam/units";
import { evaluateAirLeakage } from "@/lib/periodic-tests/air-leakage";
import { evaluateBowieDick } from "@/lib/periodic-tests/bowie-dick";
import { evaluateDryness, evaluateNonCondensableGas, evaluateSuperheat } from "@/lib/periodic-tests/steam-quality";
import { AIR_LEAKAGE, DRYNESS, NON_CONDENSABLE_GAS, SUPERHEAT } from "@/lib/periodic-tests/limits";
import type { IndicatorSheetResult } from "@/lib/domain";
import { IndicatorPhotoField } from "@/components/bowie-dick/photo-field";
import { IndicatorSheetFields } from "@/components/bowie-dick/sheet-fields";

export type SterilizerChoice = { id: string; name: string; serialNumber: string; active: boolean };
export type SiteAtmosphere = { atmosphereKpa: number | null; altitudeM: number | null };

/** A number as typed (decimal comma accepted); null while empty or not a number. */
function parse(s: string): number | null {
  const t = s.trim().replace(/\s/g, "").replace(",", ".");
  if (!t) return null;
  const n = Number(t);
  return Number.isFinite(n) ? n : null;
}

function toLocalInput(d: Date): string {
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}T${pad(d.getHours())}:${pad(d.getMinutes())}`;
}

function CommonFields({ sterilizers, sterilizerId, errors, children }: { sterilizers: SterilizerChoice[]; sterilizerId?: string; errors: Record<string, string>; children?: ReactNode }) {
  const [local, setLocal] = useState("");
  // The clock of the user's browser, not the server's: set after hydration.
  // eslint-disable-next-line react-hooks/set-state-in-effect -- one update after mount, to avoid a hydration mismatch
  useEffect(() => setLocal(toLocalInput(new Date())), []);
  const iso = local && !Number.isNaN(new Date(local).getTime()) ? new Date(local).toISOString() : "";
  const active = sterilizers.filter((s) => s.active);
  return (
    <div className="grid gap-3 sm:grid-cols-2">
      <Field id="pt-sterilizer" label="Sterilizer" error={errors.sterilizerId}>
        <select id="pt-sterilizer" name="sterilizerId" className="field-input" defaultValue={sterilizerId ?? ""} aria-invalid={!!errors.sterilizerId}>
          <option value="" disabled>
            Choose…
          </option>
          {active.map((s) => (
            <option key={s.id} value={s.id}>
              {s.name} ({s.serialNumber})
            </option>
          ))}
        </select>
      </Field>
      <Field id="pt-when" label="Done at (your local time)" error={errors.performedAt}>
        <input id="pt-when" type="datetime-local" className="field-input" value={local} onChange={(e) => setLocal(e.target.value)} aria-invalid={!!errors.performedAt} />
        <input type="hidden" name="performedAt" value={iso} />
      </Field>
      {children}
    </div>
  );
}

function Notes({ error }: { error?: string }) {
  return (
    <Field id="pt-notes" label="Notes (optional)" error={error}>
      <textarea id="pt-notes" name="notes" rows={2} className="field-input" />
    </Field>
  );
}

type Preview = { passed: boolean; headline: ReactNode; limit: ReactNode; basis: string; warnings?: string[] } | { error: string } | null;

function ResultPreview({ preview, waiting }: { preview: Preview; waiting: string }) {
  if (!preview)
    return (
      <p className="rounded-md border border-dashed border-ink-line px-3 py-3 text-sm text-ink-muted" aria-live="polite">
        {waiting}
      </p>
    );
  if ("error" in preview)
    return (
      <p className="rounded-md bg-fail-50 px-3 py-2 text-sm text-fail-700" role="alert">
        ✕ {preview.error}
      </p>
    );
  return (
    <div className={`rounded-md border px-3 py-3 text-sm ${preview.passed ? "border-pass-500/40 bg-pass-50" : "border-fail-500/40 bg-fail-50"}`} aria-live="polite" data-testid="result-preview">
      <p className={`text-base font-semibold ${preview.passed ? "text-pass-700" : "text-fail-700"}`}>
        {preview.passed ? "✓ PASS" : "✕ FAIL"} — {preview.headline}
      </p>
      <p className="mt-1">Limit: {preview.limit}</p>
      <p className="mt-1 text-xs text-ink-muted">Basis: {preview.basis}</p>
      {preview.warnings?.map((w) => (
        <p key={w} className="mt-2 rounded bg-caution-50 px-2 py-1 text-caution-700">
          ▲ {w}
        </p>
      ))}
      <p className="mt-2 text-xs text-ink-muted">Preview: the server recomputes the result from your readings when you save.</p>
    </div>
  );
}

function SaveBar({ state, pending, label = "Save test record" }: { state: FormState; pending: boolean; label?: string }) {
  // Saved, but the test itself failed: say both, without the reassuring green.
  const savedFail = state.status === "ok" && /recorded: FAIL/.test(state.message ?? "");
  return (
    <div className="space-y-2">
      {savedFail ? (
        <p role="status" className="rounded-md border border-fail-500/40 bg-fail-50 px-3 py-2 text-sm text-fail-700">
          Saved. ✕ {state.message}
        </p>
      ) : (
        <ActionMessage state={state} />
      )}
      <button className="btn-primary" disabled={pending}>
        {pending ? "Saving…" : label}
      </button>
    </div>
  );
}

function useClearOnSuccess(state: FormState, clear: () => void) {
  useEffect(() => {
    if (state.status === "ok") clear();
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [state]);
}

function safely(fn: () => Preview): Preview {
  try {
    return fn();
  } catch (error) {
    return { error: error instanceof Error ? error.message : "These readings cannot be evaluated." };
  }
}

const f3 = (n: number) => n.toFixed(3);

export function AirLeakageForm({ sterilizers, sterilizerId }: { sterilizers: SterilizerChoice[]; sterilizerId?: string }) {
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(recordAirLeakageAction);
  const [unit, setUnit] = useState<PressureUnit>("kPa");
  const [p, setP] = useState({ p1: "", p2: "", p3: "" });
  useClearOnSuccess(state, () => setP({ p1: "", p2: "", p3: "" }));
  const [p1, p2, p3] = [parse(p.p1), parse(p.p2), parse(p.p3)];
  const preview =
    p1 === null || p2 === null || p3 === null
      ? null
      : safely(() => {
          const r = evaluateAirLeakage({ p1, p2, p3, unit });
          return {
            passed: r.passed,
            headline: (
              <>
                leak rate {f3(r.leakRateKpaPerMin)} kPa/min
                {unit !== "kPa" && (
                  <>
                    {" "}
                    ({+r.leakRatePerMinInUnit.toPrecision(3)} {unit}/min)
                  </>
                )}
              </>
            ),
            limit: (
              <>
                ≤ {r.limitKpaPerMin} kPa/min
                {unit !== "kPa" && (
                  <>
                    {" "}
                    = {+r.limitPerMinInUnit.toPrecision(3)} {unit}/min
                  </>
                )}{" "}
                · rise over the 10 min: {(r.p3Kpa - r.p2Kpa).toFixed(2)} kPa (≤ 1.3 kPa)
              </>
            ),
            basis: r.basis,
            warnings: r.warnings,
          };
        });
  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="space-y-4" noValidate aria-label="Record an air leakage test">
      <CommonFields sterilizers={sterilizers} sterilizerId={sterilizerId} errors={errors}>
        <Field id="al-unit" label="Pressure unit (absolute)" error={errors.unit}>
          <select id="al-unit" name="unit" className="field-input" value={unit} onChange={(e) => setUnit(e.target.value as PressureUnit)}>
            {PRESSURE_UNITS.map((u) => (
              <option key={u} value={u}>
                {u}
              </option>
            ))}
          </select>
        </Field>
      </CommonFields>
      <p className="text-sm text-ink-muted">
        Run the leak test cycle to its deep vacuum (normally below {AIR_LEAKAGE.startBelowKpaAbs} kPa abs), close the chamber valves and stop the pump. Read the absolute chamber pressure then (p1),
        after {AIR_LEAKAGE.stabilisationMin} min (p2) and after a further {AIR_LEAKAGE.testPeriodMin} min (p3). Keep the chamber temperature steady during the test.
      </p>
      <div className="grid gap-3 sm:grid-cols-3">
        <TextInput id="al-p1" name="p1" label="p1 at start" suffix={unit} inputMode="decimal" value={p.p1} onChange={(v) => setP((o) => ({ ...o, p1: v }))} error={errors.p1} />
        <TextInput id="al-p2" name="p2" label="p2 after 5 min" suffix={unit} inputMode="decimal" value={p.p2} onChange={(v) => setP((o) => ({ ...o, p2: v }))} error={errors.p2} />
        <TextInput id="al-p3" name="p3" label="p3 after a further 10 min" suffix={unit} inputMode="decimal" value={p.p3} onChange={(v) => setP((o) => ({ ...o, p3: v }))} error={errors.p3} />
      </div>
      <ResultPreview preview={preview} waiting="Enter p1, p2 and p3 to see the leak rate = (p3 − p2) / 10 min against the limit." />
      <Notes error={errors.notes} />
      <SaveBar state={state} pending={pending} />
    </form>
  );
}

export function BowieDickForm({ sterilizers, sterilizerId, kind = "bowie-dick" }: { sterilizers: SterilizerChoice[]; sterilizerId?: string; kind?: "bowie-dick" | "hollow-load" }) {
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(recordBowieDickAction);
  const [outcome, setOutcome] = useState<"" | IndicatorSheetResult>("");
  const [savedCount, setSavedCount] = useState(0);
  useClearOnSuccess(state, () => {
    setOutcome("");
    setSavedCount((n) => n + 1);
  });
  const r = outcome ? evaluateBowieDick(outcome, kind) : null;
  return (
    <form
      ref={formRef}
      onSubmit={onSubmit}
      onChange={onChange}
      className="space-y-4"
      noValidate
      aria-label={kind === "hollow-load" ? "Record a hollow load test" : "Record a Bowie-Dick test"}
      encType="multipart/form-data"
    >
      <input type="hidden" name="kind" value={kind} />
      <CommonFields sterilizers={sterilizers} sterilizerId={sterilizerId} errors={errors} />
      <IndicatorSheetFields key={savedCount} idPrefix="bd" errors={errors} onChange={(v) => setOutcome(v.outcome)} />
      <IndicatorPhotoField id="bd-photo" error={errors.photo} resetKey={savedCount} />
      <ResultPreview
        preview={
          r
            ? {
                passed: r.passed,
                headline: r.meaning,
                limit: kind === "hollow-load" ? "a uniform colour change of the whole indicator strip" : "a uniform colour change over the whole sheet",
                basis: r.basis,
              }
            : null
        }
        waiting="Choose how the indicator changed."
      />
      <p className="text-xs text-ink-muted">The record waits for an engineer&apos;s signature; it counts for the schedule once approved (pass) or confirmed as a failure (fail).</p>
      <Notes error={errors.notes} />
      <SaveBar state={state} pending={pending} />
    </form>
  );
}

export function NonCondensableGasForm({ sterilizers, sterilizerId }: { sterilizers: SterilizerChoice[]; sterilizerId?: string }) {
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(recordNonCondensableGasAction);
  const [v, setV] = useState({ vg: "", vc: "" });
  useClearOnSuccess(state, () => setV({ vg: "", vc: "" }));
  const vg = parse(v.vg);
  const vc = parse(v.vc);
  const preview =
    vg === null || vc === null
      ? null
      : safely(() => {
          const r = evaluateNonCondensableGas({ gasVolumeMl: vg, condensateVolumeMl: vc });
          return {
            passed: r.passed,
            headline: <>{r.percent.toFixed(2)} % non-condensable gases (100 · V_g / V_c)</>,
            limit: <>≤ {NON_CONDENSABLE_GAS.maxPercent} % (3.5 ml of gas per 100 ml of condensate)</>,
            basis: r.basis,
          };
        });
  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="space-y-4" noValidate aria-label="Record a non-condensable gas test">
      <CommonFields sterilizers={sterilizers} sterilizerId={sterilizerId} errors={errors} />
      <p className="text-sm text-ink-muted">
        Sample from the steam service pipe through the Pitot tube while demand is highest (as steam is first admitted to the chamber). Read the gas collected in the burette and the condensate
        collected from the same sample.
      </p>
      <div className="grid gap-3 sm:grid-cols-2">
        <TextInput id="ncg-vg" name="gasVolumeMl" label="Gas volume V_g" suffix="ml" inputMode="decimal" value={v.vg} onChange={(x) => setV((o) => ({ ...o, vg: x }))} error={errors.gasVolumeMl} />
        <TextInput
          id="ncg-vc"
          name="condensateVolumeMl"
          label="Condensate volume V_c"
          suffix="ml"
          inputMode="decimal"
          value={v.vc}
          onChange={(x) => setV((o) => ({ ...o, vc: x }))}
          error={errors.condensateVolumeMl}
        />
      </div>
      <ResultPreview preview={preview} waiting="Enter V_g and V_c to see the percentage against the limit." />
      <Notes error={errors.notes} />
      <SaveBar state={state} pending={pending} />
    </form>
  );
}

export function SuperheatForm({ sterilizers, sterilizerId, site }: { sterilizers: SterilizerChoice[]; sterilizerId?: string; site: SiteAtmosphere }) {
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(recordSuperheatAction);
  const [source, setSource] = useState<"pressure" | "altitude">(site.atmosphereKpa !== null || site.altitudeM === null ? "pressure" : "altitude");
  const [t, setT] = useState("");
  const [atm, setAtm] = useState(site.atmosphereKpa !== null ? String(site.atmosphereKpa) : "");
  const [alt, setAlt] = useState(site.altitudeM !== null ? String(site.altitudeM) : "");
  useClearOnSuccess(state, () => setT(""));
  const temp = parse(t);
  const atmosphere =
    source === "pressure"
      ? parse(atm) === null
        ? null
        : { kind: "pressure" as const, atmosphereKpa: parse(atm)! }
      : parse(alt) === null
        ? null
        : { kind: "altitude" as const, altitudeM: parse(alt)! };
  const preview =
    temp === null || atmosphere === null
      ? null
      : safely(() => {
          const r = evaluateSuperheat({ expansionTempC: temp, atmosphere });
          return {
            passed: r.passed,
            headline: (
              <>
                superheat {r.superheatK.toFixed(1)} K ({temp} °C − boiling point {r.boilingPointC.toFixed(2)} °C at {r.atmosphereKpa.toFixed(2)} kPa)
              </>
            ),
            limit: (
              <>
                ≤ {SUPERHEAT.maxK} K, i.e. an expansion temperature up to {r.limitTemperatureC.toFixed(2)} °C here
              </>
            ),
            basis: r.basis,
            warnings: r.warnings,
          };
        });
  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="space-y-4" noValidate aria-label="Record a superheat test">
      <CommonFields sterilizers={sterilizers} sterilizerId={sterilizerId} errors={errors} />
      <p className="text-sm text-ink-muted">
        Expand the sampled steam through the Pitot tube to atmospheric pressure in the expansion tube and read its temperature. The boiling point at the local atmospheric pressure comes from the IF97
        saturation line.
      </p>
      <div className="grid gap-3 sm:grid-cols-2">
        <TextInput id="sh-t" name="expansionTempC" label="Expansion temperature" suffix="°C" inputMode="decimal" value={t} onChange={setT} error={errors.expansionTempC} />
        <Field id="sh-source" label="Local atmospheric pressure from" error={errors.atmosphereSource}>
          <select id="sh-source" name="atmosphereSource" className="field-input" value={source} onChange={(e) => setSource(e.target.value as "pressure" | "altitude")}>
            <option value="pressure">A barometer reading</option>
            <option value="altitude">The site&apos;s altitude (standard atmosphere)</option>
          </select>
        </Field>
        {source === "pressure" ? (
          <TextInput
            id="sh-atm"
            name="atmosphereKpa"
            label="Barometric pressure"
            suffix="kPa"
            inputMode="decimal"
            value={atm}
            onChange={setAtm}
            error={errors.atmosphereKpa}
            hint="A measured value is better than the altitude estimate: weather moves it by a few kPa."
          />
        ) : (
          <TextInput
            id="sh-alt"
            name="altitudeM"
            label="Altitude"
            suffix="m"
            inputMode="decimal"
            value={alt}
            onChange={setAlt}
            error={errors.altitudeM}
            hint="ASHRAE standard atmosphere; weather moves real pressure by a few kPa."
          />
        )}
      </div>
      <ResultPreview preview={preview} waiting="Enter the expansion temperature and the local atmospheric pressure or altitude." />
      <Notes error={errors.notes} />
      <SaveBar state={state} pending={pending} />
    </form>
  );
}

export function DrynessForm({ sterilizers, sterilizerId }: { sterilizers: SterilizerChoice[]; sterilizerId?: string }) {
  const { state, pending, formRef, onSubmit, onChange, errors } = useFormAction(recordDrynessAction);
  const empty = { t0: "", t1: "", mw: "", mc: "", ts: "" };
  const [v, setV] = useState(empty);
  const [load, setLoad] = useState<"metal" | "other">("metal");
  useClearOnSuccess(state, () => setV(empty));
  const set = (k: keyof typeof empty) => (x: string) => setV((o) => ({ ...o, [k]: x }));
  const n = { t0: parse(v.t0), t1: parse(v.t1), mw: parse(v.mw), mc: parse(v.mc), ts: parse(v.ts) };
  const preview = Object.values(n).some((x) => x === null)
    ? null
    : safely(() => {
        const r = evaluateDryness({ initialWaterTempC: n.t0!, finalWaterTempC: n.t1!, waterMassKg: n.mw!, condensateMassKg: n.mc!, steamTempC: n.ts!, load });
        return {
          passed: r.passed,
          headline: (
            <>
              dryness value D = {r.dryness.toFixed(3)} (h_s = {r.liquidEnthalpyKjPerKg.toFixed(2)} kJ/kg, L = {r.latentHeatKjPerKg.toFixed(2)} kJ/kg at {n.ts} °C, IF97)
            </>
          ),
          limit: (
            <>
              ≥ {r.limit.toFixed(2)} for {load === "metal" ? "metal loads" : "other loads (textiles, porous)"}; a value above 1 is not accepted
            </>
          ),
          basis: r.basis,
          warnings: r.warnings,
        };
      });
  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="space-y-4" noValidate aria-label="Record a dryness test">
      <CommonFields sterilizers={sterilizers} sterilizerId={sterilizerId} errors={errors}>
        <Field id="dr-load" label="Load the sterilizer processes" error={errors.load}>
          <select id="dr-load" name="load" className="field-input" value={load} onChange={(e) => setLoad(e.target.value as "metal" | "other")}>
            <option value="metal">Metal loads (limit {DRYNESS.minMetal})</option>
            <option value="other">Other loads, e.g. textiles (limit {DRYNESS.minOther.toFixed(2)})</option>
          </select>
        </Field>
      </CommonFields>
      <p className="text-sm text-ink-muted">
        Calorimetric method: weigh the Dewar flask empty and with its cold water (m_w), note T0, collect steam from the Pitot tube until about 80 °C, note T1, and weigh again for the condensate (m_c).
        T_s is the average steam temperature in the supply pipe during sampling.
      </p>
      <div className="grid gap-3 sm:grid-cols-3">
        <TextInput id="dr-t0" name="initialWaterTempC" label="T0, water at start" suffix="°C" inputMode="decimal" value={v.t0} onChange={set("t0")} error={errors.initialWaterTempC} />
        <TextInput id="dr-t1" name="finalWaterTempC" label="T1, water + condensate" suffix="°C" inputMode="decimal" value={v.t1} onChange={set("t1")} error={errors.finalWaterTempC} />
        <TextInput id="dr-ts" name="steamTempC" label="T_s, steam in the pipe" suffix="°C" inputMode="decimal" value={v.ts} onChange={set("ts")} error={errors.steamTempC} />
        <TextInput id="dr-mw" name="waterMassKg" label="m_w, water mass" suffix="kg" inputMode="decimal" value={v.mw} onChange={set("mw")} error={errors.waterMassKg} />
        <TextInput id="dr-mc" name="condensateMassKg" label="m_c, condensate mass" suffix="kg" inputMode="decimal" value={v.mc} onChange={set("mc")} error={errors.condensateMassKg} />
      </div>
      <p className="mono text-ink-muted">D = [ (T1 − T0)·(4.18·m_w + 0.24) / m_c + 4.18·T1 − h_s ] / L</p>
      <ResultPreview preview={preview} waiting="Enter T0, T1, T_s, m_w and m_c to see the dryness value against the limit." />
      <Notes error={errors.notes} />
      <SaveBar state={state} pending={pending} />
    </form>
  );
}

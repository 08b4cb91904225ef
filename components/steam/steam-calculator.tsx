"use client";

import { useId, useMemo, useState, type FormEvent } from "react";
import useSWR from "swr";
import { atmosphereAtAltitudeKpa } from "@/lib/steam";
import { formatPressure, formatTemperature, PRESSURE_UNITS, TEMPERATURE_UNIT_SYMBOL, TEMPERATURE_UNITS, type PressureUnit, type TemperatureUnit } from "@/lib/domain";
import { fetchJson, type RequestError } from "@/lib/client/fetch-json";
import { calculatorNumber } from "./calculator-input";
import { Panel } from "@/components/ui/panel";
import { bandEdgePressures } from "./band-edges";
import { TableFrame } from "@/components/ui/table-frame";

export type SiteAtmosphere = {
  siteName: string | null;
  atmosphereKpa: number;
  /** where the site's figure comes from */
  source: "site" | "site-altitude" | "standard";
  altitudeM: number | null;
};

type SaturationAnswer = {
  input: { quantity: "temperature" | "pressure"; value: number; unit: string; gauge?: boolean };
  temperatureC: number;
  temperatureF: number;
  temperatureK: number;
  pressureKpaAbs: number;
  pressureKpaGauge: number;
  pressures: Record<PressureUnit, { absolute: number; gauge: number }>;
  atmosphereKpa: number;
  atmosphereSource: string;
};

const fetchSaturation = (url: string) => fetchJson<SaturationAnswer>(url, { what: "the steam table" });

const PRESSURE_DECIMALS: Record<PressureUnit, number> = { Pa: 0, kPa: 2, MPa: 5, bar: 4, mbar: 1, psi: 2, mmHg: 1, inHg: 2 };

type AtmosphereChoice = "site" | "altitude" | "measured";

function fixed(value: number, digits: number) {
  return Number.isFinite(value) ? value.toFixed(digits) : "—";
}

export function SteamCalculator({ site }: { site: SiteAtmosphere }) {
  const ids = useId();
  const [choice, setChoice] = useState<AtmosphereChoice>("site");
  const [altitudeText, setAltitudeText] = useState(site.altitudeM != null ? String(site.altitudeM) : "0");
  const [measuredText, setMeasuredText] = useState(site.atmosphereKpa.toFixed(3));

  const [temperatureText, setTemperatureText] = useState("134");
  const [temperatureUnit, setTemperatureUnit] = useState<TemperatureUnit>("C");
  const [pressureText, setPressureText] = useState("2.03");
  const [pressureUnit, setPressureUnit] = useState<PressureUnit>("bar");
  const [pressureGauge, setPressureGauge] = useState(true);

  const atmosphere = useMemo((): { kpa: number | null; query: string; problem?: string } => {
    if (choice === "site") return { kpa: site.atmosphereKpa, query: "" };
    if (choice === "altitude") {
      const altitude = Number(altitudeText.trim().replace(",", "."));
      if (altitudeText.trim() === "" || !Number.isFinite(altitude)) return { kpa: null, query: "", problem: "Enter the altitude in metres above sea level, e.g. 250." };
      if (altitude < -500 || altitude > 9000) return { kpa: null, query: "", problem: "Enter an altitude between −500 m and 9000 m." };
      return { kpa: atmosphereAtAltitudeKpa(altitude), query: `&altitude=${encodeURIComponent(String(altitude))}` };
    }
    const measured = Number(measuredText.trim().replace(",", "."));
    if (measuredText.trim() === "" || !Number.isFinite(measured)) return { kpa: null, query: "", problem: "Enter the barometric pressure in kPa absolute, e.g. 99.8." };
    if (measured < 20 || measured > 120) return { kpa: null, query: "", problem: "A barometric pressure lies between 20 and 120 kPa absolute." };
    return { kpa: measured, query: `&atmosphere=${encodeURIComponent(String(measured))}` };
  }, [choice, altitudeText, measuredText, site.atmosphereKpa]);

  const temperatureQuery = (text: string, unit: TemperatureUnit) => `/api/steam/saturation?temperature=${encodeURIComponent(text.trim().replace(",", "."))}&unit=${unit}`;
  const pressureQuery = (text: string, unit: PressureUnit, gauge: boolean) => `/api/steam/saturation?pressure=${encodeURIComponent(text.trim().replace(",", "."))}&unit=${unit}&gauge=${gauge}`;

  const [temperatureRequest, setTemperatureRequest] = useState(() => temperatureQuery("134", "C"));
  const [pressureRequest, setPressureRequest] = useState(() => pressureQuery("2.03", "bar", true));

  // The atmosphere is part of each key so that changing it recomputes the gauge figures.
  const temperatureKey = atmosphere.problem ? null : temperatureRequest + atmosphere.query;
  const pressureKey = atmosphere.problem ? null : pressureRequest + atmosphere.query;
  const toPressure = useSWR(temperatureKey, fetchSaturation, { keepPreviousData: true, shouldRetryOnError: false, revalidateOnFocus: false });
  const toTemperature = useSWR(pressureKey, fetchSaturation, { keepPreviousData: true, shouldRetryOnError: false, revalidateOnFocus: false });

  const bandRows = useMemo(() => (atmosphere.kpa === null ? null : bandEdgePressures(atmosphere.kpa)), [atmosphere.kpa]);

  // A problem with what was typed is said here, in the field's own words, and nothing is asked of the server.
  const [temperatureProblem, setTemperatureProblem] = useState<string | null>(null);
  const [pressureProblem, setPressureProblem] = useState<string | null>(null);

  function submitTemperature(event: FormEvent) {
    event.preventDefault();
    const read = calculatorNumber(temperatureText, "temperature", "134");
    setTemperatureProblem(read.ok ? null : read.problem);
    if (read.ok) setTemperatureRequest(temperatureQuery(read.text, temperatureUnit));
  }
  function submitPressure(event: FormEvent) {
    event.preventDefault();
    const read = calculatorNumber(pressureText, "pressure", "2.03");
    setPressureProblem(read.ok ? null : read.problem);
    if (read.ok) setPressureRequest(pressureQuery(read.text, pressureUnit, pressureGauge));
  }

  const siteSourceText =
    site.source === "site"
      ? "the barometric pressure set for the site"
      : site.source === "site-altitude"
        ? `the standard atmosphere at the site's altitude (${site.altitudeM} m)`
        : "the standard atmosphere at sea level (the site has no barometric pressure or altitude set)";

  const temperatureError = temperatureProblem ?? (toPressure.error as RequestError | undefined)?.message ?? null;
  const pressureError = pressureProblem ?? (toTemperature.error as RequestError | undefined)?.message ?? null;

  return (
    <div className="grid gap-gutter xl:grid-cols-2">
      <Panel title="Atmospheric pressure for gauge readings" className="xl:col-span-2">
        <fieldset>
          <legend className="mb-2 text-sm text-ink-muted">Gauge pressure is measured against the air around the sterilizer. Choose the atmosphere to add to gauge readings.</legend>
          <div className="grid gap-3 md:grid-cols-3">
            <label className="flex items-start gap-2 rounded-md border border-ink-line p-3 text-sm has-[:checked]:border-steam-500 has-[:checked]:bg-steam-50">
              <input type="radio" name={`${ids}-atm`} className="mt-1" checked={choice === "site"} onChange={() => setChoice("site")} />
              <span>
                <span className="font-medium">{site.siteName ? `This site (${site.siteName})` : "Standard atmosphere"}</span>
                <span className="block mono mt-0.5" data-testid="site-atmosphere">
                  {formatPressure(site.atmosphereKpa, { digits: 3, reference: "abs" })}
                </span>
                <span className="block text-xs text-ink-muted">From {siteSourceText}.</span>
              </span>
            </label>
            <label className="flex items-start gap-2 rounded-md border border-ink-line p-3 text-sm has-[:checked]:border-steam-500 has-[:checked]:bg-steam-50">
              <input type="radio" name={`${ids}-atm`} className="mt-1" checked={choice === "altitude"} onChange={() => setChoice("altitude")} />
              <span className="flex-1">
                <span className="font-medium">At an altitude</span>
                <span className="mt-1 flex items-center gap-2">
                  <input
                    aria-label="Altitude in metres"
                    className="field-input w-28"
                    inputMode="decimal"
                    value={altitudeText}
                    onFocus={() => setChoice("altitude")}
                    onChange={(e) => setAltitudeText(e.target.value)}
                  />
                  <span className="text-ink-muted">m</span>
                  {choice === "altitude" && atmosphere.kpa !== null && <span className="mono">= {formatPressure(atmosphere.kpa, { digits: 3 })}</span>}
                </span>
                <span className="block text-xs text-ink-muted">Standard atmosphere (ASHRAE); weather moves it by a few kPa.</span>
              </span>
            </label>
            <label className="flex items-start gap-2 rounded-md border border-ink-line p-3 text-sm has-[:checked]:border-steam-500 has-[:checked]:bg-steam-50">
              <input type="radio" name={`${ids}-atm`} className="mt-1" checked={choice === "measured"} onChange={() => setChoice("measured")} />
              <span className="flex-1">
                <span className="font-medium">Measured barometric pressure</span>
                <span className="mt-1 flex items-center gap-2">
                  <input
                    aria-label="Barometric pressure in kPa"
                    className="field-input w-28"
                    inputMode="decimal"
                    value={measuredText}
                    onFocus={() => setChoice("measured")}
                    onChange={(e) => setMeasuredText(e.target.value)}
                  />
                  <span className="text-ink-muted">kPa abs</span>
                </span>
              </span>
            </label>
          </div>
          {atmosphere.problem && (
            <p className="field-error" role="alert">
              {atmosphere.problem}
            </p>
          )}
        </fieldset>
      </Panel>

      <Panel title="Temperature → saturation pressure">
        <form onSubmit={submitTemperature} className="flex flex-wrap items-end gap-3" aria-label="Temperature to pressure">
          <div>
            <label className="field-label" htmlFor={`${ids}-t`}>
              Temperature
            </label>
            <input
              id={`${ids}-t`}
              className="field-input w-36"
              inputMode="decimal"
              value={temperatureText}
              onChange={(e) => setTemperatureText(e.target.value)}
              aria-invalid={Boolean(temperatureError)}
              aria-describedby={temperatureError ? `${ids}-t-error` : undefined}
            />
          </div>
          <div>
            <label className="field-label" htmlFor={`${ids}-tu`}>
              Unit
            </label>
            <select id={`${ids}-tu`} className="field-input w-24" value={temperatureUnit} onChange={(e) => setTemperatureUnit(e.target.value as TemperatureUnit)}>
              {TEMPERATURE_UNITS.map((u) => (
                <option key={u} value={u}>
                  {TEMPERATURE_UNIT_SYMBOL[u]}
                </option>
              ))}
            </select>
          </div>
          <button type="submit" className="btn-primary">
            Find the pressure
          </button>
        </form>
        {temperatureError && (
          <p id={`${ids}-t-error`} className="field-error text-sm" role="alert">
            {temperatureError}
          </p>
        )}
        {toPressure.data && !temperatureError && (
          <div className="mt-4" data-testid="pressure-result" aria-live="polite">
            <p className="text-sm">
              Saturated steam at{" "}
              <strong>
                {fixed(toPressure.data.input.value, 2)} {TEMPERATURE_UNIT_SYMBOL[toPressure.data.input.unit as TemperatureUnit] ?? toPressure.data.input.unit}
              </strong>{" "}
              is at <strong className="mono text-base">{formatPressure(toPressure.data.pressureKpaAbs, { digits: 2, reference: "abs" })}</strong> (
              <span className="mono">{formatPressure(toPressure.data.pressureKpaGauge, { digits: 2, reference: "gauge" })}</span>).
            </p>
            <PressureTable answer={toPressure.data} />
          </div>
        )}
      </Panel>

      <Panel title="Pressure → saturation temperature">
        <form onSubmit={submitPressure} className="flex flex-wrap items-end gap-3" aria-label="Pressure to temperature">
          <div>
            <label className="field-label" htmlFor={`${ids}-p`}>
              Pressure
            </label>
            <input
              id={`${ids}-p`}
              className="field-input w-36"
              inputMode="decimal"
              value={pressureText}
              onChange={(e) => setPressureText(e.target.value)}
              aria-invalid={Boolean(pressureError)}
              aria-describedby={pressureError ? `${ids}-p-error` : undefined}
            />
          </div>
          <div>
            <label className="field-label" htmlFor={`${ids}-pu`}>
              Unit
            </label>
            <select id={`${ids}-pu`} className="field-input w-24" value={pressureUnit} onChange={(e) => setPressureUnit(e.target.value as PressureUnit)}>
              {PRESSURE_UNITS.map((u) => (
                <option key={u} value={u}>
                  {u}
                </option>
              ))}
            </select>
          </div>
          <fieldset className="flex items-center gap-3 pb-2 text-sm">
            <legend className="sr-only">Pressure reference</legend>
            <label className="flex items-center gap-1.5">
              <input type="radio" name={`${ids}-g`} checked={pressureGauge} onChange={() => setPressureGauge(true)} /> gauge
            </label>
            <label className="flex items-center gap-1.5">
              <input type="radio" name={`${ids}-g`} checked={!pressureGauge} onChange={() => setPressureGauge(false)} /> absolute
            </label>
          </fieldset>
          <button type="submit" className="btn-primary">
            Find the temperature
          </button>
        </form>
        {pressureError && (
          <p id={`${ids}-p-error`} className="field-error text-sm" role="alert">
            {pressureError}
          </p>
        )}
        {toTemperature.data && !pressureError && (
          <div className="mt-4" data-testid="temperature-result" aria-live="polite">
            <p className="text-sm">
              At{" "}
              <strong>
                {toTemperature.data.input.value} {toTemperature.data.input.unit} {toTemperature.data.input.gauge ? "gauge" : "abs"}
              </strong>{" "}
              (<span className="mono">{formatPressure(toTemperature.data.pressureKpaAbs, { digits: 2, reference: "abs" })}</span>) water boils at{" "}
              <strong className="mono text-base">{formatTemperature(toTemperature.data.temperatureC)}</strong>.
            </p>
            <table className="data-table mt-3">
              <thead>
                <tr>
                  <th>°C</th>
                  <th>°F</th>
                  <th>K</th>
                </tr>
              </thead>
              <tbody>
                <tr className="mono">
                  <td>{fixed(toTemperature.data.temperatureC, 3)}</td>
                  <td>{fixed(toTemperature.data.temperatureF, 3)}</td>
                  <td>{fixed(toTemperature.data.temperatureK, 3)}</td>
                </tr>
              </tbody>
            </table>
          </div>
        )}
      </Panel>

      <Panel title="Pressures at the edges of the usual sterilization bands" className="xl:col-span-2">
        <p className="mb-3 text-sm text-ink-muted">
          Saturated steam at each band&apos;s lower and upper temperature (sterilization temperature to +3 K). Gauge figures use{" "}
          {atmosphere.kpa !== null ? <span className="mono">{formatPressure(atmosphere.kpa, { digits: 3 })}</span> : "the atmosphere above, once it is valid"}.
        </p>
        <TableFrame label="Band edge pressures">
          <table className="data-table" data-testid="band-table">
            <thead>
              <tr>
                <th>Band</th>
                <th>Edge</th>
                <th className="text-right">°C</th>
                <th className="text-right">kPa abs</th>
                <th className="text-right">bar abs</th>
                <th className="text-right">kPa gauge</th>
                <th className="text-right">psig</th>
              </tr>
            </thead>
            <tbody>
              {(bandRows ?? bandEdgePressures(101.325)).map((row) => (
                <tr key={`${row.band}-${row.edge}`} className={row.edge === "upper" ? "border-b-2 border-ink-line" : ""}>
                  <td>{row.edge === "lower" ? row.band : ""}</td>
                  <td className="text-ink-muted">{row.edge}</td>
                  <td className="mono text-right">{row.temperatureC}</td>
                  <td className="mono text-right">{fixed(row.kpaAbs, 2)}</td>
                  <td className="mono text-right">{fixed(row.barAbs, 4)}</td>
                  <td className="mono text-right">{bandRows ? fixed(row.kpaGauge, 2) : "—"}</td>
                  <td className="mono text-right">{bandRows ? fixed(row.psig, 2) : "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </TableFrame>
      </Panel>
    </div>
  );
}

function PressureTable({ answer }: { answer: SaturationAnswer }) {
  return (
    <TableFrame label="Saturation pressure" className="mt-3">
      <table className="data-table">
        <thead>
          <tr>
            <th>Unit</th>
            <th className="text-right">absolute</th>
            <th className="text-right">gauge</th>
          </tr>
        </thead>
        <tbody>
          {PRESSURE_UNITS.map((unit) => (
            <tr key={unit}>
              <td>{unit}</td>
              <td className="mono text-right">{fixed(answer.pressures[unit].absolute, PRESSURE_DECIMALS[unit])}</td>
              <td className="mono text-right">{fixed(answer.pressures[unit].gauge, PRESSURE_DECIMALS[unit])}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </TableFrame>
  );
}

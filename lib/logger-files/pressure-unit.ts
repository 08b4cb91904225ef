import { PRESSURE_UNITS, kpaPerUnit, parsePressureLabel, saturationTemperatureC, toCelsius, type PressureUnit, type TemperatureUnit } from "../steam";
import { unitFromHeader } from "./header-units";
import { DECIMAL_CODES, parseDecimal } from "./numbers";
import type { ColumnMapping, ColumnOverride, DecimalMark, MappingOverrides, PressureReference, ReadContext } from "./types";

type Reading = { unit: PressureUnit; error: number };

/**
 * Absolute or gauge, from what someone said: the overrides (the command's options or a user's
 * mapping), else the header's marker, else assumed absolute. Never from which reading fits steam
 * best: a superheated cycle would pass as gauge. Assuming absolute fails closed, since gauge
 * readings taken as absolute sit far below saturation and are flagged.
 */
export function decidePressureReference(
  pressure: ColumnMapping,
  overrides: MappingOverrides,
  columnOverride: ColumnOverride | undefined,
  overrideSource: NonNullable<ReadContext["overrideSource"]>,
): PressureReference {
  const kind = (gauge: boolean): PressureReference["kind"] => (gauge ? "gauge" : "absolute");
  let reference: PressureReference;
  const overrideGauge = columnOverride?.role === "pressure" ? (columnOverride.gauge ?? (columnOverride.unit ? parsePressureLabel(columnOverride.unit)?.gauge : null) ?? null) : null;
  const headerGauge = headerMarker(pressure.header);
  if (overrides.pressureGauge !== undefined) reference = { kind: kind(overrides.pressureGauge), source: overrideSource };
  else if (overrideGauge !== null) reference = { kind: kind(overrideGauge), source: overrideSource };
  else if (headerGauge !== null) reference = { kind: kind(headerGauge), source: "header" };
  else reference = { kind: "absolute", source: "assumed" };
  pressure.gauge = reference.kind === "gauge";
  pressure.unsure = pressure.unsure.filter((u) => u !== "gauge-or-absolute");
  if (reference.source === "assumed") pressure.unsure.push("no abs/gauge marker in the header; read as absolute until someone confirms absolute or gauge");
  return reference;
}

/** The header's abs/gauge marker: with its unit ("kPa g", "bar(a)", "psig") or as a word ("gauge", "absolute"); null when it has none. */
function headerMarker(header: string): boolean | null {
  const unit = unitFromHeader(header);
  if (unit?.kind === "pressure" && unit.gauge !== null) return unit.gauge;
  const words = header.toLowerCase();
  if (/\b(gauge|gage|relative)\b/.test(words)) return true;
  if (/\b(abs|absolute)\b/.test(words)) return false;
  return null;
}

/**
 * Settles a pressure column's unit once absolute or gauge is decided. What the header or the
 * overrides say wins; a unit they leave open is the one under which the hot samples sit closest to
 * saturated steam (units differ by factors of 2 or more, so the fit cannot turn a failing cycle
 * into a passing one), and the column says it was unsure.
 */
export function resolvePressureUnit(pressure: ColumnMapping, reference: ColumnMapping | null, sampleRows: string[][], decimal: DecimalMark, overrides: MappingOverrides, atmosphereKpa: number): void {
  if (overrides.pressureUnit) {
    pressure.unit = overrides.pressureUnit;
    pressure.unsure = pressure.unsure.filter((u) => u !== "unit-unknown");
  }
  const unitOpen = pressure.unit === null || pressure.unsure.includes("unit-unknown");
  pressure.unsure = pressure.unsure.filter((u) => u !== "unit-unknown");
  if (!unitOpen) return;

  const code = DECIMAL_CODES[decimal];
  const cellValue = (row: string[], index: number) => parseDecimal(row[index] ?? "", 0, (row[index] ?? "").length, code);
  const pairs = reference ? hotPairs(pressure, reference, sampleRows, cellValue) : [];
  const reading = `${pressure.gauge ? "gauge" : "absolute"}`;
  if (pairs.length === 0) {
    pressure.unit = "kPa";
    pressure.unsure.push("no unit in the header and no hot samples to judge by; read as kPa");
    return;
  }
  const best = bestUnit(pairs, pressure.gauge, atmosphereKpa);
  if (!best) {
    pressure.unit ??= "kPa";
    pressure.unsure.push(`no unit puts these values, read as ${reading}, on the saturated-steam line; check the pressure unit`);
    return;
  }
  pressure.unit = best.unit;
  pressure.unsure.push(`no unit in the header; hot samples sit ${best.error.toFixed(1)} K (median) from saturated steam when read as ${best.unit} ${reading}`);
}

/** Pressure and reference temperature (°C) of the samples where the reference is at 105 °C or more. */
function hotPairs(pressure: ColumnMapping, reference: ColumnMapping, sampleRows: string[][], cellValue: (row: string[], index: number) => number): Array<[number, number]> {
  const pairs: Array<[number, number]> = [];
  for (const row of sampleRows) {
    const p = cellValue(row, pressure.index);
    const t = cellValue(row, reference.index);
    if (!Number.isFinite(p) || !Number.isFinite(t)) continue;
    const tC = toCelsius(t, (reference.unit as TemperatureUnit) ?? "C");
    if (tC >= 105) pairs.push([p, tC]);
  }
  return pairs;
}

/** The unit under which the hot samples sit closest (median) to the saturation line; null if none is physical. */
function bestUnit(pairs: Array<[number, number]>, gauge: boolean, atmosphereKpa: number): Reading | null {
  let best: Reading | null = null;
  for (const unit of PRESSURE_UNITS) {
    const error = medianError(pairs, unit, gauge, atmosphereKpa);
    if (error === Infinity) continue;
    // Ties go to the order of PRESSURE_UNITS (kPa before the rarer units).
    if (!best || error < best.error - 1e-9) best = { unit, error };
  }
  return best;
}

function medianError(pairs: Array<[number, number]>, unit: PressureUnit, gauge: boolean, atmosphereKpa: number): number {
  const scale = kpaPerUnit(unit);
  const errors: number[] = [];
  for (const [p, tC] of pairs) {
    const kpa = p * scale + (gauge ? atmosphereKpa : 0);
    if (!(kpa >= 0.611657 && kpa <= 22064)) return Infinity;
    errors.push(Math.abs(saturationTemperatureC(kpa) - tC));
  }
  errors.sort((a, b) => a - b);
  return errors[Math.floor(errors.length / 2)];
}

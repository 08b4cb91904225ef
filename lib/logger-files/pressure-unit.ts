import { PRESSURE_UNITS, kpaPerUnit, saturationTemperatureC, toCelsius, type PressureUnit, type TemperatureUnit } from "../steam";
import { DECIMAL_CODES, parseDecimal } from "./numbers";
import type { ColumnMapping, DecimalMark, MappingOverrides } from "./types";

type Reading = { unit: PressureUnit; gauge: boolean; error: number };

function describeUnit(unit: PressureUnit, gauge: boolean): string {
  return `${unit} ${gauge ? "gauge" : "absolute"}`;
}

/**
 * Settles a pressure column's unit and gauge/absolute reading. What the header or the overrides
 * say wins; what they leave open is chosen so that hot samples sit closest to saturated steam.
 */
export function resolvePressureUnit(pressure: ColumnMapping, reference: ColumnMapping, sampleRows: string[][], decimal: DecimalMark, overrides: MappingOverrides, atmosphereKpa: number): void {
  if (overrides.pressureUnit) {
    pressure.unit = overrides.pressureUnit;
    pressure.unsure = pressure.unsure.filter((u) => u !== "unit-unknown");
  }
  if (overrides.pressureGauge !== undefined) {
    pressure.gauge = overrides.pressureGauge;
    pressure.unsure = pressure.unsure.filter((u) => u !== "gauge-or-absolute");
  }
  const unitOpen = pressure.unit === null || pressure.unsure.includes("unit-unknown");
  const gaugeOpen = pressure.unsure.includes("gauge-or-absolute");
  pressure.unsure = pressure.unsure.filter((u) => u !== "unit-unknown" && u !== "gauge-or-absolute");
  if (!unitOpen && !gaugeOpen) return;

  const code = DECIMAL_CODES[decimal];
  const cellValue = (row: string[], index: number) => parseDecimal(row[index] ?? "", 0, (row[index] ?? "").length, code);
  const pairs = hotPairs(pressure, reference, sampleRows, cellValue);
  if (pairs.length === 0) {
    const anyNegative = sampleRows.some((row) => cellValue(row, pressure.index) < 0);
    settleWithoutHotSamples(pressure, unitOpen, gaugeOpen, anyNegative);
    return;
  }
  const units: PressureUnit[] = unitOpen ? [...PRESSURE_UNITS] : [pressure.unit as PressureUnit];
  let best = bestReading(pairs, units, gaugeOpen ? [false, true] : [pressure.gauge], atmosphereKpa);
  if (!best) {
    pressure.unit ??= "kPa";
    pressure.unsure.push("no unit or gauge reading puts these values on the saturated-steam line; check the pressure unit");
    return;
  }
  if (gaugeOpen && !unitOpen) {
    // Absolute unless gauge fits clearly better: a marker-less reading is more often absolute.
    const absolute = units.length === 1 ? medianError(pairs, units[0], false, atmosphereKpa) : Infinity;
    if (best.gauge && absolute - best.error < 2) best = { unit: units[0], gauge: false, error: absolute };
  }
  pressure.unit = best.unit;
  pressure.gauge = best.gauge;
  const fit = `hot samples sit ${best.error.toFixed(1)} K (median) from saturated steam when read as ${describeUnit(best.unit, best.gauge)}`;
  if (unitOpen) pressure.unsure.push(`no unit in the header; ${fit}`);
  else pressure.unsure.push(`no abs/gauge marker in the header; ${fit}`);
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

function settleWithoutHotSamples(pressure: ColumnMapping, unitOpen: boolean, gaugeOpen: boolean, anyNegative: boolean): void {
  if (unitOpen) {
    pressure.unit = "kPa";
    pressure.unsure.push("no unit in the header and no hot samples to judge by; read as kPa");
  }
  if (gaugeOpen) {
    pressure.gauge = anyNegative;
    pressure.unsure.push(anyNegative ? "no abs/gauge marker; negative readings, so read as gauge" : "no abs/gauge marker; read as absolute");
  }
}

/** The unit and gauge reading under which the hot samples sit closest (median) to the saturation line; null if none is physical. */
function bestReading(pairs: Array<[number, number]>, units: PressureUnit[], gauges: boolean[], atmosphereKpa: number): Reading | null {
  let best: Reading | null = null;
  for (const unit of units) {
    for (const gauge of gauges) {
      const error = medianError(pairs, unit, gauge, atmosphereKpa);
      if (error === Infinity) continue;
      // Ties go to absolute and to the order of PRESSURE_UNITS (kPa before the rarer units).
      if (!best || error < best.error - 1e-9) best = { unit, gauge, error };
    }
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

import { ATMOSPHERE_RANGE_KPA, KELVIN_OFFSET, STANDARD_ATMOSPHERE_KPA } from "./constants";
import { SteamRangeError } from "./errors";
import { TEMPERATURE_UNIT_SYMBOL, type PressureUnit, type TemperatureUnit } from "../domain/units";

export { PRESSURE_UNITS, TEMPERATURE_UNITS, TEMPERATURE_UNIT_SYMBOL, type PressureUnit, type TemperatureUnit } from "../domain/units";

// Exact or conventional definitions, see DOMAIN.md §4.
const KPA_PER_UNIT: Record<PressureUnit, number> = {
  Pa: 0.001,
  kPa: 1,
  MPa: 1000,
  bar: 100,
  mbar: 0.1,
  psi: 6.894757293168361,
  mmHg: 0.133322387415,
  inHg: 3.38638864,
};

function requireFinite(value: number, what: string): void {
  if (!Number.isFinite(value)) throw new SteamRangeError(`${what} ${value} is not a finite number`);
}

export function toCelsius(value: number, from: TemperatureUnit): number {
  if (from === "C") return value;
  if (from === "K") return value - KELVIN_OFFSET;
  return ((value - 32) * 5) / 9;
}

export function fromCelsius(valueC: number, to: TemperatureUnit): number {
  if (to === "C") return valueC;
  if (to === "K") return valueC + KELVIN_OFFSET;
  return (valueC * 9) / 5 + 32;
}

export function convertTemperature(value: number, from: TemperatureUnit, to: TemperatureUnit): number {
  requireFinite(value, "Temperature");
  const celsius = toCelsius(value, from);
  if (celsius < -KELVIN_OFFSET - 1e-9) {
    throw new SteamRangeError(`${value} ${TEMPERATURE_UNIT_SYMBOL[from]} is below absolute zero`);
  }
  return fromCelsius(celsius, to);
}

/** Scale factor: multiply a reading in `unit` by this to get kPa. */
export function kpaPerUnit(unit: PressureUnit): number {
  return KPA_PER_UNIT[unit];
}

/** Converts a pressure difference or an absolute value between units (no gauge offset). */
export function convertPressure(value: number, from: PressureUnit, to: PressureUnit): number {
  requireFinite(value, "Pressure");
  if (from === to) return value;
  return (value * KPA_PER_UNIT[from]) / KPA_PER_UNIT[to];
}

export type GaugeOptions = { gauge: boolean; atmosphereKpa?: number };

export function toAbsoluteKpa(value: number, unit: PressureUnit, options: GaugeOptions): number {
  requireFinite(value, "Pressure");
  const atmosphereKpa = options.atmosphereKpa ?? STANDARD_ATMOSPHERE_KPA;
  requireFinite(atmosphereKpa, "Atmospheric pressure");
  const kpa = value * KPA_PER_UNIT[unit];
  const absoluteKpa = options.gauge ? kpa + atmosphereKpa : kpa;
  if (absoluteKpa < 0) {
    throw new SteamRangeError(`${value} ${unit}${options.gauge ? " gauge" : ""} is ${absoluteKpa.toFixed(3)} kPa absolute: an absolute pressure cannot be negative`);
  }
  return absoluteKpa;
}

export function fromAbsoluteKpa(kpaAbs: number, unit: PressureUnit, options: GaugeOptions): number {
  requireFinite(kpaAbs, "Pressure");
  const atmosphereKpa = options.atmosphereKpa ?? STANDARD_ATMOSPHERE_KPA;
  const kpa = options.gauge ? kpaAbs - atmosphereKpa : kpaAbs;
  return kpa / KPA_PER_UNIT[unit];
}

/**
 * Standard-atmosphere pressure at an altitude, ASHRAE Handbook—Fundamentals 2021 ch. 1 Eq. 3,
 * valid from −5000 m to 11 000 m. Weather moves real barometric pressure by a few kPa.
 */
export function atmosphereAtAltitudeKpa(altitudeM: number): number {
  requireFinite(altitudeM, "Altitude");
  if (altitudeM < -5000 || altitudeM > 11000) {
    throw new SteamRangeError(`Altitude ${altitudeM} m is outside the standard atmosphere's range (−5000 m to 11 000 m)`);
  }
  return STANDARD_ATMOSPHERE_KPA * Math.pow(1 - 2.25577e-5 * altitudeM, 5.2559);
}

/** Null when kPa is a physical atmospheric pressure (ATMOSPHERE_RANGE_KPA); else what is wrong, in one sentence. */
export function atmosphereOutOfRange(kpa: number): string | null {
  const { min, max } = ATMOSPHERE_RANGE_KPA;
  if (Number.isFinite(kpa) && kpa >= min && kpa <= max) return null;
  return `an atmospheric pressure of ${kpa} kPa is outside the physical range of ${min}–${max} kPa (sea level is about 101.3 kPa)`;
}

function normaliseUnitText(s: string): string {
  return s
    .trim()
    .replace(/[\u00ba\u02da]/g, "°") // º and ˚ are common stand-ins for the degree sign
    .replace(/\u2103/g, "°C")
    .replace(/\u2109/g, "°F")
    .replace(/^[([{]\s*|\s*[)\]}]$/g, "")
    .trim();
}

/** Accepts °C, C, degC, deg C, celsius, ℃, °F, degF, fahrenheit, K, kelvin (any case). Returns null when unknown. */
export function parseTemperatureUnit(s: string): TemperatureUnit | null {
  const t = normaliseUnitText(s).toLowerCase().replace(/\s+/g, "");
  if (t === "c" || t === "°c" || t === "degc" || t === "deg.c" || t === "celsius" || t === "°celsius" || t === "degreesc" || t === "degc.") return "C";
  if (t === "f" || t === "°f" || t === "degf" || t === "deg.f" || t === "fahrenheit" || t === "°fahrenheit" || t === "degreesf") return "F";
  if (t === "k" || t === "kelvin" || t === "°k" || t === "degk") return "K";
  return null;
}

export type PressureLabel = { unit: PressureUnit; gauge: boolean | null };

const PRESSURE_BASES: ReadonlyArray<readonly [string, PressureUnit, number]> = [
  // [spelling, unit, extra factor] — hPa is mbar; Torr differs from mmHg by 1.5e-7 relative.
  ["mpa", "MPa", 1],
  ["kpa", "kPa", 1],
  ["hpa", "mbar", 1],
  ["pa", "Pa", 1],
  ["mbar", "mbar", 1],
  ["millibar", "mbar", 1],
  ["bar", "bar", 1],
  ["psi", "psi", 1],
  ["lbf/in2", "psi", 1],
  ["lbf/in²", "psi", 1],
  ["mmhg", "mmHg", 1],
  ["torr", "mmHg", 1],
  ["inhg", "inHg", 1],
  ["inchhg", "inHg", 1],
];

/**
 * Reads a pressure unit with an optional absolute/gauge marker: "kPa", "kPa abs", "bar(a)",
 * "bara", "barg", "psig", "psia", "mbar g", "kPa gauge", "mmHg". gauge is null when unmarked.
 */
export function parsePressureLabel(s: string): PressureLabel | null {
  let t = normaliseUnitText(s)
    .toLowerCase()
    .replace(/[\s_,.]+/g, " ")
    .trim();
  let gauge: boolean | null = null;
  const markerMatch = t.match(/^(.*?)\s*\(?\s*(absolute|abs|a|gauge|gage|g|rel|relative|ü)\s*\)?$/);
  const bareMatch = PRESSURE_BASES.find(([spelling]) => t.replace(/\s/g, "") === spelling);
  if (!bareMatch && markerMatch && markerMatch[1]) {
    const marker = markerMatch[2];
    gauge = marker.startsWith("a") ? false : true;
    t = markerMatch[1];
  }
  t = t.replace(/[\s()]/g, "");
  for (const [spelling, unit] of PRESSURE_BASES) {
    if (t === spelling) return { unit, gauge };
  }
  return null;
}

/** Accepts user spellings of a pressure unit ("kpa", "bar(a)", "psig", "Torr", "hPa"). Returns null when unknown. */
export function parsePressureUnit(s: string): PressureUnit | null {
  return parsePressureLabel(s)?.unit ?? null;
}

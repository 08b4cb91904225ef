import type { PressureReference } from "./units";

const DASH = "—";
const MINUS = "\u2212";

function fixedSigned(value: number, digits: number): string {
  const text = value.toFixed(digits);
  return text.startsWith("-") ? `${MINUS}${text.slice(1)}` : text;
}

/** A duration the way a technician reads it: "8.0 s", "95 s", "3 min 05 s", "2 h 04 min". */
export function formatDuration(seconds: number | null | undefined): string {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds)) return DASH;
  const s = Math.abs(seconds);
  const sign = seconds < 0 ? MINUS : "";
  if (s < 10) return `${sign}${s.toFixed(1)} s`;
  if (s < 120) return `${sign}${Math.round(s)} s`;
  if (s < 3600) {
    const whole = Math.round(s);
    return `${sign}${Math.floor(whole / 60)} min ${String(whole % 60).padStart(2, "0")} s`;
  }
  const minutes = Math.round(s / 60);
  return `${sign}${Math.floor(minutes / 60)} h ${String(minutes % 60).padStart(2, "0")} min`;
}

/** A temperature in degrees Celsius: "134.00 °C"; a missing value as a dash. */
export function formatTemperature(valueC: number | null | undefined, digits = 2): string {
  if (valueC === null || valueC === undefined || !Number.isFinite(valueC)) return DASH;
  return `${fixedSigned(valueC, digits)} °C`;
}

/** A pressure in kPa, with its reference when the reader needs it: "304.2 kPa abs". */
export function formatPressure(valueKpa: number | null | undefined, options: { digits?: number; reference?: PressureReference } = {}): string {
  if (valueKpa === null || valueKpa === undefined || !Number.isFinite(valueKpa)) return DASH;
  const suffix = options.reference ? ` ${options.reference}` : "";
  return `${fixedSigned(valueKpa, options.digits ?? 1)} kPa${suffix}`;
}

/** A chamber volume in litres with the standards' symbol, lower-case l: "445 l", "23.5 l". */
export function formatVolume(litres: number | null | undefined): string {
  if (litres === null || litres === undefined || !Number.isFinite(litres)) return DASH;
  return `${Number.isInteger(litres) ? litres.toLocaleString("en-GB") : litres.toFixed(1)} l`;
}

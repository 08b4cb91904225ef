/**
 * The heat map's colour scales, shared by the study page and the study report: F0 in bands around the study's minimum
 * (1-2-5-10 × the minimum, a log scale) and the minimum temperature during holding in bands of the sterilization band.
 * At and above the criterion the cells run through one blue ramp; below it (and above the band) they change hue, carry
 * a hatch and a symbol, so no one has to tell red from green (blue/vermillion is the colour-blind-safe pair). Each
 * band's text colour keeps at least the WCAG AA contrast of 4.5:1. Pure: numbers in, strings out.
 */

export type HeatMarker = "below" | "above";

export type HeatBand = {
  id: string;
  /** words for the legend and for a screen reader */
  label: string;
  fill: string;
  /** black or white, whichever reads better on the fill */
  text: string;
  /** "below": the criterion is missed; "above": over the band's top; drawn as a symbol and a hatch */
  marker: HeatMarker | null;
};

/** The symbol printed beside a marked cell's value. */
export const HEAT_MARKER_SYMBOLS: Record<HeatMarker, string> = { below: "▼", above: "▲" };
/** The hatch over marked cells: stripes of the colour opposite the text, so they only raise the text's contrast. */
export const HEAT_HATCH = { opacity: 0.35, angleDeg: 45, spacingPx: 6 } as const;

const INK = "#111111";
const PAPER = "#ffffff";
/** vermillion and reddish purple (Okabe & Ito's colour-blind-safe set); the blues a sequential ramp, light to dark */
const MISSED = "#d55e00";
const OVER = "#542788";
const BLUES = ["#c6dbef", "#6baed6", "#2171b5", "#08306b"] as const;
export const NO_READING_BAND: HeatBand = { id: "none", label: "no reading", fill: "#eef0f3", text: INK, marker: null };

/** F0 values closer than this to a band edge count as reaching it, min (the analysis keeps 4 decimals). */
const F0_EDGE_MIN = 1e-9;
/** as EDGE_TOLERANCE_K of the analysis: a reading of exactly Ts is at Ts */
const TEMP_EDGE_K = 1e-6;

function channel(hex: string, at: number): number {
  const v = parseInt(hex.slice(at, at + 2), 16) / 255;
  return v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4;
}

/** WCAG 2 relative luminance of a #rrggbb colour. */
export function relativeLuminance(hex: string): number {
  return 0.2126 * channel(hex, 1) + 0.7152 * channel(hex, 3) + 0.0722 * channel(hex, 5);
}

/** WCAG 2 contrast ratio, 1 to 21. */
export function contrastRatio(a: string, b: string): number {
  const [hi, lo] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x);
  return (hi + 0.05) / (lo + 0.05);
}

export const hatchStroke = (band: HeatBand): string => (band.text === PAPER ? "#000000" : PAPER);

export const textColourOn = (fill: string): string => (contrastRatio(fill, INK) >= contrastRatio(fill, PAPER) ? INK : PAPER);

const band = (id: string, label: string, fill: string, marker: HeatMarker | null = null): HeatBand => ({ id, label, fill, text: textColourOn(fill), marker });

const minutes = (v: number) => `${Number(v.toFixed(1))} min`;
const celsius = (v: number) => `${Number(v.toFixed(1))} °C`;

/** The F0 bands, lowest first: below the minimum, then 1–2, 2–5, 5–10 and at least 10 × the minimum. */
export function f0Bands(minF0Min: number): HeatBand[] {
  const [x2, x5, x10] = [2, 5, 10].map((k) => k * minF0Min);
  return [
    band("below", `below the minimum F0 (under ${minutes(minF0Min)})`, MISSED, "below"),
    band("x1", `${minutes(minF0Min)} to under ${minutes(x2)} (1–2 × the minimum)`, BLUES[0]),
    band("x2", `${minutes(x2)} to under ${minutes(x5)} (2–5 × the minimum)`, BLUES[1]),
    band("x5", `${minutes(x5)} to under ${minutes(x10)} (5–10 × the minimum)`, BLUES[2]),
    band("x10", `${minutes(x10)} or more (10 × the minimum or more)`, BLUES[3]),
  ];
}

/** The band of one F0 value, minutes; null: the run has no reading at this position. */
export function f0Band(f0Min: number | null, minF0Min: number): HeatBand {
  if (f0Min === null || !Number.isFinite(f0Min)) return NO_READING_BAND;
  const bands = f0Bands(minF0Min);
  const edges = [1, 2, 5, 10].map((k) => k * minF0Min - F0_EDGE_MIN);
  const reached = edges.filter((edge) => f0Min >= edge).length;
  return bands[reached];
}

export type TemperatureScale = { sterilizationTempC: number; bandK: number };

/** The minimum-temperature bands, lowest first: below Ts, the three thirds of the band, above the band's top. */
export function temperatureBands({ sterilizationTempC: ts, bandK }: TemperatureScale): HeatBand[] {
  const third = bandK / 3;
  return [
    band("below", `below Ts (under ${celsius(ts)})`, MISSED, "below"),
    band("low", `${celsius(ts)} to under ${celsius(ts + third)}`, BLUES[0]),
    band("mid", `${celsius(ts + third)} to under ${celsius(ts + 2 * third)}`, BLUES[1]),
    band("high", `${celsius(ts + 2 * third)} to ${celsius(ts + bandK)}`, BLUES[2]),
    band("above", `above the band's top (over ${celsius(ts + bandK)})`, OVER, "above"),
  ];
}

/** The band of one minimum temperature during holding, °C; null: no reading in the hold. */
export function temperatureBand(minTempC: number | null, scale: TemperatureScale): HeatBand {
  if (minTempC === null || !Number.isFinite(minTempC)) return NO_READING_BAND;
  const bands = temperatureBands(scale);
  const { sterilizationTempC: ts, bandK } = scale;
  if (minTempC < ts - TEMP_EDGE_K) return bands[0];
  if (minTempC > ts + bandK + TEMP_EDGE_K) return bands[4];
  if (minTempC < ts + bandK / 3 - TEMP_EDGE_K) return bands[1];
  if (minTempC < ts + (2 * bandK) / 3 - TEMP_EDGE_K) return bands[2];
  return bands[3];
}

/**
 * A cell's value as printed, page and report alike: F0 with two decimals below 100 min (so 14.96 does not print as a
 * passing 15.0), one above; temperatures with two decimals, like the record's.
 */
export function heatValueText(value: number | null, metric: "f0" | "minTemp"): string {
  if (value === null || !Number.isFinite(value)) return "—";
  if (metric === "minTemp") return value.toFixed(2);
  return value.toFixed(value < 100 ? 2 : 1);
}

import type { IndicatorKind, IndicatorResult } from "./studies";

/**
 * Words and numbers for a study's evidence (issue 14 §4, §5): biological indicator populations, the grid of current
 * readings (runs × positions) and each reading's corrections. Pure, so the forms, the panels and the tests share it.
 */

/** The organism of a biological indicator for moist heat when nobody names another (common practice for steam). */
export const DEFAULT_BI_ORGANISM = "Geobacillus stearothermophilus";
/** Incubation as usually printed on the indicator's instructions for that organism (common practice); text, as labs write it. */
export const DEFAULT_BI_INCUBATION = "55–60 °C, 7 days";

const SUPERSCRIPT: Record<string, string> = { "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹" };

const FROM_SUPERSCRIPT: Record<string, string> = Object.fromEntries(Object.entries(SUPERSCRIPT).map(([plain, sup]) => [sup, plain]));

/** A population per carrier as labs print it: 1500000 → "1.5 × 10⁶"; below 1000 as the plain count. */
export function formatPopulation(count: number | null | undefined): string {
  if (count === null || count === undefined || !Number.isFinite(count) || count <= 0) return "—";
  if (count < 1000) return String(Math.round(count * 100) / 100);
  const [mantissa, exponent] = count.toExponential(1).split("e");
  const power = String(Number(exponent))
    .split("")
    .map((c) => SUPERSCRIPT[c] ?? c)
    .join("");
  return `${mantissa} × 10${power}`;
}

/**
 * A population as typed: "1000000", "1e6", "1.0E6", "1,5 × 10^6", "2.1 x 10^5", "1.0 × 10⁶". Null when it is not one
 * of these (the form then says so), never a guess.
 */
export function parsePopulation(text: string): number | null {
  const plain = text
    .trim()
    .replace(/[⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+/g, (sup) => `^${[...sup].map((c) => FROM_SUPERSCRIPT[c]).join("")}`)
    .replace(/\s+/g, "")
    .replace(",", ".");
  const power = /^(\d+(?:\.\d+)?)[×xX*]10\^(-?\d+)$/.exec(plain);
  const value = power ? Number(power[1]) * Math.pow(10, Number(power[2])) : /^\d+(?:\.\d+)?(?:[eE][+-]?\d+)?$/.test(plain) ? Number(plain) : NaN;
  return Number.isFinite(value) && value > 0 ? value : null;
}

/** The fields of one indicator reading the grid and the history need (a slice of StudyDetail's indicators). */
export type IndicatorReading = {
  id: string;
  runId: string;
  positionId: string;
  kind: IndicatorKind;
  result: IndicatorResult;
  recordedAt: string;
  current: boolean;
};

export type IndicatorCell<R extends IndicatorReading> = {
  runId: string;
  positionId: string;
  /** the reading that counts, per kind; absent when none was recorded */
  current: Partial<Record<IndicatorKind, R>>;
  /** every reading of this cell, newest first (the current one included), so corrections stay visible */
  history: R[];
};

/** The key of a cell of the grid; one per (run, position). */
export const indicatorCellKey = (runId: string, positionId: string) => `${runId}\u0000${positionId}`;

/** Runs × positions: each cell holds the current biological and chemical reading and all earlier ones. */
export function indicatorGrid<R extends IndicatorReading>(readings: readonly R[]): Map<string, IndicatorCell<R>> {
  const cells = new Map<string, IndicatorCell<R>>();
  const newestFirst = [...readings].sort((a, b) => b.recordedAt.localeCompare(a.recordedAt));
  for (const reading of newestFirst) {
    const key = indicatorCellKey(reading.runId, reading.positionId);
    const cell = cells.get(key) ?? { runId: reading.runId, positionId: reading.positionId, current: {}, history: [] };
    cell.history.push(reading);
    if (reading.current) cell.current[reading.kind] = reading;
    cells.set(key, cell);
  }
  return cells;
}

/** Whether a reading replaces an earlier one of the same run, position and kind: then a reason is required. */
type IndicatorSlot = { runId: string; positionId: string; kind: IndicatorKind };
export function isIndicatorCorrection(recorded: readonly IndicatorSlot[], target: IndicatorSlot): boolean {
  return recorded.some((r) => r.runId === target.runId && r.positionId === target.positionId && r.kind === target.kind);
}

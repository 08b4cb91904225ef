import { columnIsNumeric, findHeader, isNonDecreasing, sampleNumbers } from "./column-samples";
import { LoggerFileError } from "./errors";
import { unitFromHeader } from "./header-units";
import { TIME_HEADER_RE, elapsedScaleFromHeader, guessTimeFormat, type TimeFormat } from "./time";
import type { ColumnMapping, ColumnOverride, DecimalMark, MappingOverrides } from "./types";

/** What the sample rows and headers say, with a user's per-column overrides by column index. */
export type ColumnEvidence = { headers: string[]; sampleRows: string[][]; decimal: DecimalMark; overrideFor: Map<number, ColumnOverride> };

export type TimeColumn = {
  index: number;
  format: TimeFormat;
  /** seconds per unit of an elapsed-time column */
  elapsedScale: number;
  unsure: string[];
};

type TimeGuess = Omit<TimeColumn, "index">;

/** A column reads as time when it holds date-times or clock times, or numbers that never fall (elapsed time). */
function timeFromContent(evidence: ColumnEvidence, index: number): TimeGuess | null {
  const { headers, sampleRows, decimal } = evidence;
  const guess = guessTimeFormat(sampleRows.map((r) => r[index] ?? ""));
  if (guess) return { format: guess.format, elapsedScale: 1, unsure: [...guess.unsure] };
  if (columnIsNumeric(sampleRows, index) && isNonDecreasing(sampleNumbers(sampleRows, index, decimal))) {
    const fromHeader = elapsedScaleFromHeader(headers[index]);
    const unitOverride = evidence.overrideFor.get(index)?.unit;
    return { format: "elapsed-seconds", elapsedScale: unitOverride ? elapsedScaleFromHeader(`(${unitOverride})`).scale : fromHeader.scale, unsure: [] };
  }
  return null;
}

const looksLikeTimeHeader = (h: string) =>
  (TIME_HEADER_RE.test(h) || /^t\s*([([]\s*(s|sec|min|h|ms)\s*[)\]])?$/i.test(h)) && unitFromHeader(h)?.kind !== "temperature" && unitFromHeader(h)?.kind !== "pressure";

/** The time column: the one the user named, else the first header naming time whose cells agree, else the first column of date-times or clock times. */
export function findTimeColumn(evidence: ColumnEvidence, overrides: MappingOverrides): TimeColumn {
  const { headers, sampleRows, overrideFor } = evidence;
  const forced = overrides.timeColumn !== undefined ? findHeader(headers, overrides.timeColumn, "time column") : [...overrideFor].find(([, o]) => o.role === "time")?.[0];
  if (forced !== undefined) {
    const guess = timeFromContent(evidence, forced);
    if (!guess) {
      const example = sampleRows.find((r) => (r[forced] ?? "").trim() !== "")?.[forced] ?? "";
      throw new LoggerFileError(`Column "${headers[forced]}" was given as the time column, but its cells (e.g. "${example.trim()}") are neither date-times, clock times nor rising elapsed seconds`);
    }
    return { index: forced, ...guess };
  }
  for (let i = 0; i < headers.length; i++) {
    if (overrideFor.has(i) || !looksLikeTimeHeader(headers[i])) continue;
    const guess = timeFromContent(evidence, i);
    if (guess) return { index: i, ...guess };
  }
  for (let i = 0; i < headers.length; i++) {
    if (overrideFor.has(i)) continue;
    const guess = guessTimeFormat(sampleRows.map((r) => r[i] ?? ""));
    if (guess) return { index: i, format: guess.format, elapsedScale: 1, unsure: [...guess.unsure, "the header does not name it as time; found by its content"] };
  }
  throw new LoggerFileError("No time column: no header names a time and no column holds date-times, clock times or elapsed seconds; say which column is the time");
}

/** Marks the time column's role and unit, and says when an elapsed time had no unit to go by. */
export function markTimeColumn(column: ColumnMapping, time: TimeColumn, overrideFor: Map<number, ColumnOverride>): void {
  const unsure = [...time.unsure];
  column.role = "time";
  column.unit = time.format === "elapsed-seconds" ? elapsedScaleFromHeader(column.header).unit : null;
  if (time.format === "elapsed-seconds") {
    const u = overrideFor.get(time.index)?.unit;
    if (u) column.unit = elapsedScaleFromHeader(`(${u})`).unit;
    if (!/\(|\[/.test(column.header) && !u) unsure.push("elapsed time without a unit in the header; read as seconds");
  }
  column.unsure = unsure;
}

import { LoggerFileError } from "./errors";
import { DECIMAL_CODES, looksNumeric, parseDecimal } from "./numbers";
import type { DecimalMark } from "./types";

/** The column a user named, exactly or ignoring case; refused with the file's columns listed. */
export function findHeader(headers: string[], name: string, what: string): number {
  const wanted = name.trim();
  let index = headers.indexOf(wanted);
  if (index < 0) index = headers.findIndex((h) => h.toLowerCase() === wanted.toLowerCase());
  if (index < 0) {
    const list = headers
      .filter((h) => h !== "")
      .map((h) => `"${h}"`)
      .join(", ");
    throw new LoggerFileError(`The ${what} "${wanted}" is not a column of this file; its columns are ${list}`);
  }
  return index;
}

export function sampleNumbers(rows: string[][], index: number, decimal: DecimalMark): number[] {
  const code = DECIMAL_CODES[decimal];
  const values: number[] = [];
  for (const row of rows) {
    const cell = row[index];
    if (cell === undefined) continue;
    const v = parseDecimal(cell, 0, cell.length, code);
    if (Number.isFinite(v)) values.push(v);
  }
  return values;
}

/** Mostly numbers: the odd text cell is left for the reader to report with its row. */
export function columnIsNumeric(rows: string[][], index: number): boolean {
  let filled = 0;
  let numeric = 0;
  for (const row of rows) {
    const cell = (row[index] ?? "").trim();
    if (cell === "") continue;
    filled++;
    if (looksNumeric(cell)) numeric++;
  }
  return numeric > 0 && numeric >= Math.ceil(filled * 0.6);
}

export function columnIsEmpty(rows: string[][], index: number): boolean {
  return rows.every((row) => (row[index] ?? "").trim() === "");
}

export function isNonDecreasing(values: number[]): boolean {
  for (let i = 1; i < values.length; i++) if (values[i] < values[i - 1]) return false;
  return values.length > 1;
}

import Papa from "papaparse";

/**
 * CSV for people who open it in a spreadsheet. Two hazards: a cell that a spreadsheet reads as a
 * formula (OWASP "CSV injection": = + - @, tab, carriage return at the start), and a cell whose
 * delimiter, quote or line break breaks the row (RFC 4180 quoting). Papa.unparse handles both.
 */

export type CsvCell = string | number | boolean | null | undefined;

// Papa's own pattern for escapeFormulae ends in `.*$`, which misses a formula cell that goes on
// over a line break ("+x\r\ny"); only the first character matters.
const FORMULA_START = /^[=+\-@\t\r]/;

// Numbers stay numbers so that a spreadsheet can sum them (a negative number is not a formula);
// a number that is not finite is an empty cell, never "NaN".
const cellValue = (value: CsvCell): CsvCell => (typeof value === "number" && !Number.isFinite(value) ? null : value);

function unparse(rows: ReadonlyArray<readonly CsvCell[]>): string {
  return Papa.unparse(
    rows.map((row) => row.map(cellValue)),
    { newline: "\r\n", escapeFormulae: FORMULA_START },
  );
}

/** One row of cells, formula-safe and quoted where it has to be, without a line end. */
export function csvRow(cells: readonly CsvCell[]): string {
  return unparse([cells]);
}

/**
 * A whole document: header row, then rows, CRLF line ends (RFC 4180) and a UTF-8 byte-order
 * mark so that spreadsheets read "°C" and accented names correctly.
 */
export function toCsv(header: readonly string[], rows: Iterable<readonly CsvCell[]>): string {
  return "\uFEFF" + unparse([header, ...rows]) + "\r\n";
}

/**
 * CSV for people who open it in a spreadsheet. Two hazards: a cell that a spreadsheet reads as a
 * formula (OWASP "CSV injection": = + - @, tab, carriage return at the start), and a cell whose
 * delimiter, quote or line break breaks the row (RFC 4180 quoting).
 */

export type CsvCell = string | number | boolean | null | undefined;

const FORMULA_START = /^[=+\-@\t\r]/;
const NEEDS_QUOTES = /[",\r\n]/;

/** Neutralises a value a spreadsheet would run as a formula by prefixing a single quote. */
export function neutraliseFormula(text: string): string {
  return FORMULA_START.test(text) ? `'${text}` : text;
}

/** One cell as it goes into the file: formula-safe, then quoted when it has to be. */
export function csvCell(value: CsvCell): string {
  if (value === null || value === undefined) return "";
  // Numbers are written as numbers so that a spreadsheet can sum them; a negative number is
  // not a formula, and quoting it would turn it into text.
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "";
  if (typeof value === "boolean") return value ? "true" : "false";
  const safe = neutraliseFormula(value);
  return NEEDS_QUOTES.test(safe) || FORMULA_START.test(value) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

export function csvRow(cells: readonly CsvCell[]): string {
  return cells.map(csvCell).join(",");
}

/**
 * A whole document: header row, then rows, CRLF line ends (RFC 4180) and a UTF-8 byte-order
 * mark so that spreadsheets read "°C" and accented names correctly.
 */
export function toCsv(header: readonly string[], rows: Iterable<readonly CsvCell[]>): string {
  const lines = [csvRow(header)];
  for (const row of rows) lines.push(csvRow(row));
  return "\uFEFF" + lines.join("\r\n") + "\r\n";
}

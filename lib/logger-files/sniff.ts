import { LoggerFileError } from "./errors";
import { hasDecimalComma, hasDecimalPoint, looksNumeric } from "./numbers";
import { guessTimeFormat } from "./time";
import type { PreparedText } from "./lines";
import type { DecimalMark, Delimiter } from "./types";

export { MAX_FIELDS_PER_ROW, MAX_LINE_CHARS, PreparedText, prepareText } from "./lines";

export function lineText(prepared: PreparedText, lineIndex: number): string {
  return prepared.line(lineIndex);
}

/** Splits one line into fields; double quotes protect delimiters and "" stands for one quote. */
export function splitFields(line: string, delimiter: string): string[] {
  if (!line.includes('"')) return line.split(delimiter);
  const fields: string[] = [];
  let current = "";
  let inQuotes = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (inQuotes) {
      if (ch === '"') {
        if (line[i + 1] === '"') {
          current += '"';
          i++;
        } else {
          inQuotes = false;
        }
      } else {
        current += ch;
      }
    } else if (ch === '"' && current.trim() === "") {
      inQuotes = true;
      current = "";
    } else if (ch === delimiter) {
      fields.push(current);
      current = "";
    } else {
      current += ch;
    }
  }
  fields.push(current);
  return fields;
}

export function isBlankLine(line: string, delimiter?: string): boolean {
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (ch !== " " && ch !== "\t" && ch !== "\r" && ch !== delimiter) return false;
  }
  return true;
}

const DELIMITER_NAMES: Record<Delimiter, string> = { ",": "comma", ";": "semicolon", "\t": "tab" };
export function delimiterName(delimiter: Delimiter): string {
  return DELIMITER_NAMES[delimiter];
}

function isDataCell(cell: string): boolean {
  const c = cell.trim();
  return c !== "" && (looksNumeric(c) || guessTimeFormat([c]) !== null);
}

export function isDataRow(fields: string[]): boolean {
  let data = 0;
  let nonEmpty = 0;
  for (const f of fields) {
    if (f.trim() === "") continue;
    nonEmpty++;
    if (isDataCell(f)) data++;
  }
  return data >= 2 && data >= Math.ceil(nonEmpty * 0.75);
}

export type TableLayout = {
  delimiter: Delimiter;
  width: number;
  /** 0-based line index of the header, or −1 when there is none */
  headerLineIndex: number;
  firstDataLineIndex: number;
  headers: string[];
  decimal: DecimalMark;
  /** quotes anywhere in the header or the data */
  quoted: boolean;
  /** quotes below the header: the data needs the quote-aware reader */
  dataQuoted: boolean;
};

const SAMPLE_LINES = 200;

/** Finds the delimiter, the header line, the first data line and the decimal mark. */
export function findTable(prepared: PreparedText): TableLayout {
  const sampleCount = Math.min(prepared.lineCount, SAMPLE_LINES);
  const sample: string[] = [];
  for (let i = 0; i < sampleCount; i++) sample.push(lineText(prepared, i));

  let chosen: { delimiter: Delimiter; width: number } | null = null;
  for (const delimiter of ["\t", ";", ","] as Delimiter[]) {
    const counts: number[] = [];
    for (const line of sample) if (!isBlankLine(line)) counts.push(splitFields(line, delimiter).length);
    const tail = counts.slice(Math.floor(counts.length * 0.4));
    if (tail.length === 0) continue;
    const frequency = new Map<number, number>();
    for (const c of tail) frequency.set(c, (frequency.get(c) ?? 0) + 1);
    let width = 0;
    let best = 0;
    for (const [c, n] of frequency) if (n > best || (n === best && c > width)) [width, best] = [c, n];
    if (width >= 2 && best / tail.length >= 0.6) {
      chosen = { delimiter, width };
      break;
    }
  }
  if (!chosen) {
    throw new LoggerFileError("The file holds no table: no run of lines splits into two or more fields by comma, semicolon or tab (it reads like prose or a single column)");
  }
  const { delimiter, width } = chosen;

  let firstDataLineIndex = -1;
  for (let i = 0; i < sample.length; i++) {
    const fields = splitFields(sample[i], delimiter);
    if (fields.length === width && isDataRow(fields)) {
      firstDataLineIndex = i;
      break;
    }
  }
  if (firstDataLineIndex < 0) {
    const headerIndex = sample.findIndex((line) => splitFields(line, delimiter).length === width);
    if (headerIndex >= 0 && sample.slice(headerIndex + 1).every((l) => isBlankLine(l, delimiter))) {
      throw new LoggerFileError(`The file has a header (line ${headerIndex + 1}) but no data rows below it`);
    }
    throw new LoggerFileError(`The file holds no data rows: none of its first ${sample.length} lines has numbers or times in ${width} ${delimiterName(delimiter)}-separated fields`);
  }

  let headerLineIndex = -1;
  for (let i = firstDataLineIndex - 1; i >= 0; i--) {
    if (isBlankLine(sample[i], delimiter)) continue;
    const fields = splitFields(sample[i], delimiter);
    if (fields.length >= 2 && !isDataRow(fields)) headerLineIndex = i;
    break;
  }

  let headers: string[];
  if (headerLineIndex >= 0) {
    headers = splitFields(sample[headerLineIndex], delimiter).map((h) => h.trim());
    while (headers.length > width && headers[headers.length - 1] === "") headers.pop();
    while (headers.length < width) headers.push("");
  } else {
    headers = Array.from({ length: width }, (_, i) => `Column ${i + 1}`);
  }

  let decimal: DecimalMark = ".";
  if (delimiter !== ",") {
    let commas = 0;
    let points = 0;
    for (let i = firstDataLineIndex; i < sample.length; i++) {
      for (const cell of splitFields(sample[i], delimiter)) {
        if (hasDecimalComma(cell)) commas++;
        else if (hasDecimalPoint(cell)) points++;
      }
    }
    if (commas > points) decimal = ",";
  }

  const dataQuoted = prepared.quotedFrom(firstDataLineIndex);
  const quoted = dataQuoted || (headerLineIndex >= 0 && lineText(prepared, headerLineIndex).includes('"'));

  return { delimiter, width, headerLineIndex, firstDataLineIndex, headers, decimal, quoted, dataQuoted };
}

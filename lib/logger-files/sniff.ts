import { decodeLoggerBytes, type TextEncodingName } from "./decode";
import { LoggerFileError } from "./errors";
import { hasDecimalComma, hasDecimalPoint, looksNumeric } from "./numbers";
import { guessTimeFormat } from "./time";
import type { DecimalMark, Delimiter, LineEnding } from "./types";

/** Decoded text with an index of its lines, so that no line is copied until it is needed. */
export type PreparedText = {
  text: string;
  encoding: TextEncodingName;
  lineEnding: LineEnding;
  lineStarts: Int32Array;
  /** end of each line, line break (and CR) excluded */
  lineEnds: Int32Array;
  lineCount: number;
};

/** Longest line read, in characters: a logger row is a few hundred; a longer line is not a table row (issue 11). */
export const MAX_LINE_CHARS = 1024 * 1024;
/** Most fields in one row; counted before any line is split, so a huge row never becomes a huge array. */
export const MAX_FIELDS_PER_ROW = 10_000;

const SEPARATOR_CODES: Array<[number, Delimiter]> = [
  [44, ","],
  [59, ";"],
  [9, "\t"],
];

/** Refuses a line over MAX_LINE_CHARS or with more than MAX_FIELDS_PER_ROW fields by any separator (quoted ones counted too). */
function checkLineLimits(text: string, start: number, end: number, lineIndex: number): void {
  const length = end - start;
  if (length > MAX_LINE_CHARS) {
    throw new LoggerFileError(`Line ${lineIndex + 1} is ${length.toLocaleString("en")} characters long; Papin reads lines of at most ${MAX_LINE_CHARS.toLocaleString("en")} characters (1 MB)`);
  }
  // Fewer characters than the limit cannot hold more fields than the limit.
  if (length < MAX_FIELDS_PER_ROW) return;
  for (const [code, delimiter] of SEPARATOR_CODES) {
    let separators = 0;
    for (let i = start; i < end; i++) if (text.charCodeAt(i) === code) separators++;
    if (separators >= MAX_FIELDS_PER_ROW) {
      throw new LoggerFileError(
        `Line ${lineIndex + 1} has ${(separators + 1).toLocaleString("en")} ${delimiterName(delimiter)}-separated fields; Papin reads at most ${MAX_FIELDS_PER_ROW.toLocaleString("en")} fields per row`,
      );
    }
  }
}

/**
 * Before decoding: a stretch of bytes without a line break that is longer than any lawful line in any encoding Papin
 * reads (at most 3 UTF-8 bytes per character) is refused at once, so a huge single line is not decoded first.
 */
function refuseHugeLineBytes(bytes: Uint8Array): void {
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return; // UTF-16: a 0x0A byte may sit inside a character
  const limitBytes = 3 * MAX_LINE_CHARS;
  if (bytes.length <= limitBytes) return;
  // Lines break at LF, or at CR in a file without any LF (as prepareText splits them); look no further than needed.
  const window = bytes.subarray(0, limitBytes + 1);
  const breakByte = window.indexOf(0x0a) < 0 && window.indexOf(0x0d) >= 0 && bytes.indexOf(0x0a) < 0 ? 0x0d : 0x0a;
  // Stride from break to break at most limitBytes apart; only a refusal counts the lines before it.
  for (let start = 0; bytes.length - start > limitBytes;) {
    const lastBreak = bytes.lastIndexOf(breakByte, start + limitBytes);
    if (lastBreak >= start) {
      start = lastBreak + 1;
      continue;
    }
    const before = bytes.subarray(0, start);
    let lineIndex = 0;
    for (let at = before.indexOf(breakByte); at >= 0; at = before.indexOf(breakByte, at + 1)) lineIndex++;
    const end = bytes.indexOf(breakByte, start);
    const lengthBytes = (end < 0 ? bytes.length : end) - start;
    throw new LoggerFileError(`Line ${lineIndex + 1} is ${lengthBytes.toLocaleString("en")} bytes long; Papin reads lines of at most ${MAX_LINE_CHARS.toLocaleString("en")} characters (1 MB)`);
  }
}

export function prepareText(bytes: Uint8Array): PreparedText {
  refuseHugeLineBytes(bytes);
  const { text, encoding } = decodeLoggerBytes(bytes);
  if (text.trim() === "") throw new LoggerFileError("The file is empty: it holds only blank space");
  const firstLf = text.indexOf("\n");
  const breakChar = firstLf < 0 && text.includes("\r") ? "\r" : "\n";
  const lineEnding: LineEnding = breakChar === "\r" ? "cr" : firstLf > 0 && text.charCodeAt(firstLf - 1) === 13 ? "crlf" : "lf";
  let capacity = 1024;
  let starts = new Int32Array(capacity);
  let ends = new Int32Array(capacity);
  let count = 0;
  let position = 0;
  const length = text.length;
  while (position <= length) {
    let next = text.indexOf(breakChar, position);
    if (next < 0) next = length;
    let end = next;
    if (breakChar === "\n" && end > position && text.charCodeAt(end - 1) === 13) end--;
    if (count === capacity) {
      capacity *= 2;
      const grownStarts = new Int32Array(capacity);
      grownStarts.set(starts);
      starts = grownStarts;
      const grownEnds = new Int32Array(capacity);
      grownEnds.set(ends);
      ends = grownEnds;
    }
    checkLineLimits(text, position, end, count);
    starts[count] = position;
    ends[count] = end;
    count++;
    position = next + 1;
  }
  // A final line break leaves an empty last line: drop it.
  while (count > 0 && ends[count - 1] === starts[count - 1]) count--;
  return { text, encoding, lineEnding, lineStarts: starts, lineEnds: ends, lineCount: count };
}

export function lineText(prepared: PreparedText, lineIndex: number): string {
  return prepared.text.slice(prepared.lineStarts[lineIndex], prepared.lineEnds[lineIndex]);
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

  const dataQuoted = prepared.text.indexOf('"', prepared.lineStarts[firstDataLineIndex]) >= 0;
  const quoted = dataQuoted || (headerLineIndex >= 0 && lineText(prepared, headerLineIndex).includes('"'));

  return { delimiter, width, headerLineIndex, firstDataLineIndex, headers, decimal, quoted, dataQuoted };
}

import { decodeBytewise, decodeUtf8, decodeWindows1252, refuseBinaryHead, type TextEncodingName } from "./decode";
import { LoggerFileError } from "./errors";
import type { LineEnding } from "./types";

/** Where the reader takes a file's bytes from: memory, or a file read piece by piece (the analyze command). */
export type ByteSource = { byteLength: number; slice(start: number, end: number): Uint8Array };

export function bytesSource(bytes: Uint8Array): ByteSource {
  return { byteLength: bytes.length, slice: (start, end) => bytes.subarray(start, end) };
}

/** Consecutive lines decoded together: char offsets of each line in text, line break (and CR) excluded. */
export type TextBlock = { text: string; firstLine: number; lineCount: number; lineStarts: Int32Array; lineEnds: Int32Array };

/** Longest line read, in characters: a logger row is a few hundred; a longer line is not a table row (issue 11). */
export const MAX_LINE_CHARS = 1024 * 1024;
/** Most fields in one row; counted before any line is split, so a huge row never becomes a huge array. */
export const MAX_FIELDS_PER_ROW = 10_000;
/** A stretch of bytes without a line break longer than any lawful line in any encoding Papin reads (≤ 3 UTF-8 bytes per character). */
const MAX_LINE_BYTES = 3 * MAX_LINE_CHARS;

const CHUNK_BYTES = 4 * 1024 * 1024;
const BLOCK_BYTES = 1024 * 1024;
const GROUP_SHIFT = 6;

const SEPARATORS: Array<[number, string]> = [
  [44, "comma"],
  [59, "semicolon"],
  [9, "tab"],
];

/** Refuses a line over MAX_LINE_CHARS or with more than MAX_FIELDS_PER_ROW fields by any separator (quoted ones counted too). */
function checkLineLimits(line: string, lineIndex: number): void {
  if (line.length > MAX_LINE_CHARS) {
    throw new LoggerFileError(`Line ${lineIndex + 1} is ${line.length.toLocaleString("en")} characters long; Papin reads lines of at most ${MAX_LINE_CHARS.toLocaleString("en")} characters (1 MB)`);
  }
  if (line.length < MAX_FIELDS_PER_ROW) return;
  for (const [code, name] of SEPARATORS) {
    let separators = 0;
    for (let i = 0; i < line.length; i++) if (line.charCodeAt(i) === code) separators++;
    if (separators >= MAX_FIELDS_PER_ROW) {
      throw new LoggerFileError(
        `Line ${lineIndex + 1} has ${(separators + 1).toLocaleString("en")} ${name}-separated fields; Papin reads at most ${MAX_FIELDS_PER_ROW.toLocaleString("en")} fields per row`,
      );
    }
  }
}

function hugeLine(lineIndex: number, lengthBytes: number): LoggerFileError {
  return new LoggerFileError(`Line ${lineIndex + 1} is ${lengthBytes.toLocaleString("en")} bytes long; Papin reads lines of at most ${MAX_LINE_CHARS.toLocaleString("en")} characters (1 MB)`);
}

/** First position of a byte at or after from, reading the source a chunk at a time; −1 when there is none. */
function findByte(source: ByteSource, byte: number, from = 0, to = source.byteLength): number {
  for (let at = from; at < to; at += CHUNK_BYTES) {
    const found = source.slice(at, Math.min(to, at + CHUNK_BYTES)).indexOf(byte);
    if (found >= 0) return at + found;
  }
  return -1;
}

/** A file whose lines are indexed by byte position (every 64th line), decoded a block or a line group at a time, so the whole text never exists at once. */
export class PreparedText {
  private cachedGroup = -1;
  private cachedLines: string[] = [];

  constructor(
    private readonly source: ByteSource,
    readonly encoding: TextEncodingName,
    readonly lineEnding: LineEnding,
    readonly lineCount: number,
    /** byte start of lines 0, 64, 128, … */
    private readonly groupStarts: Float64Array,
    private readonly lastQuoteByte: number,
  ) {}

  private decode(bytes: Uint8Array): string {
    return this.encoding === "windows-1252" ? decodeWindows1252(bytes) : decodeUtf8(bytes);
  }

  private groupEnd(group: number): number {
    return group + 1 < this.groupStarts.length ? this.groupStarts[group + 1] : this.source.byteLength;
  }

  /** Splits decoded text that starts at a line start into count lines. */
  private split(text: string, firstLine: number, count: number): TextBlock {
    const lineStarts = new Int32Array(count);
    const lineEnds = new Int32Array(count);
    const breakChar = this.lineEnding === "cr" ? "\r" : "\n";
    let position = 0;
    for (let k = 0; k < count; k++) {
      let next = text.indexOf(breakChar, position);
      if (next < 0) next = text.length;
      let end = next;
      if (breakChar === "\n" && end > position && text.charCodeAt(end - 1) === 13) end--;
      lineStarts[k] = position;
      lineEnds[k] = end;
      position = next + 1;
    }
    return { text, firstLine, lineCount: count, lineStarts, lineEnds };
  }

  line(lineIndex: number): string {
    const group = lineIndex >> GROUP_SHIFT;
    if (group !== this.cachedGroup) {
      const first = group << GROUP_SHIFT;
      const count = Math.min(1 << GROUP_SHIFT, this.lineCount - first);
      const block = this.split(this.decode(this.source.slice(this.groupStarts[group], this.groupEnd(group))), first, count);
      this.cachedLines = Array.from({ length: count }, (_, k) => block.text.slice(block.lineStarts[k], block.lineEnds[k]));
      this.cachedGroup = group;
    }
    return this.cachedLines[lineIndex - (group << GROUP_SHIFT)];
  }

  private byteStartOf(lineIndex: number): number {
    const group = lineIndex >> GROUP_SHIFT;
    const start = this.groupStarts[group];
    const skip = lineIndex - (group << GROUP_SHIFT);
    if (skip === 0) return start;
    const bytes = this.source.slice(start, this.groupEnd(group));
    const breakByte = this.lineEnding === "cr" ? 13 : 10;
    let at = 0;
    for (let k = 0; k < skip; k++) at = bytes.indexOf(breakByte, at) + 1;
    return start + at;
  }

  /** A double quote sits somewhere at or after the start of this line. */
  quotedFrom(lineIndex: number): boolean {
    return this.lastQuoteByte >= 0 && this.lastQuoteByte >= this.byteStartOf(lineIndex);
  }

  /** The text from the start of this line to the end of the file, as one string (the quote-aware reader needs it whole). */
  textFrom(lineIndex: number): string {
    return this.decode(this.source.slice(this.byteStartOf(lineIndex), this.source.byteLength));
  }

  /** Visits the lines from fromLine on in blocks of about a megabyte; the visitor returns false to stop. */
  forEachBlock(fromLine: number, visit: (block: TextBlock) => boolean | void): void {
    const groups = this.groupStarts.length;
    let line = fromLine;
    while (line < this.lineCount) {
      const startByte = this.byteStartOf(line);
      let group = (line >> GROUP_SHIFT) + 1;
      while (group < groups && this.groupStarts[group] - startByte < BLOCK_BYTES) group++;
      const endLine = Math.min(this.lineCount, group << GROUP_SHIFT);
      const endByte = group < groups ? this.groupStarts[group] : this.source.byteLength;
      if (visit(this.split(this.decode(this.source.slice(startByte, endByte)), line, endLine - line)) === false) return;
      line = endLine;
    }
  }
}

/** What one pass over the bytes learns: line starts, line count, the long lines to check once the encoding is known. */
type LineScan = { groupStarts: Float64Array; lineCount: number; longLines: Array<[number, number, number]>; lastQuoteByte: number; sawReplacement: boolean; nonBlank: boolean };

/**
 * One pass over the bytes from bodyStart: indexes the lines, refuses a line longer than MAX_LINE_BYTES
 * bytes at once (ownBytes: the file's own bytes, not UTF-16 re-encoded), notes lines long enough to need the
 * character limits, and (ownBytes) whether UTF-8 decoding met a byte that is not UTF-8.
 */
function scanLines(source: ByteSource, bodyStart: number, breakByte: number, ownBytes: boolean): LineScan {
  const size = source.byteLength;
  const breakChar = String.fromCharCode(breakByte);
  let groupStarts = new Float64Array(1024);
  let lineIndex = 0;
  let lastNonEmpty = -1;
  const longLines: Array<[number, number, number]> = [];
  let lastQuoteByte = -1;
  let sawReplacement = false;
  let nonBlank = !ownBytes;
  let base = bodyStart;
  let carry: Uint8Array = new Uint8Array(0);
  for (;;) {
    const readEnd = Math.min(size, base + carry.length + CHUNK_BYTES);
    const fresh = source.slice(base + carry.length, readEnd);
    let window = fresh;
    if (carry.length > 0) {
      window = new Uint8Array(carry.length + fresh.length);
      window.set(carry);
      window.set(fresh, carry.length);
    }
    const atEnd = readEnd >= size;
    // One character per byte, so character positions are byte positions: lines are found by the fast string search.
    const text = decodeBytewise(window);
    let position = 0;
    for (;;) {
      const next = text.indexOf(breakChar, position);
      if (next < 0 && !atEnd) break;
      const end = next < 0 ? text.length : next;
      const lengthBytes = end - position;
      if (lengthBytes > MAX_LINE_BYTES && ownBytes) throw hugeLine(lineIndex, lineLengthBytes(source, breakByte, base + position, lineIndex));
      if ((lineIndex & ((1 << GROUP_SHIFT) - 1)) === 0) {
        const group = lineIndex >> GROUP_SHIFT;
        if (group === groupStarts.length) {
          const grown = new Float64Array(groupStarts.length * 2);
          grown.set(groupStarts);
          groupStarts = grown;
        }
        groupStarts[group] = base + position;
      }
      if (lengthBytes >= MAX_FIELDS_PER_ROW) longLines.push([lineIndex, base + position, base + end]);
      if (lengthBytes > 1 || (lengthBytes === 1 && (breakByte !== 10 || text.charCodeAt(position) !== 13))) lastNonEmpty = lineIndex;
      lineIndex++;
      position = next < 0 ? text.length : next + 1;
      if (next < 0) break;
    }
    // The finished lines: whether they decode as UTF-8 without a replacement, whether any is not blank, where the last quote sits.
    const done = position === text.length ? text : text.slice(0, position);
    if (ownBytes && /[^\x00-\x7f]/.test(done)) {
      const utf8 = decodeUtf8(window.subarray(0, position));
      sawReplacement ||= utf8.includes("\uFFFD");
      nonBlank ||= utf8.trim() !== "";
    } else if (!nonBlank) {
      nonBlank = done.trim() !== "";
    }
    const quote = done.lastIndexOf('"');
    if (quote >= 0) lastQuoteByte = base + quote;
    if (atEnd) break;
    carry = window.subarray(position);
    if (carry.length > MAX_LINE_BYTES && ownBytes) throw hugeLine(lineIndex, lineLengthBytes(source, breakByte, base + position, lineIndex));
    base += position;
  }
  const lineCount = lastNonEmpty + 1;
  return { groupStarts: groupStarts.slice(0, Math.max(1, (lineCount + (1 << GROUP_SHIFT) - 1) >> GROUP_SHIFT)), lineCount, longLines, lastQuoteByte, sawReplacement, nonBlank };
}

/** Byte length of the line starting at start (line 1 counted from the file's first byte, a byte-order mark included). */
function lineLengthBytes(source: ByteSource, breakByte: number, start: number, lineIndex: number): number {
  const end = findByte(source, breakByte, start);
  return (end < 0 ? source.byteLength : end) - (lineIndex === 0 ? 0 : start);
}

/** Only spaces, tabs, line and form breaks and no-break spaces: blank text in Windows-1252. */
function blankInWindows1252(source: ByteSource, from: number): boolean {
  for (let at = from; at < source.byteLength; at += CHUNK_BYTES) {
    const chunk = source.slice(at, Math.min(source.byteLength, at + CHUNK_BYTES));
    for (let i = 0; i < chunk.length; i++) {
      const b = chunk[i];
      if (b !== 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0b && b !== 0x0c && b !== 0x0d && b !== 0xa0) return false;
    }
  }
  return true;
}

/** Reads the file's encoding and indexes its lines; refuses what is not a text table (empty, binary, over-long lines). */
export function prepareText(source: ByteSource): PreparedText {
  const size = source.byteLength;
  if (size === 0) throw new LoggerFileError("The file is empty (0 bytes)");
  const head = source.slice(0, Math.min(size, 65536));
  if (head[0] === 0xff && head[1] === 0xfe) return prepareUtf16(source);
  const hasLf = findByte(source, 10) >= 0;
  // Lines break at LF, or at CR in a file without any LF; the byte-length limit looks for CR only in its first window.
  const breakByte = !hasLf && findByte(source, 13) >= 0 ? 13 : 10;
  if (!hasLf && breakByte === 10 && size > MAX_LINE_BYTES) throw hugeLine(0, size);
  if (!hasLf && breakByte === 13 && size > MAX_LINE_BYTES && findByte(source, 13, 0, MAX_LINE_BYTES + 1) < 0) throw hugeLine(0, size);
  const bodyStart = head[0] === 0xef && head[1] === 0xbb && head[2] === 0xbf ? 3 : 0;
  const scan = scanLines(source, bodyStart, breakByte, true);
  refuseBinaryHead(head);
  const encoding: TextEncodingName = scan.sawReplacement ? "windows-1252" : bodyStart === 3 ? "utf-8-bom" : "utf-8";
  const blank = encoding === "windows-1252" ? blankInWindows1252(source, bodyStart) : !scan.nonBlank;
  if (blank) throw new LoggerFileError("The file is empty: it holds only blank space");
  const firstLf = hasLf ? findByte(source, 10, bodyStart) : -1;
  const lineEnding: LineEnding = breakByte === 13 ? "cr" : firstLf > bodyStart && source.slice(firstLf - 1, firstLf)[0] === 13 ? "crlf" : "lf";
  checkLongLines(source, scan, encoding === "windows-1252" ? decodeWindows1252 : decodeUtf8, lineEnding);
  return new PreparedText(source, encoding, lineEnding, scan.lineCount, scan.groupStarts, scan.lastQuoteByte);
}

/** The character and field limits, in line order, on the lines long enough to break them. */
function checkLongLines(source: ByteSource, scan: LineScan, decode: (bytes: Uint8Array) => string, lineEnding: LineEnding): void {
  for (const [lineIndex, start, end] of scan.longLines) {
    let line = decode(source.slice(start, end));
    if (lineEnding === "crlf" && line.endsWith("\r")) line = line.slice(0, -1);
    checkLineLimits(line, lineIndex);
  }
}

/** UTF-16 text (rare): decoded whole, then indexed as its UTF-8 bytes so the rest of the reader sees one kind of file. */
function prepareUtf16(source: ByteSource): PreparedText {
  const text = new TextDecoder("utf-16le").decode(source.slice(2, source.byteLength));
  if (text.trim() === "") throw new LoggerFileError("The file is empty: it holds only blank space");
  const utf8 = bytesSource(new TextEncoder().encode(text));
  const firstLf = text.indexOf("\n");
  const cr = firstLf < 0 && text.includes("\r");
  const lineEnding: LineEnding = cr ? "cr" : firstLf > 0 && text.charCodeAt(firstLf - 1) === 13 ? "crlf" : "lf";
  const scan = scanLines(utf8, 0, cr ? 13 : 10, false);
  checkLongLines(utf8, scan, decodeUtf8, lineEnding);
  return new PreparedText(utf8, "utf-16le", lineEnding, scan.lineCount, scan.groupStarts, scan.lastQuoteByte);
}

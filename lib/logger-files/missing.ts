import { LoggerFileError } from "./errors";
import { plural } from "@/lib/domain";

/**
 * Blank cells met while reading, per channel slot (1-based: temperatures, then pressure), and the
 * rows skipped because every channel was blank. A blank cell is a missing reading of that channel
 * at that time, not a broken file (issue 9, rule 4).
 */
export class MissingReadings {
  readonly counts: Int32Array;
  readonly firstLine: Int32Array;
  readonly lastLine: Int32Array;
  skippedRows = 0;
  firstSkippedLine = -1;

  constructor(channelCount: number) {
    this.counts = new Int32Array(channelCount + 1);
    this.firstLine = new Int32Array(channelCount + 1).fill(-1);
    this.lastLine = new Int32Array(channelCount + 1).fill(-1);
  }

  skipRow(lineIndex: number): void {
    if (this.skippedRows === 0) this.firstSkippedLine = lineIndex;
    this.skippedRows++;
  }

  /** Counts the blank cells (NaN) of one stored row. */
  countRow(values: Float64Array, channelCount: number, lineIndex: number): void {
    for (let slot = 1; slot <= channelCount; slot++) {
      if (values[slot] === values[slot]) continue;
      if (this.counts[slot] === 0) this.firstLine[slot] = lineIndex;
      this.counts[slot]++;
      this.lastLine[slot] = lineIndex;
    }
  }

  /**
   * Notes for the reader's warnings; a channel with no reading at all is refused, since it cannot
   * be judged and would silently drop out of every check.
   */
  describe(headerOfSlot: (slot: number) => string, rowCount: number): string[] {
    const notes: string[] = [];
    if (this.skippedRows > 0) {
      const rows = this.skippedRows === 1 ? "1 row" : `${this.skippedRows} rows`;
      notes.push(`Skipped ${rows} where every channel was blank (the first on row ${this.firstSkippedLine + 1})`);
    }
    for (let slot = 1; slot < this.counts.length; slot++) {
      const count = this.counts[slot];
      if (count === 0) continue;
      const header = headerOfSlot(slot);
      if (count >= rowCount) throw new LoggerFileError(`Column "${header}" has no readings: every cell is blank. Map it as ignored, or map another column`);
      const first = this.firstLine[slot] + 1;
      const last = this.lastLine[slot] + 1;
      const where = count === 1 ? `row ${first}` : `rows ${first} to ${last}`;
      notes.push(`Column "${header}": ${plural(count, "blank cell")} (${where}), read as missing readings`);
    }
    return notes;
  }
}

/** A cell holding only spaces, tabs or a carriage return. */
export function isBlankCell(text: string, start: number, end: number): boolean {
  for (let i = start; i < end; i++) {
    const code = text.charCodeAt(i);
    if (code !== 32 && code !== 9 && code !== 13) return false;
  }
  return true;
}

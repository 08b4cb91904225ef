import Papa from "papaparse";
import { rowError, toAbsoluteKpaChannel, toCelsiusChannel, toElapsedSeconds, type RowSource } from "./convert";
import { LoggerFileError } from "./errors";
import { MIN_DATA_ROWS, analyse, type LoggerInput } from "./inspect";
import { MissingReadings, isBlankCell } from "./missing";
import { DECIMAL_CODES, parseDecimal } from "./numbers";
import { MAX_FIELDS_PER_ROW, delimiterName, isBlankLine, lineText, splitFields, type PreparedText, type TableLayout } from "./sniff";
import { cellHasOffset, isoFromSeconds, parseTimeCell, type TimeFormat } from "./time";
import type { MappingOverrides, ReadContext, ReadResult, Recording } from "./types";
import { plural } from "@/lib/domain";

const TIME_FORMAT_WORDS: Record<TimeFormat, string> = {
  iso: "year-month-day hour:minute:second",
  dmy: "day.month.year hour:minute:second",
  mdy: "month/day/year hour:minute:second",
  "mdy-ampm": "month/day/year hour:minute:second AM/PM",
  "dmy-ampm": "day/month/year hour:minute:second AM/PM",
  clock: "hour:minute:second",
  "elapsed-seconds": "elapsed time as a number",
};

type Sink = {
  times: Float64Array;
  channels: Float64Array[];
  count: number;
};

/**
 * Reads the whole file into a recording: times in seconds, temperatures in °C, pressure in kPa
 * absolute; a blank cell is a missing reading (NaN), a row with every channel blank is skipped.
 */
export function readLoggerFile(input: LoggerInput, overrides?: MappingOverrides, context?: ReadContext): ReadResult {
  const { prepared, layout, plan, dialect } = analyse(input, overrides, undefined, context);
  const { lineCount } = prepared;
  const { width, delimiter, headers } = layout;
  const warnings: string[] = [];
  // Local bindings: module imports compiled to CommonJS are getters, too slow for the inner loop.
  const parseNumber = parseDecimal;
  const parseTime = parseTimeCell;
  const decimalCode = DECIMAL_CODES[layout.decimal];
  const delimiterCode = delimiter.charCodeAt(0);

  // slot per field: −1 unused, 0 time, 1… channels (temperatures, then pressure)
  const slotOfField = new Int32Array(width).fill(-1);
  slotOfField[plan.timeIndex] = 0;
  plan.temperatureIndexes.forEach((index, k) => (slotOfField[index] = 1 + k));
  const pressureSlot = 1 + plan.temperatureIndexes.length;
  slotOfField[plan.pressureIndex] = pressureSlot;
  const channelCount = pressureSlot;
  const fieldOfSlot = new Int32Array(channelCount + 1);
  for (let f = 0; f < width; f++) if (slotOfField[f] >= 0) fieldOfSlot[slotOfField[f]] = f;

  const capacity = Math.max(16, lineCount - layout.firstDataLineIndex);
  const sink: Sink = {
    times: new Float64Array(capacity),
    channels: Array.from({ length: channelCount }, () => new Float64Array(capacity)),
    count: 0,
  };
  const sourceLine = new Int32Array(capacity);
  const timeFormat = plan.timeFormat;
  const elapsed = timeFormat === "elapsed-seconds";
  const values = new Float64Array(channelCount + 1);
  const fieldStarts = new Int32Array(width + 1);
  const fieldEnds = new Int32Array(width + 1);
  const missing = new MissingReadings(channelCount);
  let rowBlanks = 0;

  const failRow = (lineIndex: number, message: string): never => {
    throw rowError(lineIndex, message);
  };
  let footerFrom = -1;

  const isFooter = (lineIndex: number): boolean => {
    for (let j = lineIndex; j < lineCount; j++) {
      const line = lineText(prepared, j);
      if (isBlankLine(line, delimiter)) continue;
      const fields = splitFields(line, delimiter);
      const cell = fields[plan.timeIndex] ?? "";
      const t = elapsed ? parseDecimal(cell, 0, cell.length, decimalCode) : parseTimeCell(cell, 0, cell.length, timeFormat);
      if (Number.isFinite(t) && fields.length === width) return false;
    }
    return true;
  };

  /** Parses the cells at fieldStarts/fieldEnds of one line into values[]; returns false when the line is a footer. */
  const parseFields = (lineIndex: number, source: string): boolean => {
    rowBlanks = 0;
    for (let slot = 0; slot <= channelCount; slot++) {
      const f = fieldOfSlot[slot];
      const start = fieldStarts[f];
      const end = fieldEnds[f];
      let v: number;
      if (slot === 0 && !elapsed) v = parseTime(source, start, end, timeFormat);
      else v = parseNumber(source, start, end, decimalCode);
      if (v !== v) {
        if (slot > 0 && isBlankCell(source, start, end)) {
          values[slot] = NaN;
          rowBlanks++;
          continue;
        }
        if (isFooter(lineIndex)) return false;
        const cell = source.slice(start, end).trim();
        const header = headers[f] || `Column ${f + 1}`;
        if (cell === "") failRow(lineIndex, `column "${header}": the cell is empty`);
        if (slot === 0 && !elapsed) failRow(lineIndex, `column "${header}": "${cell}" is not a time written as ${TIME_FORMAT_WORDS[timeFormat]}`);
        failRow(lineIndex, `column "${header}": "${cell}" is not a number`);
      }
      values[slot] = v;
    }
    return true;
  };

  const store = (lineIndex: number) => {
    if (rowBlanks > 0) {
      if (rowBlanks === channelCount) return missing.skipRow(lineIndex);
      missing.countRow(values, channelCount, lineIndex);
    }
    const n = sink.count;
    sink.times[n] = values[0];
    for (let k = 1; k <= channelCount; k++) sink.channels[k - 1][n] = values[k];
    sourceLine[n] = lineIndex;
    sink.count = n + 1;
  };

  if (!layout.dataQuoted) {
    // A block of lines at a time: the file's text never exists whole.
    prepared.forEachBlock(layout.firstDataLineIndex, ({ text, firstLine, lineCount: blockLines, lineStarts, lineEnds }) => {
      for (let k = 0; k < blockLines; k++) {
        const i = firstLine + k;
        const start = lineStarts[k];
        const end = lineEnds[k];
        if (start === end) continue;
        const firstCode = text.charCodeAt(start);
        if ((firstCode === 32 || firstCode === 9 || firstCode === delimiterCode) && isBlankLine(text.slice(start, end), delimiter)) continue;
        let field = 0;
        let fieldStart = start;
        for (;;) {
          let next = text.indexOf(delimiter, fieldStart);
          if (next < 0 || next > end) next = end;
          if (field < width) {
            fieldStarts[field] = fieldStart;
            fieldEnds[field] = next;
          }
          field++;
          if (next === end) break;
          fieldStart = next + 1;
        }
        if (field !== width) {
          if (isFooter(i)) {
            footerFrom = i;
            return false;
          }
          failRow(i, `has ${field} ${delimiterName(delimiter)}-separated fields where the header has ${width}`);
        }
        if (!parseFields(i, text)) {
          footerFrom = i;
          return false;
        }
        store(i);
      }
    });
  } else {
    readQuotedRows(prepared.textFrom(layout.firstDataLineIndex), layout.firstDataLineIndex, delimiter, (i, row, parser) => {
      if (row.every((cell) => cell.trim() === "")) return;
      if (row.length !== width) {
        if (isFooter(i)) {
          footerFrom = i;
          return parser.abort();
        }
        failRow(i, `has ${row.length} ${delimiterName(delimiter)}-separated fields where the header has ${width}`);
      }
      const joined = row.join("\u0000");
      let offset = 0;
      for (let f = 0; f < width; f++) {
        fieldStarts[f] = offset;
        fieldEnds[f] = offset + row[f].length;
        offset += row[f].length + 1;
      }
      if (!parseFields(i, joined)) {
        footerFrom = i;
        return parser.abort();
      }
      store(i);
    });
  }

  const rowCount = sink.count;
  if (footerFrom >= 0) {
    let footerLines = 0;
    for (let j = footerFrom; j < lineCount; j++) if (!isBlankLine(lineText(prepared, j), delimiter)) footerLines++;
    warnings.push(`Ignored ${footerLines} line(s) after the data from line ${footerFrom + 1} ("${lineText(prepared, footerFrom).trim().slice(0, 60)}")`);
  }
  if (rowCount === 0 && missing.skippedRows > 0) throw new LoggerFileError(`Every data row of the file has only blank cells besides the time`);
  if (rowCount === 0) throw new LoggerFileError(`The file has a header (line ${layout.headerLineIndex + 1}) but no data rows below it`);
  if (rowCount < MIN_DATA_ROWS) {
    throw new LoggerFileError(`The file has only ${plural(rowCount, "data row")}; at least ${MIN_DATA_ROWS} are needed to analyse a cycle`);
  }

  const source: RowSource = { sourceLine, cellAt: (lineIndex, field) => cellOf(prepared, layout, lineIndex, field) };
  const rawTimes = sink.times.subarray(0, rowCount);
  const timeHeader = headers[plan.timeIndex];
  const time = { header: timeHeader, field: plan.timeIndex };
  const firstRawTime = rawTimes[0];
  const { timesS, rollovers, repeats } = toElapsedSeconds(rawTimes, elapsed ? plan.elapsedScale : 1, timeFormat, time, source);
  if (rollovers > 0) warnings.push(`The clock times pass midnight ${rollovers} time(s); a day was added at each`);
  if (repeats > 0) warnings.push(`${repeats} row(s) repeat the time of the row before`);
  if (timesS[rowCount - 1] === 0) throw new LoggerFileError(`Column "${timeHeader}": every row has the same time, so the record spans no time`);

  let startedAt: string | null = null;
  if (timeFormat !== "elapsed-seconds" && timeFormat !== "clock") {
    startedAt = isoFromSeconds(firstRawTime, cellHasOffset(cellOf(prepared, layout, sourceLine[0], plan.timeIndex)));
  }

  warnings.push(...missing.describe((slot) => headers[fieldOfSlot[slot]], rowCount));
  const pressureColumn = plan.columns[plan.pressureIndex];
  const pressureReference = plan.pressureReference ?? { kind: "absolute", source: "assumed" };
  if (pressureReference.source === "assumed") {
    warnings.push(
      `The pressure column "${pressureColumn.header}" has no abs/gauge marker, so its readings were taken as absolute pressure. ` +
        "If the logger records gauge pressure, set the pressure reference to gauge (read as absolute, gauge readings sit far below saturated steam and the cycle fails).",
    );
  }

  // Units: temperatures to °C, pressure to kPa absolute.
  const temperatures = plan.temperatureIndexes.map((index, k) => toCelsiusChannel(sink.channels[k], rowCount, plan.columns[index], source));
  const pressureValues = toAbsoluteKpaChannel(sink.channels[pressureSlot - 1], rowCount, pressureColumn, plan.atmosphere.kpa, source, pressureReference.source === "assumed" ? warnings : undefined);

  const recording: Recording = {
    startedAt,
    timesS,
    temperatures,
    pressure: { header: pressureColumn.header, values: pressureValues },
    referenceIndex: plan.referenceIndex,
    freeSpaceIndex: plan.freeSpaceIndex,
    source: { pressureReference, atmosphere: plan.atmosphere, warnings },
  };
  return { recording, dialect, columns: plan.columns, warnings };
}

/**
 * Quote-aware rows, one at a time (Papa's step mode), so the whole table never exists as arrays of strings. A row
 * whose quotes carry it over many lines is refused once it passes MAX_FIELDS_PER_ROW.
 */
function readQuotedRows(body: string, firstLineIndex: number, delimiter: string, onRow: (lineIndex: number, row: string[], parser: Papa.Parser) => void): void {
  // Papa counts rows, not lines; map back through the line breaks each row consumed.
  let lineIndex = firstLineIndex;
  Papa.parse<string[]>(body, {
    delimiter,
    skipEmptyLines: false,
    header: false,
    step: (results, parser) => {
      const row = results.data;
      const i = lineIndex;
      let breaks = 1;
      for (const cell of row) for (let c = cell.indexOf("\n"); c >= 0; c = cell.indexOf("\n", c + 1)) breaks++;
      lineIndex += breaks;
      if (row.length > MAX_FIELDS_PER_ROW) {
        throw rowError(i, `has ${row.length.toLocaleString("en")} fields; Papin reads at most ${MAX_FIELDS_PER_ROW.toLocaleString("en")} fields per row`);
      }
      onRow(i, row, parser);
    },
  });
}

function cellOf(prepared: PreparedText, layout: TableLayout, lineIndex: number, field: number): string {
  return (splitFields(lineText(prepared, lineIndex), layout.delimiter)[field] ?? "").trim();
}

import { LoggerFileError } from "./errors";
import { planColumns, type ColumnPlan } from "./mapping";
import { bytesSource, type ByteSource } from "./lines";
import { findTable, isBlankLine, isDataRow, lineText, prepareText, splitFields, type PreparedText, type TableLayout } from "./sniff";
import type { Dialect, InspectResult, MappingOverrides, ReadContext } from "./types";

const PREVIEW_ROWS = 10;
const MAPPING_SAMPLE_ROWS = 600;
/** A very wide table is sampled on fewer rows, so the sample stays a few hundred thousand cells. */
const MAPPING_SAMPLE_CELLS = 300_000;
export const MIN_DATA_ROWS = 3;

export type Analysed = { prepared: PreparedText; layout: TableLayout; plan: ColumnPlan; dialect: Dialect; preview: string[][] };

function dataLineIndexes(prepared: PreparedText, layout: TableLayout, limit: number): number[] {
  const found: number[] = [];
  for (let i = layout.firstDataLineIndex; i < prepared.lineCount && found.length < limit; i++) {
    if (!isBlankLine(lineText(prepared, i), layout.delimiter)) found.push(i);
  }
  return found;
}

function spreadSample(prepared: PreparedText, layout: TableLayout): string[][] {
  const total = prepared.lineCount - layout.firstDataLineIndex;
  const sampleRows = Math.max(20, Math.min(MAPPING_SAMPLE_ROWS, Math.floor(MAPPING_SAMPLE_CELLS / layout.width)));
  const step = Math.max(1, Math.floor(total / sampleRows));
  const rows: string[][] = [];
  for (let i = layout.firstDataLineIndex; i < prepared.lineCount; i += step) {
    const line = lineText(prepared, i);
    if (isBlankLine(line, layout.delimiter)) continue;
    const fields = splitFields(line, layout.delimiter);
    if (fields.length === layout.width && isDataRow(fields)) rows.push(fields);
  }
  return rows;
}

/** The file's bytes in memory, or a source that reads them piece by piece. */
export type LoggerInput = Uint8Array | ByteSource;

export function analyse(input: LoggerInput, overrides: MappingOverrides = {}, problems?: string[], context: ReadContext = {}): Analysed {
  const isSource = typeof input === "object" && input !== null && typeof (input as ByteSource).slice === "function" && typeof (input as ByteSource).byteLength === "number";
  if (!(input instanceof Uint8Array) && !isSource) throw new LoggerFileError("The logger file must be given as bytes");
  const prepared = prepareText(input instanceof Uint8Array ? bytesSource(input) : input);
  const layout = findTable(prepared);
  const preview = dataLineIndexes(prepared, layout, PREVIEW_ROWS).map((i) => splitFields(lineText(prepared, i), layout.delimiter));
  const plan = planColumns(layout.headers, spreadSample(prepared, layout), layout.decimal, overrides, problems, context);
  const dialect: Dialect = {
    encoding: prepared.encoding,
    delimiter: layout.delimiter,
    decimal: layout.decimal,
    lineEnding: prepared.lineEnding,
    preambleLines: layout.headerLineIndex >= 0 ? layout.headerLineIndex : layout.firstDataLineIndex,
    headerLine: layout.headerLineIndex >= 0 ? layout.headerLineIndex + 1 : null,
    timeFormat: plan.timeFormat,
    quoted: layout.quoted,
  };
  return { prepared, layout, plan, dialect, preview };
}

/** Guesses dialect and mapping from the text without converting the data: cheap enough for every upload. */
export function inspectLoggerFile(bytes: LoggerInput, overrides?: MappingOverrides, context?: ReadContext): InspectResult {
  const problems: string[] = [];
  const { prepared, layout, plan, dialect, preview } = analyse(bytes, overrides, problems, context);
  const preambleEnd = dialect.preambleLines;
  const preamble: string[] = [];
  for (let i = 0; i < preambleEnd; i++) preamble.push(lineText(prepared, i));
  let rowCount = 0;
  prepared.forEachBlock(layout.firstDataLineIndex, (block) => {
    for (let k = 0; k < block.lineCount; k++) if (block.lineEnds[k] > block.lineStarts[k]) rowCount++;
  });
  return {
    dialect,
    columns: plan.columns,
    referenceColumn: plan.referenceIndex >= 0 ? plan.columns[plan.temperatureIndexes[plan.referenceIndex]].header : null,
    freeSpaceColumn: plan.freeSpaceIndex >= 0 ? plan.columns[plan.temperatureIndexes[plan.freeSpaceIndex]].header : null,
    pressureReference: plan.pressureReference,
    problems,
    preview: { header: layout.headers, rows: preview },
    rowCount,
    preamble,
  };
}

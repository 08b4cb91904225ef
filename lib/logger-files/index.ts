export { LoggerFileError } from "./errors";
export { inspectLoggerFile, MIN_DATA_ROWS } from "./inspect";
export { readLoggerFile } from "./read";
export { unitFromHeader, planColumns } from "./mapping";
export { encodeWindows1252, decodeWindows1252 } from "./decode";
export { bytesSource, type ByteSource } from "./lines";
export { parseDecimal } from "./numbers";
export { parseTimeCell, guessTimeFormat } from "./time";
export type {
  AtmosphereUsed,
  ColumnMapping,
  ColumnOverride,
  ColumnRole,
  DecimalMark,
  Delimiter,
  Dialect,
  InspectResult,
  LineEnding,
  MappingOverrides,
  PressureReference,
  ReadContext,
  ReadResult,
  Recording,
  RecordingSource,
  TemperatureChannel,
  TextEncodingName,
  TimeFormat,
} from "./types";

import type { PressureUnit, TemperatureUnit } from "../steam";
import type { TextEncodingName } from "./decode";
import type { TimeFormat } from "./time";

export type { TimeFormat, TextEncodingName };
export type Delimiter = "," | ";" | "\t";
export type DecimalMark = "." | ",";
export type LineEnding = "crlf" | "lf" | "cr";
export type ColumnRole = "time" | "temperature" | "pressure" | "ignored";

export type Dialect = {
  encoding: TextEncodingName;
  delimiter: Delimiter;
  decimal: DecimalMark;
  lineEnding: LineEnding;
  /** lines above the header line (blank lines included) */
  preambleLines: number;
  /** 1-based line number of the header, or null when the file has no header line */
  headerLine: number | null;
  timeFormat: TimeFormat;
  /** some cells are wrapped in double quotes */
  quoted: boolean;
};

export type ColumnMapping = {
  index: number;
  /** trimmed, exactly as in the file ("Column 3" when the file has no header line) */
  header: string;
  role: ColumnRole;
  /**
   * temperature: "C" | "F" | "K"; pressure: a PressureUnit; elapsed time: "s" | "min" | "h" | "ms";
   * null for date-time columns and ignored columns
   */
  unit: string | null;
  /** pressure read as gauge (relative to atmosphere); false for everything else */
  gauge: boolean;
  /** plain reasons why this guess may be wrong; empty when the header said it all */
  unsure: string[];
};

export type ColumnOverride = { role: ColumnRole; unit?: string; gauge?: boolean };

/** A user's corrections to the guessed mapping; JSON-serialisable so it can be stored per instrument. */
export type MappingOverrides = {
  timeColumn?: string;
  pressureColumn?: string;
  pressureUnit?: PressureUnit;
  pressureGauge?: boolean;
  temperatureUnit?: TemperatureUnit;
  referenceColumn?: string;
  columns?: Record<string, ColumnOverride>;
  /** site atmospheric pressure used to make gauge readings absolute; default 101.325 kPa */
  atmosphereKpa?: number;
};

export type TemperatureChannel = { header: string; values: Float64Array };

export type Recording = {
  /** ISO 8601 time of the first sample when the file has absolute times (no zone suffix unless the file gave one) */
  startedAt: string | null;
  /** seconds since the first sample */
  timesS: Float64Array;
  /** °C */
  temperatures: TemperatureChannel[];
  /** kPa absolute */
  pressure: { header: string; values: Float64Array };
  /** index into temperatures of the reference (drain) channel */
  referenceIndex: number;
};

export type InspectResult = {
  dialect: Dialect;
  columns: ColumnMapping[];
  referenceColumn: string | null;
  preview: { header: string[]; rows: string[][] };
  /** data lines below the header (a cheap count; footer lines included) */
  rowCount: number;
  preamble: string[];
  /** what the guess could not settle (no pressure or temperature column found): the user must map it before analysing */
  problems: string[];
};

export type ReadResult = {
  recording: Recording;
  dialect: Dialect;
  columns: ColumnMapping[];
  warnings: string[];
};

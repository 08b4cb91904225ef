import type { PressureUnit, TemperatureUnit } from "../steam";
import type { TextEncodingName } from "./decode";
import type { TimeFormat } from "./time";
import type { ChannelPlacements } from "../domain/sensor-positions";

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
  /** the temperature column of the sensor in free space above the pack (EN 285 small-load test); "" says there is none */
  freeSpaceColumn?: string;
  /** the file may hold only time and chamber pressure (an air leakage test); temperature columns are then optional */
  temperaturesOptional?: boolean;
  /** where each temperature channel's probe sat, by header; not read by the reader, kept with the mapping (and a saved instrument mapping) */
  positions?: ChannelPlacements;
};

/** Whether the chamber pressure was read as absolute or gauge, and who said so. */
export type PressureReference = {
  kind: "absolute" | "gauge";
  /** header: the column's abs/gauge marker; option: the analyze command; user: a confirmed mapping; assumed: nobody, read as absolute */
  source: "header" | "option" | "user" | "assumed";
};

/** The atmospheric pressure added to gauge readings, kPa, and where it came from. */
export type AtmosphereUsed = { kpa: number; source: "option" | "mapping" | "site" | "standard" };

/** Who gave what the reader was told: overrides come from the command's options or a user's mapping. */
export type ReadContext = { overrideSource?: "option" | "user"; atmosphereSource?: AtmosphereUsed["source"] };

/** What the reader decided about the pressure and noticed in the file, carried into the analysis. */
export type RecordingSource = { pressureReference: PressureReference; atmosphere: AtmosphereUsed; warnings: string[] };

/** values: °C, NaN where the cell was blank (a missing reading) */
export type TemperatureChannel = { header: string; values: Float64Array };

export type Recording = {
  /** ISO 8601 time of the first sample when the file has absolute times (no zone suffix unless the file gave one) */
  startedAt: string | null;
  /** seconds since the first sample */
  timesS: Float64Array;
  /** °C */
  temperatures: TemperatureChannel[];
  /** kPa absolute, NaN where the cell was blank */
  pressure: { header: string; values: Float64Array };
  /** index into temperatures of the reference (drain) channel; −1 in a pressure-only record (temperaturesOptional) */
  referenceIndex: number;
  /** index into temperatures of the free-space sensor; absent or −1 when there is none */
  freeSpaceIndex?: number;
  /** set by the reader; a recording built in code has absolute pressure by construction */
  source?: RecordingSource;
};

export type InspectResult = {
  dialect: Dialect;
  columns: ColumnMapping[];
  referenceColumn: string | null;
  freeSpaceColumn: string | null;
  /** null until a pressure column is found; source "assumed" asks the user to confirm absolute or gauge */
  pressureReference: PressureReference | null;
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

import { kpaPerUnit, type PressureUnit, type TemperatureUnit } from "../steam";
import { LoggerFileError } from "./errors";
import type { TimeFormat } from "./time";
import type { ColumnMapping, TemperatureChannel } from "./types";
import { plural, agree } from "@/lib/domain";

/** An error in one row of the file, said with its row number (1-based line) and, usually, its column. */
export function rowError(lineIndex: number, message: string): LoggerFileError {
  return new LoggerFileError(`Row ${lineIndex + 1}${message.startsWith("column") ? ", " : " "}${message}`);
}

/** Where the parsed values came from: the file line of each value, and the trimmed text of any cell. */
export type RowSource = { sourceLine: Int32Array; cellAt: (lineIndex: number, field: number) => string };

/** Times as seconds since the first sample, converted in place, never backwards; clock times that pass midnight gain a day. */
export function toElapsedSeconds(
  rawTimes: Float64Array,
  scale: number,
  timeFormat: TimeFormat,
  time: { header: string; field: number },
  source: RowSource,
): { timesS: Float64Array; rollovers: number; repeats: number } {
  const rowCount = rawTimes.length;
  const timesS = rawTimes;
  const { sourceLine } = source;
  let dayOffset = 0;
  let rollovers = 0;
  let repeats = 0;
  const first = rawTimes[0] * scale;
  let previous = 0;
  for (let n = 0; n < rowCount; n++) {
    let t = rawTimes[n] * scale - first + dayOffset;
    if (t < previous) {
      if (timeFormat === "clock" && previous - t > 43200) {
        dayOffset += 86400;
        t += 86400;
        rollovers++;
      } else {
        const here = source.cellAt(sourceLine[n], time.field);
        const before = source.cellAt(sourceLine[n - 1], time.field);
        throw rowError(sourceLine[n], `column "${time.header}": time goes backwards ("${here}" comes after "${before}" on row ${sourceLine[n - 1] + 1})`);
      }
    } else if (n > 0 && t === previous) {
      repeats++;
    }
    timesS[n] = t;
    previous = t;
  }
  return { timesS, rollovers, repeats };
}

/** One temperature column in °C, converted in place; a reading below absolute zero is refused with its row. */
export function toCelsiusChannel(raw: Float64Array, rowCount: number, column: ColumnMapping, source: RowSource): TemperatureChannel {
  const unit = column.unit as TemperatureUnit;
  const out = raw.length === rowCount ? raw : raw.slice(0, rowCount);
  if (unit === "F") for (let n = 0; n < rowCount; n++) out[n] = ((out[n] - 32) * 5) / 9;
  else if (unit === "K") for (let n = 0; n < rowCount; n++) out[n] = out[n] - 273.15;
  for (let n = 0; n < rowCount; n++) {
    if (out[n] < -273.15) {
      const line = source.sourceLine[n];
      throw rowError(line, `column "${column.header}": "${source.cellAt(line, column.index)}" is below absolute zero in ${unit === "C" ? "°C" : unit === "F" ? "°F" : "K"}`);
    }
  }
  return { header: column.header, values: out };
}

/**
 * The pressure column in kPa absolute, converted in place; a negative absolute pressure is refused
 * with its row. When absolute was only assumed (no marker, nobody said), negative readings are kept
 * and noted in `assumedNotes`: the analysis then flags the cycle rather than refusing the file.
 */
export function toAbsoluteKpaChannel(raw: Float64Array, rowCount: number, column: ColumnMapping, atmosphereKpa: number, source: RowSource, assumedNotes?: string[]): Float64Array {
  const values = raw.length === rowCount ? raw : raw.slice(0, rowCount);
  const scale = kpaPerUnit(column.unit as PressureUnit);
  const offset = column.gauge ? atmosphereKpa : 0;
  let negative = 0;
  let firstNegative = -1;
  for (let n = 0; n < rowCount; n++) {
    const kpa = values[n] * scale + offset;
    if (kpa < 0) {
      if (!assumedNotes) {
        const line = source.sourceLine[n];
        throw rowError(
          line,
          `column "${column.header}": "${source.cellAt(line, column.index)}" ${column.unit}${column.gauge ? " gauge" : ""} is a negative absolute pressure; check the unit and the gauge/absolute setting`,
        );
      }
      if (negative++ === 0) firstNegative = source.sourceLine[n];
    }
    values[n] = kpa;
  }
  if (assumedNotes && negative > 0) {
    assumedNotes.push(
      `${plural(negative, "reading")} of "${column.header}" (the first on row ${firstNegative + 1}) ${agree(negative, "is", "are")} below zero, ` +
        "impossible for an absolute pressure: the logger very likely records gauge pressure. Set the pressure reference to gauge and analyse again",
    );
  }
  return values;
}

import {
  PRESSURE_UNITS,
  STANDARD_ATMOSPHERE_KPA,
  kpaPerUnit,
  parsePressureLabel,
  parseTemperatureUnit,
  saturationTemperatureC,
  toCelsius,
  type PressureUnit,
  type TemperatureUnit,
} from "../steam";
import { LoggerFileError } from "./errors";
import { DECIMAL_CODES, looksNumeric, parseDecimal } from "./numbers";
import { TIME_HEADER_RE, elapsedScaleFromHeader, guessTimeFormat, type TimeFormat } from "./time";
import type { ColumnMapping, ColumnRole, DecimalMark, MappingOverrides } from "./types";

type HeaderUnit =
  | { kind: "temperature"; unit: TemperatureUnit }
  | { kind: "pressure"; unit: PressureUnit; gauge: boolean | null }
  | null;

const BRACKETED = /[([{]([^)\]}]*)[)\]}]\s*$/;

/** Reads a unit from a header such as "TC1 (°C)", "Drain [degC]", "P_chamber_kPa_abs", "Pressure bar(g)". */
export function unitFromHeader(header: string): HeaderUnit {
  const candidates: string[] = [];
  const bracket = BRACKETED.exec(header);
  if (bracket) candidates.push(bracket[1]);
  const tokens = header.replace(BRACKETED, (m) => " " + m).split(/[\s_/]+/).filter(Boolean);
  if (tokens.length >= 2) candidates.push(tokens.slice(-2).join(" "));
  if (tokens.length >= 3) candidates.push(tokens.slice(-3).join(" "));
  if (tokens.length >= 1) candidates.push(tokens[tokens.length - 1]);
  // "Chamber (abs) kPa" and the like: the unit may sit just before a marker.
  const temperatureInline = /(°\s*[CFK]|deg\s*[CF]|℃|℉)(?![a-z])/i.exec(header);
  for (const c of candidates) {
    const t = parseTemperatureUnit(c);
    // A bare "K" or "C" token is too weak on its own unless it stood in brackets.
    if (t && (c === bracket?.[1] || c.length > 1)) return { kind: "temperature", unit: t };
    const p = parsePressureLabel(c);
    if (p) {
      const words = header.toLowerCase();
      let gauge = p.gauge;
      if (gauge === null && /\b(gauge|gage|relative|rel)\b/.test(words)) gauge = true;
      if (gauge === null && /\b(abs|absolute)\b/.test(words)) gauge = false;
      return { kind: "pressure", unit: p.unit, gauge };
    }
  }
  if (temperatureInline) {
    const t = parseTemperatureUnit(temperatureInline[1]);
    if (t) return { kind: "temperature", unit: t };
  }
  return null;
}

const TEMPERATURE_NAME_RE = /temp|^t\s*\d|^tc\s*\d|thermo|probe|sensor|drain|pack|load|ref|chamber|centre|center|top|bottom|free ?space|^ch\s*\d|channel/i;
const PRESSURE_NAME_RE = /press|^p\s*\d*$|^p[\s_-]|druck|vacuum|vac\b/i;
const REFERENCE_NAME_RE = /drain|ref/i;

export type ColumnPlan = {
  columns: ColumnMapping[];
  timeIndex: number;
  timeFormat: TimeFormat;
  /** seconds per unit of an elapsed-time column */
  elapsedScale: number;
  temperatureIndexes: number[];
  pressureIndex: number;
  referenceIndex: number;
  atmosphereKpa: number;
};

function findHeader(headers: string[], name: string, what: string): number {
  const wanted = name.trim();
  let index = headers.indexOf(wanted);
  if (index < 0) index = headers.findIndex((h) => h.toLowerCase() === wanted.toLowerCase());
  if (index < 0) {
    const list = headers.filter((h) => h !== "").map((h) => `"${h}"`).join(", ");
    throw new LoggerFileError(`The ${what} "${wanted}" is not a column of this file; its columns are ${list}`);
  }
  return index;
}

function sampleNumbers(rows: string[][], index: number, decimal: DecimalMark): number[] {
  const code = DECIMAL_CODES[decimal];
  const values: number[] = [];
  for (const row of rows) {
    const cell = row[index];
    if (cell === undefined) continue;
    const v = parseDecimal(cell, 0, cell.length, code);
    if (Number.isFinite(v)) values.push(v);
  }
  return values;
}

/** Mostly numbers: the odd text cell is left for the reader to report with its row. */
function columnIsNumeric(rows: string[][], index: number): boolean {
  let filled = 0;
  let numeric = 0;
  for (const row of rows) {
    const cell = (row[index] ?? "").trim();
    if (cell === "") continue;
    filled++;
    if (looksNumeric(cell)) numeric++;
  }
  return numeric > 0 && numeric >= Math.ceil(filled * 0.6);
}

function columnIsEmpty(rows: string[][], index: number): boolean {
  return rows.every((row) => (row[index] ?? "").trim() === "");
}

function isNonDecreasing(values: number[]): boolean {
  for (let i = 1; i < values.length; i++) if (values[i] < values[i - 1]) return false;
  return values.length > 1;
}

function describeUnit(unit: PressureUnit, gauge: boolean): string {
  return `${unit} ${gauge ? "gauge" : "absolute"}`;
}

/**
 * Guesses each column's role and unit from its header and sample rows, then applies the overrides.
 * The sample rows should be spread over the whole file so that the plateau is among them.
 */
export function planColumns(
  headers: string[],
  sampleRows: string[][],
  decimal: DecimalMark,
  overrides: MappingOverrides = {},
  /** when given, a missing temperature or pressure column is noted here instead of thrown, so a preview can still be shown */
  problems?: string[],
): ColumnPlan {
  const atmosphereKpa = overrides.atmosphereKpa ?? STANDARD_ATMOSPHERE_KPA;
  if (!(atmosphereKpa > 0 && atmosphereKpa < 200)) {
    throw new LoggerFileError(`An atmospheric pressure of ${atmosphereKpa} kPa is not plausible; give it in kPa, e.g. 101.325`);
  }
  const columns: ColumnMapping[] = headers.map((header, index) => ({ index, header, role: "ignored", unit: null, gauge: false, unsure: [] }));
  const overrideFor = new Map<number, NonNullable<MappingOverrides["columns"]>[string]>();
  for (const [name, value] of Object.entries(overrides.columns ?? {})) {
    overrideFor.set(findHeader(headers, name, "mapped column"), value);
  }

  // Time column
  let timeIndex = -1;
  let timeFormat: TimeFormat = "elapsed-seconds";
  let elapsedScale = 1;
  const timeUnsure: string[] = [];
  const forcedTime = overrides.timeColumn !== undefined ? findHeader(headers, overrides.timeColumn, "time column") : [...overrideFor].find(([, o]) => o.role === "time")?.[0];
  const timeFromContent = (index: number): boolean => {
    const cells = sampleRows.map((r) => r[index] ?? "");
    const guess = guessTimeFormat(cells);
    if (guess) {
      timeFormat = guess.format;
      timeUnsure.push(...guess.unsure);
      return true;
    }
    if (columnIsNumeric(sampleRows, index) && isNonDecreasing(sampleNumbers(sampleRows, index, decimal))) {
      timeFormat = "elapsed-seconds";
      const fromHeader = elapsedScaleFromHeader(headers[index]);
      const unitOverride = overrideFor.get(index)?.unit;
      elapsedScale = unitOverride ? elapsedScaleFromHeader(`(${unitOverride})`).scale : fromHeader.scale;
      return true;
    }
    return false;
  };
  if (forcedTime !== undefined) {
    if (!timeFromContent(forcedTime)) {
      const example = sampleRows.find((r) => (r[forcedTime] ?? "").trim() !== "")?.[forcedTime] ?? "";
      throw new LoggerFileError(
        `Column "${headers[forcedTime]}" was given as the time column, but its cells (e.g. "${example.trim()}") are neither date-times, clock times nor rising elapsed seconds`,
      );
    }
    timeIndex = forcedTime;
  } else {
    const looksLikeTimeHeader = (h: string) =>
      (TIME_HEADER_RE.test(h) || /^t\s*([([]\s*(s|sec|min|h|ms)\s*[)\]])?$/i.test(h)) && unitFromHeader(h)?.kind !== "temperature" && unitFromHeader(h)?.kind !== "pressure";
    for (let i = 0; i < headers.length && timeIndex < 0; i++) {
      if (overrideFor.has(i)) continue;
      if (looksLikeTimeHeader(headers[i]) && timeFromContent(i)) timeIndex = i;
    }
    for (let i = 0; i < headers.length && timeIndex < 0; i++) {
      if (overrideFor.has(i)) continue;
      const guess = guessTimeFormat(sampleRows.map((r) => r[i] ?? ""));
      if (guess) {
        timeFormat = guess.format;
        timeUnsure.push(...guess.unsure, "the header does not name it as time; found by its content");
        timeIndex = i;
      }
    }
    if (timeIndex < 0) {
      throw new LoggerFileError(
        "No time column: no header names a time and no column holds date-times, clock times or elapsed seconds; say which column is the time",
      );
    }
  }
  columns[timeIndex].role = "time";
  columns[timeIndex].unit = timeFormat === "elapsed-seconds" ? elapsedScaleFromHeader(headers[timeIndex]).unit : null;
  if (timeFormat === "elapsed-seconds") {
    const u = overrideFor.get(timeIndex)?.unit;
    if (u) columns[timeIndex].unit = elapsedScaleFromHeader(`(${u})`).unit;
    if (!/\(|\[/.test(headers[timeIndex]) && !u) timeUnsure.push("elapsed time without a unit in the header; read as seconds");
  }
  columns[timeIndex].unsure = timeUnsure;

  // Channels
  const forcedPressure = overrides.pressureColumn !== undefined ? findHeader(headers, overrides.pressureColumn, "pressure column") : -1;
  for (const column of columns) {
    if (column.index === timeIndex) continue;
    const o = overrideFor.get(column.index);
    const headerUnit = unitFromHeader(column.header);
    if (o) {
      column.role = o.role === "time" ? "ignored" : o.role;
      if (o.role === "temperature") {
        const u = o.unit ? parseTemperatureUnit(o.unit) : headerUnit?.kind === "temperature" ? headerUnit.unit : "C";
        if (!u) throw new LoggerFileError(`"${o.unit}" is not a temperature unit (use °C, °F or K) for column "${column.header}"`);
        column.unit = u;
      } else if (o.role === "pressure") {
        const p = o.unit ? parsePressureLabel(o.unit) : headerUnit?.kind === "pressure" ? headerUnit : null;
        if (o.unit && !p) throw new LoggerFileError(`"${o.unit}" is not a pressure unit (use kPa, bar, mbar, MPa, Pa, psi, mmHg or inHg) for column "${column.header}"`);
        column.unit = p?.unit ?? null;
        column.gauge = o.gauge ?? p?.gauge ?? false;
        if (o.gauge === undefined && (p?.gauge ?? null) === null) column.unsure.push("gauge-or-absolute");
      }
      continue;
    }
    if (column.index === forcedPressure) {
      column.role = "pressure";
      column.unit = headerUnit?.kind === "pressure" ? headerUnit.unit : null;
      column.gauge = headerUnit?.kind === "pressure" ? headerUnit.gauge ?? false : false;
      if (!(headerUnit?.kind === "pressure" && headerUnit.gauge !== null)) column.unsure.push("gauge-or-absolute");
      continue;
    }
    if (column.header === "" && columnIsEmpty(sampleRows, column.index)) continue;
    if (headerUnit?.kind === "temperature") {
      column.role = "temperature";
      column.unit = headerUnit.unit;
    } else if (headerUnit?.kind === "pressure") {
      column.role = "pressure";
      column.unit = headerUnit.unit;
      column.gauge = headerUnit.gauge ?? false;
      if (headerUnit.gauge === null) column.unsure.push("gauge-or-absolute");
    } else if (columnIsNumeric(sampleRows, column.index)) {
      if (PRESSURE_NAME_RE.test(column.header)) {
        column.role = "pressure";
        column.unsure.push("unit-unknown", "gauge-or-absolute");
      } else if (TEMPERATURE_NAME_RE.test(column.header)) {
        column.role = "temperature";
        column.unsure.push("unit-unknown");
      } else {
        const values = sampleNumbers(sampleRows, column.index, decimal);
        const max = Math.max(...values);
        const min = Math.min(...values);
        const counter = values.length > 1 && values.every((v, i) => Number.isInteger(v) && (i === 0 || v > values[i - 1]));
        if (counter) {
          column.unsure.push("whole numbers that only rise, like a row counter; ignored");
        } else if (values.length > 0 && min > -60 && max < 450 && max - min > 1) {
          column.role = "temperature";
          column.unsure.push("unit-unknown", "the header names no unit or known channel; its values look like temperatures");
        } else {
          column.unsure.push("the header names no unit or known channel; ignored");
        }
      }
    }
  }

  // One chamber pressure
  const pressureColumns = columns.filter((c) => c.role === "pressure");
  let pressure = forcedPressure >= 0 ? columns[forcedPressure] : pressureColumns.find((c) => /chamber|kammer/i.test(c.header)) ?? pressureColumns[0];
  for (const c of pressureColumns) {
    if (c !== pressure) {
      c.role = "ignored";
      c.unsure.push(`another pressure column; "${pressure?.header}" is used as the chamber pressure`);
    }
  }
  const temperatures = columns.filter((c) => c.role === "temperature");
  const noTemperature = "No temperature column: no header carries a temperature unit (°C, °F, K) or a channel name; say which columns are temperatures";
  const noPressure = "No pressure column: no header carries a pressure unit (kPa, bar, mbar, MPa, psi, mmHg) or the word pressure; say which column is the chamber pressure";
  if (temperatures.length === 0 || !pressure) {
    if (!problems) throw new LoggerFileError(temperatures.length === 0 ? noTemperature : noPressure);
    if (temperatures.length === 0) problems.push(noTemperature);
    if (!pressure) problems.push(noPressure);
    if (temperatures.length === 0) {
      return { columns, timeIndex, timeFormat, elapsedScale, temperatureIndexes: [], pressureIndex: pressure?.index ?? -1, referenceIndex: -1, atmosphereKpa };
    }
  }

  // Temperature units
  for (const c of temperatures) {
    if (overrides.temperatureUnit) {
      c.unit = overrides.temperatureUnit;
      c.unsure = c.unsure.filter((u) => u !== "unit-unknown");
      continue;
    }
    if (c.unit !== null) continue;
    const values = sampleNumbers(sampleRows, c.index, decimal);
    const max = values.length ? Math.max(...values) : 0;
    c.unsure = c.unsure.filter((u) => u !== "unit-unknown");
    if (max > 300) {
      c.unit = "K";
      c.unsure.push("no unit in the header; values above 300 read as kelvin");
    } else if (max > 160) {
      c.unit = "F";
      c.unsure.push("no unit in the header; values up to " + max + " read as °F");
    } else {
      c.unit = "C";
      c.unsure.push("no unit in the header; read as °C");
    }
  }

  // Reference channel
  let referenceColumn: ColumnMapping;
  if (overrides.referenceColumn !== undefined) {
    const index = findHeader(headers, overrides.referenceColumn, "reference column");
    if (columns[index].role !== "temperature") {
      throw new LoggerFileError(`The reference column "${headers[index]}" is not a temperature column`);
    }
    referenceColumn = columns[index];
  } else {
    referenceColumn = temperatures.find((c) => REFERENCE_NAME_RE.test(c.header)) ?? temperatures[0];
    if (!REFERENCE_NAME_RE.test(referenceColumn.header)) {
      referenceColumn.unsure.push('no header names the drain or reference point; the first temperature column is taken as the reference');
    }
  }

  if (pressure) resolvePressureUnit(pressure, referenceColumn, sampleRows, decimal, overrides, atmosphereKpa);
  for (const c of columns) c.unsure = c.unsure.filter((u) => u !== "unit-unknown" && u !== "gauge-or-absolute");

  return {
    columns,
    timeIndex,
    timeFormat,
    elapsedScale,
    temperatureIndexes: temperatures.map((c) => c.index),
    pressureIndex: pressure?.index ?? -1,
    referenceIndex: temperatures.indexOf(referenceColumn),
    atmosphereKpa,
  };
}

/**
 * Settles a pressure column's unit and gauge/absolute reading. What the header or the overrides
 * say wins; what they leave open is chosen so that hot samples sit closest to saturated steam.
 */
function resolvePressureUnit(
  pressure: ColumnMapping,
  reference: ColumnMapping,
  sampleRows: string[][],
  decimal: DecimalMark,
  overrides: MappingOverrides,
  atmosphereKpa: number,
): void {
  if (overrides.pressureUnit) {
    pressure.unit = overrides.pressureUnit;
    pressure.unsure = pressure.unsure.filter((u) => u !== "unit-unknown");
  }
  if (overrides.pressureGauge !== undefined) {
    pressure.gauge = overrides.pressureGauge;
    pressure.unsure = pressure.unsure.filter((u) => u !== "gauge-or-absolute");
  }
  const unitOpen = pressure.unit === null || pressure.unsure.includes("unit-unknown");
  const gaugeOpen = pressure.unsure.includes("gauge-or-absolute");
  pressure.unsure = pressure.unsure.filter((u) => u !== "unit-unknown" && u !== "gauge-or-absolute");
  if (!unitOpen && !gaugeOpen) return;

  const code = DECIMAL_CODES[decimal];
  const pairs: Array<[number, number]> = [];
  for (const row of sampleRows) {
    const p = parseDecimal(row[pressure.index] ?? "", 0, (row[pressure.index] ?? "").length, code);
    const t = parseDecimal(row[reference.index] ?? "", 0, (row[reference.index] ?? "").length, code);
    if (!Number.isFinite(p) || !Number.isFinite(t)) continue;
    const tC = toCelsius(t, (reference.unit as TemperatureUnit) ?? "C");
    if (tC >= 105) pairs.push([p, tC]);
  }
  const units: PressureUnit[] = unitOpen ? [...PRESSURE_UNITS] : [pressure.unit as PressureUnit];
  const gauges = gaugeOpen ? [false, true] : [pressure.gauge];
  const anyNegative = sampleRows.some((row) => parseDecimal(row[pressure.index] ?? "", 0, (row[pressure.index] ?? "").length, code) < 0);

  if (pairs.length === 0) {
    if (unitOpen) {
      pressure.unit = "kPa";
      pressure.unsure.push("no unit in the header and no hot samples to judge by; read as kPa");
    }
    if (gaugeOpen) {
      pressure.gauge = anyNegative;
      pressure.unsure.push(anyNegative ? "no abs/gauge marker; negative readings, so read as gauge" : "no abs/gauge marker; read as absolute");
    }
    return;
  }

  let best: { unit: PressureUnit; gauge: boolean; error: number } | null = null;
  for (const unit of units) {
    for (const gauge of gauges) {
      const scale = kpaPerUnit(unit);
      const offset = gauge ? atmosphereKpa : 0;
      const errors: number[] = [];
      let valid = true;
      for (const [p, tC] of pairs) {
        const kpa = p * scale + offset;
        if (!(kpa >= 0.611657 && kpa <= 22064)) {
          valid = false;
          break;
        }
        errors.push(Math.abs(saturationTemperatureC(kpa) - tC));
      }
      if (!valid) continue;
      errors.sort((a, b) => a - b);
      const median = errors[Math.floor(errors.length / 2)];
      // Ties go to absolute and to the order of PRESSURE_UNITS (kPa before the rarer units).
      if (!best || median < best.error - 1e-9) best = { unit, gauge, error: median };
    }
  }
  if (!best) {
    pressure.unit ??= "kPa";
    pressure.unsure.push("no unit or gauge reading puts these values on the saturated-steam line; check the pressure unit");
    return;
  }
  if (gaugeOpen && !unitOpen) {
    // Absolute unless gauge fits clearly better: a marker-less reading is more often absolute.
    const absolute = units.length === 1 ? medianError(pairs, units[0], false, atmosphereKpa) : Infinity;
    if (best.gauge && absolute - best.error < 2) best = { unit: units[0], gauge: false, error: absolute };
  }
  pressure.unit = best.unit;
  pressure.gauge = best.gauge;
  const fit = `hot samples sit ${best.error.toFixed(1)} K (median) from saturated steam when read as ${describeUnit(best.unit, best.gauge)}`;
  if (unitOpen) pressure.unsure.push(`no unit in the header; ${fit}`);
  else pressure.unsure.push(`no abs/gauge marker in the header; ${fit}`);
}

function medianError(pairs: Array<[number, number]>, unit: PressureUnit, gauge: boolean, atmosphereKpa: number): number {
  const scale = kpaPerUnit(unit);
  const errors: number[] = [];
  for (const [p, tC] of pairs) {
    const kpa = p * scale + (gauge ? atmosphereKpa : 0);
    if (!(kpa >= 0.611657 && kpa <= 22064)) return Infinity;
    errors.push(Math.abs(saturationTemperatureC(kpa) - tC));
  }
  errors.sort((a, b) => a - b);
  return errors[Math.floor(errors.length / 2)];
}

export type { ColumnRole };

import { parsePressureLabel, parseTemperatureUnit } from "../steam";
import { columnIsEmpty, columnIsNumeric, findHeader, sampleNumbers } from "./column-samples";
import { LoggerFileError } from "./errors";
import { unitFromHeader, type HeaderUnit } from "./header-units";
import type { ColumnEvidence } from "./time-column";
import type { ColumnMapping, ColumnOverride, DecimalMark } from "./types";

const TEMPERATURE_NAME_RE = /temp|^t\s*\d|^tc\s*\d|thermo|probe|sensor|drain|pack|load|ref|chamber|centre|center|top|bottom|free ?space|^ch\s*\d|channel/i;
const PRESSURE_NAME_RE = /press|^p\s*\d*$|^p[\s_-]|druck|vacuum|vac\b/i;

/**
 * Each column besides time: temperature, pressure or ignored, by the user's override, the named
 * pressure column, the header's unit, the header's name, or else its values.
 */
export function assignChannelRoles(columns: ColumnMapping[], timeIndex: number, forcedPressure: number, evidence: ColumnEvidence): void {
  for (const column of columns) {
    if (column.index === timeIndex) continue;
    const override = evidence.overrideFor.get(column.index);
    const headerUnit = unitFromHeader(column.header);
    if (override) applyOverride(column, override, headerUnit);
    else if (column.index === forcedPressure) markNamedPressure(column, headerUnit);
    else if (!(column.header === "" && columnIsEmpty(evidence.sampleRows, column.index))) guessRole(column, headerUnit, evidence.sampleRows, evidence.decimal);
  }
}

function applyOverride(column: ColumnMapping, o: ColumnOverride, headerUnit: HeaderUnit): void {
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
}

function markNamedPressure(column: ColumnMapping, headerUnit: HeaderUnit): void {
  column.role = "pressure";
  column.unit = headerUnit?.kind === "pressure" ? headerUnit.unit : null;
  column.gauge = headerUnit?.kind === "pressure" ? (headerUnit.gauge ?? false) : false;
  if (!(headerUnit?.kind === "pressure" && headerUnit.gauge !== null)) column.unsure.push("gauge-or-absolute");
}

function guessRole(column: ColumnMapping, headerUnit: HeaderUnit, sampleRows: string[][], decimal: DecimalMark): void {
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
      guessFromValues(column, sampleNumbers(sampleRows, column.index, decimal));
    }
  }
}

/** A numeric column with no telling header: a temperature when its values look like one, else ignored. */
function guessFromValues(column: ColumnMapping, values: number[]): void {
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

/** One chamber pressure: the named one, else one whose header says chamber, else the first; the others are ignored. */
export function chooseChamberPressure(columns: ColumnMapping[], forcedPressure: number): ColumnMapping | undefined {
  const pressureColumns = columns.filter((c) => c.role === "pressure");
  const pressure = forcedPressure >= 0 ? columns[forcedPressure] : (pressureColumns.find((c) => /chamber|kammer/i.test(c.header)) ?? pressureColumns[0]);
  for (const c of pressureColumns) {
    if (c !== pressure) {
      c.role = "ignored";
      c.unsure.push(`another pressure column; "${pressure?.header}" is used as the chamber pressure`);
    }
  }
  return pressure;
}

/** Temperature columns without a unit: the override's unit, else judged by their highest value. */
export function settleTemperatureUnits(temperatures: ColumnMapping[], evidence: ColumnEvidence, unitOverride: string | undefined): void {
  for (const c of temperatures) {
    if (unitOverride) {
      c.unit = unitOverride;
      c.unsure = c.unsure.filter((u) => u !== "unit-unknown");
      continue;
    }
    if (c.unit !== null) continue;
    const values = sampleNumbers(evidence.sampleRows, c.index, evidence.decimal);
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
}

const REFERENCE_NAME_RE = /drain|ref/i;

/** The reference (drain) channel: the named one, else one whose header says drain or reference, else the first temperature. */
export function chooseReference(columns: ColumnMapping[], temperatures: ColumnMapping[], headers: string[], referenceName: string | undefined): ColumnMapping {
  if (referenceName !== undefined) {
    const index = findHeader(headers, referenceName, "reference column");
    if (columns[index].role !== "temperature") {
      throw new LoggerFileError(`The reference column "${headers[index]}" is not a temperature column`);
    }
    return columns[index];
  }
  const referenceColumn = temperatures.find((c) => REFERENCE_NAME_RE.test(c.header)) ?? temperatures[0];
  if (!REFERENCE_NAME_RE.test(referenceColumn.header)) {
    referenceColumn.unsure.push("no header names the drain or reference point; the first temperature column is taken as the reference");
  }
  return referenceColumn;
}

const FREE_SPACE_NAME_RE = /free[\s_-]?space/i;

/** The free-space sensor (EN 285 small-load test): the named one ("" names none), else one whose header says "free space"; never the reference. */
export function chooseFreeSpace(columns: ColumnMapping[], temperatures: ColumnMapping[], headers: string[], freeSpaceName: string | undefined, reference: ColumnMapping): ColumnMapping | null {
  if (freeSpaceName === "") return null;
  if (freeSpaceName !== undefined) {
    const index = findHeader(headers, freeSpaceName, "free-space column");
    if (columns[index].role !== "temperature") throw new LoggerFileError(`The free-space column "${headers[index]}" is not a temperature column`);
    if (columns[index] === reference) throw new LoggerFileError(`"${headers[index]}" cannot be both the reference and the free-space sensor`);
    return columns[index];
  }
  return temperatures.find((c) => c !== reference && FREE_SPACE_NAME_RE.test(c.header)) ?? null;
}

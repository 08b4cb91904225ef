import { STANDARD_ATMOSPHERE_KPA, atmosphereOutOfRange } from "../steam";
import { assignChannelRoles, chooseChamberPressure, chooseFreeSpace, chooseReference, settleTemperatureUnits } from "./channel-roles";
import { findHeader } from "./column-samples";
import { LoggerFileError } from "./errors";
import { decidePressureReference, resolvePressureUnit } from "./pressure-unit";
import { findTimeColumn, markTimeColumn, type ColumnEvidence } from "./time-column";
import type { TimeFormat } from "./time";
import type { AtmosphereUsed, ColumnMapping, ColumnOverride, ColumnRole, DecimalMark, MappingOverrides, PressureReference, ReadContext } from "./types";

export { unitFromHeader } from "./header-units";

export type ColumnPlan = {
  columns: ColumnMapping[];
  timeIndex: number;
  timeFormat: TimeFormat;
  /** seconds per unit of an elapsed-time column */
  elapsedScale: number;
  temperatureIndexes: number[];
  pressureIndex: number;
  referenceIndex: number;
  /** index into the temperature columns of the free-space sensor, −1 when there is none */
  freeSpaceIndex: number;
  atmosphere: AtmosphereUsed;
  /** null when no pressure column was found */
  pressureReference: PressureReference | null;
};

const ATMOSPHERE_WORDS: Record<AtmosphereUsed["source"], string> = {
  option: "The atmospheric pressure given",
  mapping: "The column mapping's atmospheric pressure",
  site: "The site's atmospheric pressure (site settings)",
  standard: "The atmospheric pressure",
};

/** The atmospheric pressure for gauge readings and its source; refused, with its source, outside ATMOSPHERE_RANGE_KPA. */
function settleAtmosphere(overrides: MappingOverrides, context: ReadContext): AtmosphereUsed {
  const given = overrides.atmosphereKpa;
  const atmosphere: AtmosphereUsed = given === undefined ? { kpa: STANDARD_ATMOSPHERE_KPA, source: "standard" } : { kpa: given, source: context.atmosphereSource ?? "mapping" };
  const problem = atmosphereOutOfRange(atmosphere.kpa);
  if (problem) throw new LoggerFileError(`${ATMOSPHERE_WORDS[atmosphere.source]} is refused: ${problem}; give it in kPa, e.g. 101.325`);
  return atmosphere;
}

const NO_TEMPERATURE =
  "No temperature column: no header carries a temperature unit (°C, °F, K) or a channel name; say which columns are temperatures (an air leakage test needs none: register it as that kind)";
const NO_PRESSURE = "No pressure column: no header carries a pressure unit (kPa, bar, mbar, MPa, psi, mmHg) or the word pressure; say which column is the chamber pressure";

/**
 * Guesses each column's role and unit from its header and sample rows, then applies the overrides:
 * time column, channel roles, one chamber pressure, temperature units, reference, pressure unit.
 * The sample rows should be spread over the whole file so that the plateau is among them.
 */
export function planColumns(
  headers: string[],
  sampleRows: string[][],
  decimal: DecimalMark,
  overrides: MappingOverrides = {},
  /** when given, a missing temperature or pressure column is noted here instead of thrown, so a preview can still be shown */
  problems?: string[],
  context: ReadContext = {},
): ColumnPlan {
  const atmosphere = settleAtmosphere(overrides, context);
  const columns: ColumnMapping[] = headers.map((header, index) => ({ index, header, role: "ignored", unit: null, gauge: false, unsure: [] }));
  const overrideFor = new Map<number, ColumnOverride>();
  for (const [name, value] of Object.entries(overrides.columns ?? {})) {
    overrideFor.set(findHeader(headers, name, "mapped column"), value);
  }
  const evidence: ColumnEvidence = { headers, sampleRows, decimal, overrideFor };

  const time = findTimeColumn(evidence, overrides);
  markTimeColumn(columns[time.index], time, overrideFor);
  const forcedPressure = overrides.pressureColumn !== undefined ? findHeader(headers, overrides.pressureColumn, "pressure column") : -1;
  assignChannelRoles(columns, time.index, forcedPressure, evidence);
  const pressure = chooseChamberPressure(columns, forcedPressure);
  const temperatures = columns.filter((c) => c.role === "temperature");
  const pressureReference = pressure ? decidePressureReference(pressure, overrides, overrideFor.get(pressure.index), context.overrideSource ?? "user") : null;
  const plan = { columns, timeIndex: time.index, timeFormat: time.format, elapsedScale: time.elapsedScale, atmosphere, pressureReference };
  const pressureOnly = temperatures.length === 0 && overrides.temperaturesOptional === true;
  if ((temperatures.length === 0 && !pressureOnly) || !pressure) {
    if (!problems) throw new LoggerFileError(temperatures.length === 0 && !pressureOnly ? NO_TEMPERATURE : NO_PRESSURE);
    if (temperatures.length === 0 && !pressureOnly) problems.push(NO_TEMPERATURE);
    if (!pressure) problems.push(NO_PRESSURE);
    if (temperatures.length === 0) return { ...plan, temperatureIndexes: [], pressureIndex: pressure?.index ?? -1, referenceIndex: -1, freeSpaceIndex: -1 };
  }
  if (pressureOnly) {
    resolvePressureUnit(pressure!, null, sampleRows, decimal, overrides, atmosphere.kpa);
    for (const c of columns) c.unsure = c.unsure.filter((u) => u !== "unit-unknown" && u !== "gauge-or-absolute");
    return { ...plan, temperatureIndexes: [], pressureIndex: pressure!.index, referenceIndex: -1, freeSpaceIndex: -1 };
  }

  settleTemperatureUnits(temperatures, evidence, overrides.temperatureUnit);
  const referenceColumn = chooseReference(columns, temperatures, headers, overrides.referenceColumn);
  const freeSpaceColumn = chooseFreeSpace(columns, temperatures, headers, overrides.freeSpaceColumn, referenceColumn);
  if (pressure) resolvePressureUnit(pressure, referenceColumn, sampleRows, decimal, overrides, atmosphere.kpa);
  for (const c of columns) c.unsure = c.unsure.filter((u) => u !== "unit-unknown" && u !== "gauge-or-absolute");
  return {
    ...plan,
    temperatureIndexes: temperatures.map((c) => c.index),
    pressureIndex: pressure?.index ?? -1,
    referenceIndex: temperatures.indexOf(referenceColumn),
    freeSpaceIndex: freeSpaceColumn ? temperatures.indexOf(freeSpaceColumn) : -1,
  };
}

export type { ColumnRole };

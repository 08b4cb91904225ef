import { readFileSync } from "node:fs";
import { DEFAULT_LIMITS, type AcceptanceLimits } from "../analysis";
import type { AnalysisRequest } from "../analysis/analyze";
import { LEAK_FLAGS, THERMOMETRIC_ONLY_FLAGS, parseLeakRequest } from "./air-leakage-arguments";
import { UsageError, numberFlag } from "./flags";

export { UsageError } from "./flags";
import type { MappingOverrides, ReadContext } from "../logger-files";
import { atmosphereAtAltitudeKpa, atmosphereOutOfRange, parsePressureLabel, parseTemperatureUnit } from "../steam";

export const USAGE = `Usage: npm run --silent analyze -- <logger file> --sterilization-temp <°C> --holding-time <s> [options]
       npm run --silent analyze -- <logger file> --test-kind air-leakage [--leak-limit <kPa/min>] [--vacuum-set-point <kPa abs>] [--t1 <s>]

  --test-kind <kind>         thermometric (default) or air-leakage: a vacuum leak test judged from the chamber pressure
                             alone (DOMAIN.md §2.5); the file may hold only time and pressure
Air leakage test:
  --leak-limit <kPa/min>     highest leak rate (p3 − p2) / 10 min (default 0.13, EN 285 / HTM 2010; 1 mmHg/min = 0.1333)
  --vacuum-set-point <kPa>   the evacuation must reach this absolute pressure or below (default 7, EN 285)
  --t1 <s>                   when the valves closed, s since the first sample (default: the deepest vacuum)
  --t2 <s>, --t3 <s>         marked ends of the 5 min wait and of the 10 min test (default t1 + 300 s, t2 + 600 s)
Acceptance limits (thermometric):
  --band <K>                 band width above the sterilization temperature (default 3)
  --max-equilibration <s>    longest equilibration time (default 15)
  --max-spread <K>           largest difference between channels during holding (default 2)
  --saturation-limit <K>     largest |reference − Tsat(pressure)| during the plateau (default 2)
  --f0-reference <°C>        F0 reference temperature (default 121.1)
  --f0-z <K>                 F0 z-value (default 10)
  --plateau <n>              which plateau to analyse when the file holds several (default 1)
  --max-interval <s>         longest interval between samples inside the plateau (default 3× the median interval)
Columns and units:
  --reference <header>       reference (drain) temperature column
  --free-space <header>      the free-space sensor's column (a header containing "free space" is found without it)
  --time-column <header>     time column
  --pressure-column <header> chamber pressure column
  --pressure-unit <unit>     kPa, bar, mbar, MPa, Pa, psi, mmHg, inHg; "bar g", "psig", "kPa abs" also say gauge or absolute
  --pressure-reference <absolute|gauge>
                             how the pressure column reads; without it, the header's abs/gauge marker,
                             else absolute (with a warning)
  --pressure-gauge           the same as --pressure-reference gauge
  --pressure-absolute        the same as --pressure-reference absolute
  --temperature-unit <unit>  °C, °F or K for every temperature column
  --atmosphere <kPa>         atmospheric pressure for gauge readings, 50–110 kPa (default 101.325)
  --altitude <m>             take the atmospheric pressure of the standard atmosphere at this altitude
  --mapping <file.json>      a saved column mapping (JSON)
Prints one JSON object and exits 0 whenever the file could be analysed, pass or fail.`;

/** limits: the thermometric limits (placeholders for an air leakage test); request: what the analysis is asked to do. */
export type Parsed = { file: string; limits: AcceptanceLimits; request: AnalysisRequest; overrides: MappingOverrides; context: ReadContext; plateau: number; help: boolean };

const VALUE_FLAGS = new Set([
  "sterilization-temp",
  "holding-time",
  "band",
  "max-equilibration",
  "max-spread",
  "saturation-limit",
  "f0-reference",
  "f0-z",
  "plateau",
  "reference",
  "time-column",
  "pressure-column",
  "pressure-unit",
  "temperature-unit",
  "atmosphere",
  "altitude",
  "mapping",
  "max-interval",
  "free-space",
  "pressure-reference",
  "test-kind",
  ...LEAK_FLAGS,
]);
const SWITCH_FLAGS = new Set(["pressure-gauge", "pressure-absolute", "help"]);

export function parseArguments(argv: string[]): Parsed {
  const values = new Map<string, string>();
  const switches = new Set<string>();
  const positional: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg === "--") {
      positional.push(...argv.slice(i + 1));
      break;
    }
    if (arg.startsWith("--")) {
      const eq = arg.indexOf("=");
      const name = eq >= 0 ? arg.slice(2, eq) : arg.slice(2);
      if (SWITCH_FLAGS.has(name)) {
        if (eq >= 0) throw new UsageError(`--${name} takes no value`);
        switches.add(name);
        continue;
      }
      if (!VALUE_FLAGS.has(name)) throw new UsageError(`Unknown option --${name} (see --help)`);
      const value = eq >= 0 ? arg.slice(eq + 1) : argv[++i];
      if (value === undefined) throw new UsageError(`--${name} needs a value`);
      if (values.has(name)) throw new UsageError(`--${name} is given twice`);
      values.set(name, value);
    } else if (arg.startsWith("-") && arg.length > 1 && !/^-\d/.test(arg)) {
      if (arg === "-h") {
        switches.add("help");
        continue;
      }
      throw new UsageError(`Unknown option ${arg} (see --help)`);
    } else {
      positional.push(arg);
    }
  }
  const unused: AcceptanceLimits = { ...DEFAULT_LIMITS, sterilizationTempC: 0, holdingTimeS: 0 };
  if (switches.has("help")) {
    return { file: "", limits: unused, request: { kind: "thermometric", limits: unused }, overrides: {}, context: {}, plateau: 0, help: true };
  }
  if (positional.length === 0) throw new UsageError("No logger file given (see --help)");
  if (positional.length > 1) throw new UsageError(`One logger file at a time; got ${positional.length}: ${positional.join(", ")}`);
  const testKind = values.get("test-kind") ?? "thermometric";
  if (testKind !== "thermometric" && testKind !== "air-leakage") throw new UsageError(`--test-kind takes "thermometric" or "air-leakage", not "${testKind}"`);
  const misplaced = [...values.keys()].find((flag) => (testKind === "air-leakage" ? THERMOMETRIC_ONLY_FLAGS.includes(flag) : LEAK_FLAGS.includes(flag)));
  if (misplaced) throw new UsageError(`--${misplaced} does not apply to ${testKind === "air-leakage" ? "an air leakage test" : "a thermometric test (use --test-kind air-leakage)"}`);
  const limits = testKind === "air-leakage" ? unused : thermometricLimits(values);
  const { overrides, atmosphereSource } = readOverrides(values, switches);
  const plateauNumber = numberFlag(values, "plateau", 1);
  if (!Number.isInteger(plateauNumber) || plateauNumber < 1) throw new UsageError(`--plateau needs a whole number from 1, not ${plateauNumber}`);
  const request: AnalysisRequest = testKind === "air-leakage" ? parseLeakRequest(values) : { kind: "thermometric", limits, plateau: plateauNumber - 1 };
  // A leak-test file may hold only time and chamber pressure.
  if (testKind === "air-leakage") overrides.temperaturesOptional = true;
  return { file: positional[0], limits, request, overrides, context: { overrideSource: "option", atmosphereSource }, plateau: plateauNumber - 1, help: false };
}

function thermometricLimits(values: Map<string, string>): AcceptanceLimits {
  const limits: AcceptanceLimits = {
    sterilizationTempC: numberFlag(values, "sterilization-temp"),
    holdingTimeS: numberFlag(values, "holding-time"),
    bandK: numberFlag(values, "band", DEFAULT_LIMITS.bandK),
    maxEquilibrationS: numberFlag(values, "max-equilibration", DEFAULT_LIMITS.maxEquilibrationS),
    maxSpreadK: numberFlag(values, "max-spread", DEFAULT_LIMITS.maxSpreadK),
    saturationLimitK: numberFlag(values, "saturation-limit", DEFAULT_LIMITS.saturationLimitK),
    f0ReferenceC: numberFlag(values, "f0-reference", DEFAULT_LIMITS.f0ReferenceC),
    f0ZK: numberFlag(values, "f0-z", DEFAULT_LIMITS.f0ZK),
  };
  if (values.has("max-interval")) {
    const maxIntervalS = numberFlag(values, "max-interval");
    if (!(maxIntervalS > 0)) throw new UsageError(`--max-interval must be above 0, not ${maxIntervalS}`);
    limits.maxSampleIntervalS = maxIntervalS;
  }
  const positive: Array<["holdingTimeS" | "bandK" | "maxSpreadK" | "saturationLimitK" | "f0ZK", string]> = [
    ["holdingTimeS", "holding-time"],
    ["bandK", "band"],
    ["maxSpreadK", "max-spread"],
    ["saturationLimitK", "saturation-limit"],
    ["f0ZK", "f0-z"],
  ];
  for (const [key, flag] of positive) if (!(limits[key] > 0)) throw new UsageError(`--${flag} must be above 0, not ${limits[key]}`);
  if (limits.maxEquilibrationS < 0) throw new UsageError(`--max-equilibration cannot be negative`);
  if (!(limits.sterilizationTempC >= 100 && limits.sterilizationTempC <= 200)) {
    throw new UsageError(`--sterilization-temp ${limits.sterilizationTempC} °C is outside 100–200 °C; give it in °C`);
  }
  return limits;
}

function readOverrides(values: Map<string, string>, switches: Set<string>): { overrides: MappingOverrides; atmosphereSource: ReadContext["atmosphereSource"] } {
  let overrides: MappingOverrides = {};
  const mappingPath = values.get("mapping");
  if (mappingPath !== undefined) {
    let text: string;
    try {
      text = readFileSync(mappingPath, "utf8");
    } catch {
      throw new UsageError(`Cannot read the mapping file ${mappingPath}`);
    }
    try {
      const parsed: unknown = JSON.parse(text);
      if (typeof parsed !== "object" || parsed === null || Array.isArray(parsed)) throw new Error("not an object");
      overrides = parsed as MappingOverrides;
    } catch {
      throw new UsageError(`The mapping file ${mappingPath} is not a JSON object`);
    }
  }
  const setText = (flag: string, key: "referenceColumn" | "timeColumn" | "pressureColumn" | "freeSpaceColumn") => {
    const v = values.get(flag);
    if (v !== undefined) overrides[key] = v;
  };
  setText("reference", "referenceColumn");
  setText("time-column", "timeColumn");
  setText("pressure-column", "pressureColumn");
  setText("free-space", "freeSpaceColumn");
  const pressureUnit = values.get("pressure-unit");
  if (pressureUnit !== undefined) {
    const label = parsePressureLabel(pressureUnit);
    if (!label) throw new UsageError(`--pressure-unit "${pressureUnit}" is not a pressure unit (kPa, bar, mbar, MPa, Pa, psi, mmHg, inHg)`);
    overrides.pressureUnit = label.unit;
    if (label.gauge !== null) overrides.pressureGauge = label.gauge;
  }
  settlePressureReference(values, switches, overrides, pressureUnit);
  const temperatureUnit = values.get("temperature-unit");
  if (temperatureUnit !== undefined) {
    const unit = parseTemperatureUnit(temperatureUnit);
    if (!unit) throw new UsageError(`--temperature-unit "${temperatureUnit}" is not °C, °F or K`);
    overrides.temperatureUnit = unit;
  }
  return { overrides, atmosphereSource: settleAtmosphere(values, overrides) };
}

/** --pressure-reference, --pressure-gauge, --pressure-absolute and a marker in --pressure-unit must agree; the one given sets overrides.pressureGauge. */
function settlePressureReference(values: Map<string, string>, switches: Set<string>, overrides: MappingOverrides, pressureUnit: string | undefined): void {
  const said: Array<[string, boolean]> = [];
  const reference = values.get("pressure-reference");
  if (reference !== undefined) {
    const kind = reference.trim().toLowerCase();
    if (kind !== "absolute" && kind !== "gauge") throw new UsageError(`--pressure-reference takes "absolute" or "gauge", not "${reference}"`);
    said.push(["--pressure-reference", kind === "gauge"]);
  }
  if (switches.has("pressure-gauge")) said.push(["--pressure-gauge", true]);
  if (switches.has("pressure-absolute")) said.push(["--pressure-absolute", false]);
  if (pressureUnit !== undefined && overrides.pressureGauge !== undefined) said.push([`--pressure-unit "${pressureUnit}"`, overrides.pressureGauge]);
  const clash = said.find(([, gauge]) => gauge !== said[0][1]);
  if (clash) throw new UsageError(`${said[0][0]} and ${clash[0]} contradict each other`);
  if (said.length > 0) overrides.pressureGauge = said[0][1];
}

/** --atmosphere or --altitude (within 50–110 kPa), else the mapping file's value, else the standard atmosphere; returns where it came from. */
function settleAtmosphere(values: Map<string, string>, overrides: MappingOverrides): ReadContext["atmosphereSource"] {
  if (values.has("atmosphere") && values.has("altitude")) throw new UsageError("Give --atmosphere or --altitude, not both");
  if (values.has("atmosphere")) {
    const kpa = numberFlag(values, "atmosphere");
    const problem = atmosphereOutOfRange(kpa);
    if (problem) throw new UsageError(`--atmosphere ${kpa} is refused: ${problem}; give it in kPa`);
    overrides.atmosphereKpa = kpa;
    return "option";
  }
  if (values.has("altitude")) {
    const altitudeM = numberFlag(values, "altitude");
    const kpa = Math.round(atmosphereAtAltitudeKpa(altitudeM) * 1000) / 1000;
    const problem = atmosphereOutOfRange(kpa);
    if (problem) throw new UsageError(`--altitude ${altitudeM} m is refused: ${problem}`);
    overrides.atmosphereKpa = atmosphereAtAltitudeKpa(altitudeM);
    return "option";
  }
  return overrides.atmosphereKpa === undefined ? "standard" : "mapping";
}

import { readFileSync, statSync, writeFileSync } from "node:fs";
import { basename } from "node:path";
import { AnalysisError, DEFAULT_LIMITS, analyzeRecording, type AcceptanceLimits } from "../analysis";
import { LoggerFileError, readLoggerFile, type MappingOverrides } from "../logger-files";
import { SteamRangeError, atmosphereAtAltitudeKpa, parsePressureLabel, parseTemperatureUnit } from "../steam";

export const USAGE = `Usage: npm run --silent analyze -- <logger file> --sterilization-temp <°C> --holding-time <s> [options]

Acceptance limits:
  --band <K>                 band width above the sterilization temperature (default 3)
  --max-equilibration <s>    longest equilibration time (default 15)
  --max-spread <K>           largest difference between channels during holding (default 2)
  --saturation-limit <K>     largest |reference − Tsat(pressure)| during the plateau (default 2)
  --f0-reference <°C>        F0 reference temperature (default 121.1)
  --f0-z <K>                 F0 z-value (default 10)
  --plateau <n>              which plateau to analyse when the file holds several (default 1)
Columns and units:
  --reference <header>       reference (drain) temperature column
  --time-column <header>     time column
  --pressure-column <header> chamber pressure column
  --pressure-unit <unit>     kPa, bar, mbar, MPa, Pa, psi, mmHg, inHg; "bar g", "psig", "kPa abs" also say gauge or absolute
  --pressure-gauge           the pressure column is gauge pressure
  --pressure-absolute        the pressure column is absolute pressure
  --temperature-unit <unit>  °C, °F or K for every temperature column
  --atmosphere <kPa>         atmospheric pressure for gauge readings (default 101.325)
  --altitude <m>             take the atmospheric pressure of the standard atmosphere at this altitude
  --mapping <file.json>      a saved column mapping (JSON)
Prints one JSON object and exits 0 whenever the file could be analysed, pass or fail.`;

/** An error in how the command was called: exit code 2. */
export class UsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "UsageError";
  }
}

type Parsed = { file: string; limits: AcceptanceLimits; overrides: MappingOverrides; plateau: number; help: boolean };

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
]);
const SWITCH_FLAGS = new Set(["pressure-gauge", "pressure-absolute", "help"]);

function numberFlag(values: Map<string, string>, name: string, fallback?: number): number {
  const raw = values.get(name);
  if (raw === undefined) {
    if (fallback === undefined) throw new UsageError(`--${name} is required (see --help)`);
    return fallback;
  }
  const value = Number(raw.replace(",", "."));
  if (raw.trim() === "" || !Number.isFinite(value)) throw new UsageError(`--${name} needs a number, not "${raw}"`);
  return value;
}

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
  if (switches.has("help")) {
    return { file: "", limits: { ...DEFAULT_LIMITS, sterilizationTempC: 0, holdingTimeS: 0 }, overrides: {}, plateau: 0, help: true };
  }
  if (positional.length === 0) throw new UsageError("No logger file given (see --help)");
  if (positional.length > 1) throw new UsageError(`One logger file at a time; got ${positional.length}: ${positional.join(", ")}`);

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
  const positive: Array<[keyof AcceptanceLimits, string]> = [
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
  const setText = (flag: string, key: "referenceColumn" | "timeColumn" | "pressureColumn") => {
    const v = values.get(flag);
    if (v !== undefined) overrides[key] = v;
  };
  setText("reference", "referenceColumn");
  setText("time-column", "timeColumn");
  setText("pressure-column", "pressureColumn");
  const pressureUnit = values.get("pressure-unit");
  if (pressureUnit !== undefined) {
    const label = parsePressureLabel(pressureUnit);
    if (!label) throw new UsageError(`--pressure-unit "${pressureUnit}" is not a pressure unit (kPa, bar, mbar, MPa, Pa, psi, mmHg, inHg)`);
    overrides.pressureUnit = label.unit;
    if (label.gauge !== null) overrides.pressureGauge = label.gauge;
  }
  if (switches.has("pressure-gauge") && switches.has("pressure-absolute")) throw new UsageError("--pressure-gauge and --pressure-absolute contradict each other");
  if (switches.has("pressure-gauge")) overrides.pressureGauge = true;
  if (switches.has("pressure-absolute")) overrides.pressureGauge = false;
  const temperatureUnit = values.get("temperature-unit");
  if (temperatureUnit !== undefined) {
    const unit = parseTemperatureUnit(temperatureUnit);
    if (!unit) throw new UsageError(`--temperature-unit "${temperatureUnit}" is not °C, °F or K`);
    overrides.temperatureUnit = unit;
  }
  if (values.has("atmosphere") && values.has("altitude")) throw new UsageError("Give --atmosphere or --altitude, not both");
  if (values.has("atmosphere")) {
    const kpa = numberFlag(values, "atmosphere");
    if (!(kpa >= 30 && kpa <= 110)) throw new UsageError(`--atmosphere ${kpa} kPa is not a plausible atmospheric pressure (30–110 kPa)`);
    overrides.atmosphereKpa = kpa;
  }
  if (values.has("altitude")) overrides.atmosphereKpa = atmosphereAtAltitudeKpa(numberFlag(values, "altitude"));
  const plateauNumber = numberFlag(values, "plateau", 1);
  if (!Number.isInteger(plateauNumber) || plateauNumber < 1) throw new UsageError(`--plateau needs a whole number from 1, not ${plateauNumber}`);
  return { file: positional[0], limits, overrides, plateau: plateauNumber - 1, help: false };
}

function readBytes(file: string): Uint8Array {
  let size: number;
  try {
    const stat = statSync(file);
    if (stat.isDirectory()) throw new LoggerFileError(`${file} is a folder, not a logger file`);
    size = stat.size;
  } catch (error) {
    if (error instanceof LoggerFileError) throw error;
    throw new LoggerFileError(`Cannot open ${file}: no such file or no permission to read it`);
  }
  if (size > 1024 * 1024 * 1024) throw new LoggerFileError(`${file} is ${Math.round(size / 1048576)} MB, more than the 1 GB a logger file may have`);
  const buffer = readFileSync(file);
  return new Uint8Array(buffer.buffer, buffer.byteOffset, buffer.byteLength);
}

export type AnalyzeRun = { exitCode: number; stdout: string; stderr: string };

/** The analyze command in process: argv in, what it would print and its exit code out (the tests call this). */
export function analyzeCommand(argv: string[]): AnalyzeRun {
  let stdout = "";
  let stderr = "";
  const exitCode = runAnalyze(argv, { out: (text) => (stdout += text), err: (line) => (stderr += line + "\n") });
  return { exitCode, stdout, stderr };
}

/** Runs the analyze command; returns the exit code, writing output through the given functions. */
export function runAnalyze(argv: string[], io: { out: (text: string) => void; err: (line: string) => void }): number {
  try {
    const parsed = parseArguments(argv);
    if (parsed.help) {
      io.out(USAGE + "\n");
      return 0;
    }
    const bytes = readBytes(parsed.file);
    const { recording, dialect, columns, warnings } = readLoggerFile(bytes, parsed.overrides);
    const result = analyzeRecording(recording, parsed.limits, { plateau: parsed.plateau });
    // The contract's fields first, in its order; the rest of the analysis after them.
    const { verdict, plateau, equilibrationTime, holdingTime, saturation, f0, checks, ...rest } = result;
    const output = {
      verdict,
      plateau,
      equilibrationTime,
      holdingTime,
      saturation,
      f0,
      checks,
      ...rest,
      input: {
        file: basename(parsed.file),
        bytes: bytes.length,
        dialect,
        columns,
        atmosphereKpa: parsed.overrides.atmosphereKpa ?? 101.325,
        warnings,
      },
    };
    io.out(JSON.stringify(output) + "\n");
    return 0;
  } catch (error) {
    const oneLine = (message: string) => message.replace(/\s*[\r\n]+\s*/g, " ").trim();
    if (error instanceof UsageError) {
      io.err(`analyze: ${oneLine(error.message)}`);
      return 2;
    }
    if (error instanceof LoggerFileError || error instanceof AnalysisError || error instanceof SteamRangeError) {
      io.err(`analyze: ${oneLine(error.message)}`);
      return 1;
    }
    const message = error instanceof Error ? error.message : String(error);
    io.err(`analyze: internal error: ${oneLine(message)}`);
    return 70;
  }
}

/** When PAPIN_RESOURCE_REPORT names a file, the command writes its peak memory there on exit (used by the benchmark). */
export function reportResourcesOnExit(): void {
  // Read here rather than through lib/env: loading zod would double the command's start-up time.
  // eslint-disable-next-line no-restricted-properties
  const target = process.env.PAPIN_RESOURCE_REPORT;
  if (!target) return;
  process.on("exit", () => {
    const usage = process.resourceUsage();
    writeFileSync(target, JSON.stringify({ maxRssKb: usage.maxRSS, userCpuUs: usage.userCPUTime, systemCpuUs: usage.systemCPUTime }));
  });
}

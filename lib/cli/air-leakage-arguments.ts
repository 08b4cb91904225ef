import type { AnalysisRequest } from "../analysis/analyze";
import type { AirLeakageMarks } from "../analysis/air-leakage-types";
import { AIR_LEAKAGE_TEST } from "../domain/air-leakage";
import { UsageError, numberFlag } from "./flags";

/** Options of `--test-kind air-leakage` only. */
export const LEAK_FLAGS = ["leak-limit", "vacuum-set-point", "t1", "t2", "t3"];

/** Options that only a thermometric analysis reads: refused with an air leakage test rather than ignored. */
export const THERMOMETRIC_ONLY_FLAGS = [
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
  "free-space",
];

/** The air leakage test's limits and marked times from the command line (DOMAIN.md §2.5 defaults). */
export function parseLeakRequest(values: Map<string, string>): Extract<AnalysisRequest, { kind: "air-leakage" }> {
  const maxLeakRateKpaPerMin = numberFlag(values, "leak-limit", AIR_LEAKAGE_TEST.maxLeakRateKpaPerMin);
  const vacuumSetPointKpaAbs = numberFlag(values, "vacuum-set-point", AIR_LEAKAGE_TEST.vacuumSetPointKpaAbs);
  if (!(maxLeakRateKpaPerMin > 0)) throw new UsageError(`--leak-limit must be above 0 kPa/min, not ${maxLeakRateKpaPerMin}`);
  if (!(vacuumSetPointKpaAbs > 0)) throw new UsageError(`--vacuum-set-point must be above 0 kPa abs, not ${vacuumSetPointKpaAbs}`);
  const limits = { maxLeakRateKpaPerMin, vacuumSetPointKpaAbs, ...(values.has("max-interval") ? { maxSampleIntervalS: numberFlag(values, "max-interval") } : {}) };
  let marks: AirLeakageMarks | null = null;
  if (values.has("t1")) {
    marks = { t1S: numberFlag(values, "t1") };
    if (values.has("t2")) marks.t2S = numberFlag(values, "t2");
    if (values.has("t3")) marks.t3S = numberFlag(values, "t3");
  } else if (values.has("t2") || values.has("t3")) {
    throw new UsageError("--t2 and --t3 need --t1 (when the valves closed)");
  }
  return { kind: "air-leakage", limits, marks };
}

import { AIR_LEAKAGE_TEST } from "../domain/air-leakage";
import type { AirLeakageCheck, AirLeakageCheckId, AirLeakageLimits, LeakTimeSource } from "./air-leakage-types";
import { GAP_FACTOR, type RecordGap } from "./types";
import { describeDuration, fmt } from "./words";

export const kpa = (value: number) => `${fmt(value, 2)} kPa`;
export const rate = (value: number) => `${fmt(value, 3)} kPa/min`;
const at = (s: number) => `${describeDuration(Math.round(s * 10) / 10)} after the first sample`;

export const LEAK_CHECK_LABELS: Record<AirLeakageCheckId, string> = {
  "vacuum-reached": "Evacuation reaches the vacuum set point",
  "record-covers-test": "Record covers the wait and the test period",
  "leak-rate": "Leak rate over the 10 min test",
};

/** Where each limit comes from (DOMAIN.md §2.5). */
export function leakCheckBases(limits: AirLeakageLimits): Record<AirLeakageCheckId, string> {
  const profile = "acceptance profile";
  const wait = describeDuration(AIR_LEAKAGE_TEST.waitS);
  const test = describeDuration(AIR_LEAKAGE_TEST.testS);
  const interval = limits.maxSampleIntervalS === undefined ? `${GAP_FACTOR}× the record's median interval` : `${limits.maxSampleIntervalS} s`;
  return {
    "vacuum-reached": `${profile}: ${kpa(limits.vacuumSetPointKpaAbs)} abs or deeper before the hold (EN 285: below 7 kPa abs, from memory)`,
    "record-covers-test": `EN 285 / HTM 2010 timing: ${wait} wait and ${test} test after t1, each ±${AIR_LEAKAGE_TEST.timingToleranceS} s; no interval between samples longer than ${interval}`,
    "leak-rate": `${profile}: (p3 − p2) / 10 min at most ${rate(limits.maxLeakRateKpaPerMin)} (EN 285 / HTM 2010: 0.13 kPa/min; ANSI/AAMI ST8-style: 1 mmHg/min)`,
  };
}

export function vacuumDiagnosis(lowestKpa: number, atS: number, limits: AirLeakageLimits): string {
  return (
    `The evacuation reached only ${kpa(lowestKpa)} abs (${at(atS)}); the test must start from ${kpa(limits.vacuumSetPointKpaAbs)} abs or deeper. ` +
    "From a shallower vacuum the rise says little about leaks: check the vacuum pump, the door seal and the valves, and repeat the test."
  );
}

export function coverageDiagnosis(t1S: number, t3S: number, endS: number, gaps: RecordGap[]): string {
  if (endS < t3S) {
    return (
      `The record ends ${describeDuration(Math.round(endS - t1S))} after t1, before t3 (${describeDuration(Math.round(t3S - t1S))} after t1: the 5 min wait and the 10 min test), ` +
      "so the leak rate cannot be read. Let the logger record until the test has finished and register the whole file."
    );
  }
  const listed = gaps.map((g) => `${g.channel === null ? "no sample" : `no reading of "${g.channel}"`} from ${at(g.start)} to ${at(g.end)}`);
  return `Between t1 and t3 the record has ${gaps.length === 1 ? "a gap" : `${gaps.length} gaps`}: ${listed.join("; ")}. The pressure then cannot be shown, so the test is not judged across ${gaps.length === 1 ? "it" : "them"}.`;
}

export function leakDiagnosis(leakRate: number, limits: AirLeakageLimits): string {
  return (
    `The chamber pressure rose ${rate(leakRate)} over the 10 min test, more than the ${rate(limits.maxLeakRateKpaPerMin)} the profile allows: air leaks into the chamber. ` +
    "Look at the door seal, the valves and any test-sensor entry ports, and repeat the test (with the test sensors removed, if they were fitted)."
  );
}

export function condensateWarning(riseKpa: number): string {
  return (
    `The pressure rose ${kpa(riseKpa)} during the 5 min wait (more than about ${AIR_LEAKAGE_TEST.condensateRiseKpa} kPa): this suggests condensate in the chamber rather than a leak. ` +
    "Dry the chamber and repeat the test."
  );
}

export const PRESSURE_FELL =
  "The pressure fell during the test period. A sealed chamber under vacuum should not lose pressure: check that the chamber temperature was stable, the valves stayed closed and the readings are in order.";

const SOURCE_WORDS: Record<LeakTimeSource, string> = { detected: "found in the trace (the deepest vacuum)", marked: "marked by the user", timed: "by the standard's timing" };

export function timesFinding(t: { t1: number; t2: number; t3: number }, sources: { t1: LeakTimeSource; t2: LeakTimeSource; t3: LeakTimeSource }): string {
  return `t1 ${at(t.t1)}, ${SOURCE_WORDS[sources.t1]}; t2 ${at(t.t2)}, ${SOURCE_WORDS[sources.t2]}; t3 ${at(t.t3)}, ${SOURCE_WORDS[sources.t3]}.`;
}

export function leakSummary(checks: AirLeakageCheck[], leakRate: number | null, lowestKpa: number, limits: AirLeakageLimits): string {
  const failed = checks.filter((c) => !c.passed);
  if (failed.length === 0) {
    return `Pass: after an evacuation to ${kpa(lowestKpa)} abs the chamber pressure rose ${rate(leakRate ?? 0)} over the 10 min test, within the ${rate(limits.maxLeakRateKpaPerMin)} limit.`;
  }
  const reasons = failed.map((c) => {
    if (c.id === "vacuum-reached") return `the evacuation reached only ${kpa(lowestKpa)} abs (set point ${kpa(limits.vacuumSetPointKpaAbs)} abs)`;
    if (c.id === "record-covers-test") return "the record does not cover the wait and the 10 min test";
    return `the leak rate was ${rate(leakRate ?? NaN)} (limit ${rate(limits.maxLeakRateKpaPerMin)})`;
  });
  return `Fail: ${reasons.join("; ")}.`;
}

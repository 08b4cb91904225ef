import { AIR_LEAKAGE_TEST } from "../domain/air-leakage";
import type { Recording, RecordingSource } from "../logger-files/types";
import { judgeLeakRate } from "./air-leakage-rate";
import type { AirLeakageCheck, AirLeakageDiagnosis, AirLeakageLimits, AirLeakageMarks, AirLeakageResult, LeakTimeSource } from "./air-leakage-types";
import { condensateWarning, coverageDiagnosis, LEAK_CHECK_LABELS, leakCheckBases, leakDiagnosis, leakSummary, PRESSURE_FELL, timesFinding, vacuumDiagnosis } from "./air-leakage-words";
import { countMissing, findGaps, medianIntervalS, TIME_TOLERANCE_S, type GapScan } from "./record";
import { AnalysisError, GAP_FACTOR } from "./types";
import { describeDuration, round, seconds } from "./words";

export type AirLeakageOptions = { marks?: AirLeakageMarks | null; engineVersion: string; source: RecordingSource };

type Times = { t1: number; t2: number; t3: number };

/**
 * Judges a logged air leakage test (DOMAIN.md §2.5) from the chamber pressure alone: the deepest
 * vacuum of the evacuation, t1 where the pressure stops falling (or the user's mark), p2 after the
 * 5 min wait, p3 10 min later, and the leak rate (p3 − p2) / 10 min. Temperature channels, if the
 * file has any, are not judged.
 */
export function analyzeAirLeakage(recording: Recording, limits: AirLeakageLimits, options: AirLeakageOptions): AirLeakageResult {
  validateLeakInput(recording, limits);
  const { timesS } = recording;
  const pressure = recording.pressure.values;
  const n = timesS.length;
  const endS = timesS[n - 1];
  const marks = options.marks ?? null;
  if (marks) validateMarks(marks, endS);
  const samplingIntervalS = medianIntervalS(timesS);
  const maxIntervalS = Math.min(GAP_FACTOR * samplingIntervalS, limits.maxSampleIntervalS ?? Infinity);

  const vacuum = deepestVacuum(timesS, pressure, marks ? marks.t1S : Infinity);
  const times: Times = { t1: marks ? marks.t1S : timesS[vacuum.index], t2: 0, t3: 0 };
  times.t2 = marks?.t2S ?? times.t1 + AIR_LEAKAGE_TEST.waitS;
  times.t3 = marks?.t3S ?? times.t2 + AIR_LEAKAGE_TEST.testS;
  const sources = { t1: marks ? "marked" : "detected", t2: marks?.t2S === undefined ? "timed" : "marked", t3: marks?.t3S === undefined ? "timed" : "marked" } as const;

  const read = (t: number) => pressureAt(timesS, pressure, t, maxIntervalS);
  const [p1, p2, p3] = [read(times.t1), read(times.t2), read(times.t3)];
  const scan = gapsInTest(recording, times, endS, maxIntervalS);
  const covered = endS + TIME_TOLERANCE_S >= times.t3 && scan.gaps.length === 0 && p1 !== null && p2 !== null && p3 !== null;
  const judged = covered ? judgeLeakRate({ p1Kpa: p1!, p2Kpa: p2!, p3Kpa: p3!, limitKpaPerMin: limits.maxLeakRateKpaPerMin }) : null;
  const riseKpa = p1 !== null && p2 !== null ? p2 - p1 : null;

  const vacuumPassed = vacuum.kpa <= limits.vacuumSetPointKpaAbs + 1e-9;
  const checks = leakChecks(limits, {
    vacuumKpa: vacuum.kpa,
    vacuumPassed,
    covered,
    coveredS: endS - times.t1,
    neededS: times.t3 - times.t1,
    leakRate: judged?.leakRateKpaPerMin ?? null,
    leakPassed: judged?.passed ?? false,
  });
  const diagnoses: AirLeakageDiagnosis[] = [];
  if (!vacuumPassed) diagnoses.push({ checkId: "vacuum-reached", text: vacuumDiagnosis(vacuum.kpa, timesS[vacuum.index], limits) });
  if (!covered) diagnoses.push({ checkId: "record-covers-test", text: coverageDiagnosis(times.t1, times.t3, endS, scan.gaps) });
  if (judged && !judged.passed) diagnoses.push({ checkId: "leak-rate", text: leakDiagnosis(judged.leakRateKpaPerMin, limits) });

  const warnings: string[] = [];
  const condensateSuspected = riseKpa !== null && riseKpa > AIR_LEAKAGE_TEST.condensateRiseKpa;
  if (condensateSuspected) warnings.push(condensateWarning(riseKpa!));
  if (judged && p3! < p2!) warnings.push(PRESSURE_FELL);
  const verdict = checks.every((c) => c.passed) ? "pass" : "fail";
  const leakRate = judged ? round(judged.leakRateKpaPerMin, 4) : null;
  return {
    kind: "air-leakage",
    engineVersion: options.engineVersion,
    verdict,
    summary: leakSummary(checks, leakRate, vacuum.kpa, limits),
    leakRate,
    p1: roundOrNull(p1),
    p2: roundOrNull(p2),
    p3: roundOrNull(p3),
    t1: round(times.t1, 3),
    t2: round(times.t2, 3),
    t3: round(times.t3, 3),
    timeSources: sources,
    marks,
    vacuum: { lowestKpaAbs: round(vacuum.kpa, 3), atS: round(timesS[vacuum.index], 3) },
    stabilisationRise: roundOrNull(riseKpa),
    condensateSuspected,
    findings: [timesFinding(times, sources as { t1: LeakTimeSource; t2: LeakTimeSource; t3: LeakTimeSource })],
    warnings,
    checks,
    diagnoses,
    pressureChannel: recording.pressure.header,
    limits: { ...limits },
    record: { startedAt: recording.startedAt, samples: n, durationS: round(endS - timesS[0], 3), medianSampleIntervalS: round(samplingIntervalS, 3) },
    input: {
      pressureReference: options.source.pressureReference,
      atmosphere: options.source.atmosphere,
      samplingInterval: round(samplingIntervalS, 3),
      maxIntervalS: round(maxIntervalS, 3),
      gaps: scan.gaps,
      pressureMissing: countMissing(pressure),
      warnings: [...options.source.warnings],
    },
  };
}

const roundOrNull = (v: number | null) => (v === null ? null : round(v, 3));

type Measured = { vacuumKpa: number; vacuumPassed: boolean; covered: boolean; coveredS: number; neededS: number; leakRate: number | null; leakPassed: boolean };

/** The three checks of the test, each "at most" or "at least" its limit, with the limit's source (DOMAIN.md §2.5). */
function leakChecks(limits: AirLeakageLimits, m: Measured): AirLeakageCheck[] {
  const bases = leakCheckBases(limits);
  const check = (id: AirLeakageCheck["id"], rest: Omit<AirLeakageCheck, "id" | "label" | "basis">): AirLeakageCheck => ({ id, label: LEAK_CHECK_LABELS[id], ...rest, basis: bases[id] });
  return [
    check("vacuum-reached", { passed: m.vacuumPassed, measured: round(m.vacuumKpa, 3), limit: limits.vacuumSetPointKpaAbs, comparison: "at-most", unit: "kPa" }),
    check("record-covers-test", { passed: m.covered, measured: round(m.coveredS, 3), limit: round(m.neededS, 3), comparison: "at-least", unit: "s" }),
    check("leak-rate", { passed: m.leakPassed, measured: m.leakRate === null ? null : round(m.leakRate, 4), limit: limits.maxLeakRateKpaPerMin, comparison: "at-most", unit: "kPa/min" }),
  ];
}

function validateLeakInput(recording: Recording, limits: AirLeakageLimits): void {
  const usable = (v: number | undefined) => v === undefined || (Number.isFinite(v) && v > 0);
  for (const name of ["maxLeakRateKpaPerMin", "vacuumSetPointKpaAbs", "maxSampleIntervalS"] as const) {
    if (!usable(limits[name]) || (name !== "maxSampleIntervalS" && limits[name] === undefined)) throw new AnalysisError(`The acceptance limit ${name} = ${limits[name]} is not a usable value`);
  }
  const n = recording.timesS.length;
  if (n < 2) throw new AnalysisError("The recording needs at least two samples");
  if (recording.pressure.values.length !== n) throw new AnalysisError(`The pressure channel has ${recording.pressure.values.length} samples where the time axis has ${n}`);
  if (countMissing(recording.pressure.values) === n) throw new AnalysisError(`The pressure column "${recording.pressure.header}" has no readings, so there is no leak test to judge`);
}

function validateMarks(marks: AirLeakageMarks, endS: number): void {
  const { waitS, testS, timingToleranceS } = AIR_LEAKAGE_TEST;
  if (!(Number.isFinite(marks.t1S) && marks.t1S >= 0)) throw new AnalysisError(`The marked t1 must be a time from the record's start, in seconds, not ${marks.t1S}`);
  if (marks.t1S > endS) throw new AnalysisError(`The marked t1 (${describeDuration(marks.t1S)}) lies after the record's end (${describeDuration(round(endS, 1))})`);
  const offTiming = (from: number, to: number | undefined, nominalS: number) => to !== undefined && !(Math.abs(to - from - nominalS) <= timingToleranceS + TIME_TOLERANCE_S);
  if (offTiming(marks.t1S, marks.t2S, waitS)) {
    throw new AnalysisError(`The marked t2 is ${seconds(round((marks.t2S ?? 0) - marks.t1S, 1))} after t1; the wait is ${waitS} ± ${timingToleranceS} s (DOMAIN §2.5)`);
  }
  const t2 = marks.t2S ?? marks.t1S + waitS;
  if (offTiming(t2, marks.t3S, testS)) {
    throw new AnalysisError(`The marked t3 is ${seconds(round((marks.t3S ?? 0) - t2, 1))} after t2; the test period is ${testS} ± ${timingToleranceS} s (DOMAIN §2.5)`);
  }
}

/** The lowest pressure reading at or before untilS: the end of the evacuation, where the valves close. */
function deepestVacuum(timesS: Float64Array, pressure: Float64Array, untilS: number): { index: number; kpa: number } {
  let index = -1;
  for (let i = 0; i < timesS.length && timesS[i] <= untilS + TIME_TOLERANCE_S; i++) {
    if (pressure[i] === pressure[i] && (index < 0 || pressure[i] < pressure[index])) index = i;
  }
  if (index < 0) throw new AnalysisError("The pressure column has no reading before the marked t1");
  return { index, kpa: pressure[index] };
}

/** The pressure at t, interpolated between the samples around it; null when they lie further apart than maxIntervalS, one is blank, or t is past the record. */
export function pressureAt(timesS: Float64Array, pressure: Float64Array, t: number, maxIntervalS: number): number | null {
  const n = timesS.length;
  if (t < timesS[0] - TIME_TOLERANCE_S || t > timesS[n - 1] + TIME_TOLERANCE_S) return null;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (timesS[mid] <= t) lo = mid;
    else hi = mid;
  }
  if (Math.abs(timesS[lo] - t) <= TIME_TOLERANCE_S) return pressure[lo] === pressure[lo] ? pressure[lo] : null;
  if (Math.abs(timesS[hi] - t) <= TIME_TOLERANCE_S) return pressure[hi] === pressure[hi] ? pressure[hi] : null;
  const span = timesS[hi] - timesS[lo];
  if (span > maxIntervalS + TIME_TOLERANCE_S || pressure[lo] !== pressure[lo] || pressure[hi] !== pressure[hi]) return null;
  return pressure[lo] + ((pressure[hi] - pressure[lo]) * (t - timesS[lo])) / span;
}

/** Gaps in the pressure record between t1 and t3 (temperature channels, if any, are not judged here). */
function gapsInTest(recording: Recording, times: Times, endS: number, maxIntervalS: number): GapScan {
  const { timesS } = recording;
  let from = 0;
  while (from < timesS.length - 1 && timesS[from + 1] <= times.t1 + TIME_TOLERANCE_S) from++;
  let to = from;
  const until = Math.min(times.t3, endS);
  while (to < timesS.length - 1 && timesS[to] < until - TIME_TOLERANCE_S) to++;
  return findGaps({ ...recording, temperatures: [] }, from, to, maxIntervalS);
}

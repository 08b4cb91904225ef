import type { AnalysisInput, Check, Diagnosis } from "./types";

/** The limits of a logged air leakage test, from the acceptance profile (DOMAIN §2.5). */
export type AirLeakageLimits = {
  /** highest leak rate that passes, kPa/min (EN 285: 0.13) */
  maxLeakRateKpaPerMin: number;
  /** the evacuation must reach at least this deep vacuum before the hold, kPa abs (EN 285: below 7) */
  vacuumSetPointKpaAbs: number;
  /** longest interval between samples allowed inside the test, s; without it, 3× the median interval */
  maxSampleIntervalS?: number;
};

/** Times the user marked on the trace, s since the first sample; t2 and t3 default to t1 + 5 min and t2 + 10 min. */
export type AirLeakageMarks = { t1S: number; t2S?: number; t3S?: number };

export type AirLeakageCheckId = "vacuum-reached" | "record-covers-test" | "leak-rate";

export type AirLeakageCheck = Omit<Check, "id" | "unit"> & { id: AirLeakageCheckId; unit: "kPa" | "kPa/min" | "s" };

export type AirLeakageDiagnosis = Omit<Diagnosis, "checkId"> & { checkId: AirLeakageCheckId };

/** How each of t1, t2, t3 was found: from the trace, marked by the user, or by the standard's timing from the one before. */
export type LeakTimeSource = "detected" | "marked" | "timed";

/** The result of a logged air leakage test: `kind` tells it from a thermometric analysis. */
export type AirLeakageResult = {
  kind: "air-leakage";
  engineVersion: string;
  verdict: "pass" | "fail";
  summary: string;
  /** (p3 − p2) / 10 min, kPa/min; null when the record does not reach t3 */
  leakRate: number | null;
  /** kPa abs at t1, t2, t3; null where the record cannot show it */
  p1: number | null;
  p2: number | null;
  p3: number | null;
  /** s since the first sample */
  t1: number;
  t2: number;
  t3: number;
  timeSources: { t1: LeakTimeSource; t2: LeakTimeSource; t3: LeakTimeSource };
  /** the marks the user gave, as given; null when every time was found in the trace */
  marks: AirLeakageMarks | null;
  /** the deepest vacuum of the evacuation before the hold */
  vacuum: { lowestKpaAbs: number; atS: number };
  /** p2 − p1, kPa */
  stabilisationRise: number | null;
  condensateSuspected: boolean;
  /** plain sentences: how t1, t2 and t3 were found */
  findings: string[];
  /** what does not fail the test but needs a look: condensate, a falling pressure */
  warnings: string[];
  checks: AirLeakageCheck[];
  diagnoses: AirLeakageDiagnosis[];
  pressureChannel: string;
  limits: AirLeakageLimits;
  record: { startedAt: string | null; samples: number; durationS: number; medianSampleIntervalS: number };
  input: AnalysisInput;
};

import { AIR_LEAKAGE_TEST } from "../domain/air-leakage";

/** p1, p2, p3 of an air leakage test, kPa abs, and the limit the rate is judged against. */
export type LeakReadings = { p1Kpa: number; p2Kpa: number; p3Kpa: number; limitKpaPerMin: number };

export type LeakRateJudgement = {
  /** (p3 − p2) / 10 min, kPa/min */
  leakRateKpaPerMin: number;
  /** p2 − p1, kPa: the rise during the 5 min wait */
  stabilisationRiseKpa: number;
  /** the rise during the wait exceeds about 2 kPa: condensate rather than a leak (DOMAIN §2.5) */
  condensateSuspected: boolean;
  passed: boolean;
};

// Readings entered in mbar or mmHg come back from unit conversion a few ulps off; a rate that
// equals the limit as written must compare as equal.
const TOLERANCE = 1e-9;

/**
 * The air leakage test's arithmetic, one function for the logged trace and the manual record:
 * rate = (p3 − p2) / 10 min (DOMAIN §2.5 step 5), judged "at most" the limit; the rise p2 − p1
 * over about 2 kPa points to condensate.
 */
export function judgeLeakRate({ p1Kpa, p2Kpa, p3Kpa, limitKpaPerMin }: LeakReadings): LeakRateJudgement {
  const testMin = AIR_LEAKAGE_TEST.testS / 60;
  const leakRateKpaPerMin = (p3Kpa - p2Kpa) / testMin;
  const stabilisationRiseKpa = p2Kpa - p1Kpa;
  return {
    leakRateKpaPerMin,
    stabilisationRiseKpa,
    condensateSuspected: stabilisationRiseKpa > AIR_LEAKAGE_TEST.condensateRiseKpa,
    passed: leakRateKpaPerMin <= limitKpaPerMin + TOLERANCE * Math.max(1, Math.abs(limitKpaPerMin)),
  };
}

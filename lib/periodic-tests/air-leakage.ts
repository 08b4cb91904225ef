import { convertPressure, type PressureUnit } from "@/lib/steam";
import { judgeLeakRate } from "@/lib/analysis/air-leakage-rate";
import { AIR_LEAKAGE } from "./limits";

export type AirLeakageInput = {
  /** absolute chamber pressure when the valves closed and the pump stopped */
  p1: number;
  /** after the 5 min wait */
  p2: number;
  /** after a further 10 min */
  p3: number;
  unit: PressureUnit;
};

export type AirLeakageResult = {
  p1Kpa: number;
  p2Kpa: number;
  p3Kpa: number;
  /** (p3 − p2) / 10 min */
  leakRateKpaPerMin: number;
  /** the same rate in the unit the readings were entered in, per minute */
  leakRatePerMinInUnit: number;
  limitKpaPerMin: number;
  limitPerMinInUnit: number;
  /** p2 − p1 */
  stabilisationRiseKpa: number;
  condensateSuspected: boolean;
  passed: boolean;
  warnings: string[];
  basis: string;
};

export function evaluateAirLeakage(input: AirLeakageInput): AirLeakageResult {
  const toKpa = (v: number) => convertPressure(v, input.unit, "kPa");
  const p1Kpa = toKpa(input.p1);
  const p2Kpa = toKpa(input.p2);
  const p3Kpa = toKpa(input.p3);
  for (const [name, v] of [
    ["p1", p1Kpa],
    ["p2", p2Kpa],
    ["p3", p3Kpa],
  ] as const) {
    if (v < 0) throw new RangeError(`${name} is negative: enter absolute pressures (a vacuum is a small positive absolute value).`);
  }
  // The same arithmetic as a logged trace (lib/analysis/air-leakage-rate.ts): one rate, one comparison.
  const { leakRateKpaPerMin, stabilisationRiseKpa, condensateSuspected, passed } = judgeLeakRate({ p1Kpa, p2Kpa, p3Kpa, limitKpaPerMin: AIR_LEAKAGE.maxLeakRateKpaPerMin });
  const warnings: string[] = [];
  if (condensateSuspected) {
    warnings.push(
      `The pressure rose ${stabilisationRiseKpa.toFixed(2)} kPa during the 5 min wait (more than ${AIR_LEAKAGE.condensateRiseKpa} kPa): this suggests condensate in the chamber rather than a leak. Dry the chamber and repeat the test.`,
    );
  }
  if (p1Kpa > AIR_LEAKAGE.startBelowKpaAbs) {
    warnings.push(`The test started at ${p1Kpa.toFixed(2)} kPa abs; it normally starts from a deep vacuum below ${AIR_LEAKAGE.startBelowKpaAbs} kPa abs. Check that the readings are absolute.`);
  }
  if (p3Kpa < p2Kpa) {
    warnings.push("The pressure fell during the test period. A sealed chamber under vacuum should not lose pressure: check the chamber temperature was stable and the readings are in order.");
  }
  return {
    p1Kpa,
    p2Kpa,
    p3Kpa,
    leakRateKpaPerMin,
    leakRatePerMinInUnit: convertPressure(leakRateKpaPerMin, "kPa", input.unit),
    limitKpaPerMin: AIR_LEAKAGE.maxLeakRateKpaPerMin,
    limitPerMinInUnit: convertPressure(AIR_LEAKAGE.maxLeakRateKpaPerMin, "kPa", input.unit),
    stabilisationRiseKpa,
    condensateSuspected,
    passed,
    warnings,
    basis: AIR_LEAKAGE.basis,
  };
}

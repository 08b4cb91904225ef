import { AIR_LEAKAGE_TEST } from "@/lib/domain/air-leakage";

/**
 * Limits of the periodic tests, each with the basis a reader sees beside the result.
 * Figures and tags follow DOMAIN.md §2.5, §2.7 and §2.8.
 */
export const AIR_LEAKAGE = {
  /** kPa/min over the 10 min test period */
  maxLeakRateKpaPerMin: AIR_LEAKAGE_TEST.maxLeakRateKpaPerMin,
  /** a rise above this during the 5 min wait points to condensate rather than a leak */
  condensateRiseKpa: AIR_LEAKAGE_TEST.condensateRiseKpa,
  /** deep-vacuum level the test normally starts from */
  startBelowKpaAbs: AIR_LEAKAGE_TEST.vacuumSetPointKpaAbs,
  stabilisationMin: AIR_LEAKAGE_TEST.waitS / 60,
  testPeriodMin: AIR_LEAKAGE_TEST.testS / 60,
  basis: "EN 285 / HTM 2010 air leakage test: rise ≤ 0.13 kPa/min (1.3 mbar/min) over 10 min after a 5 min wait",
  condensateBasis: "A rise of more than about 2 kPa during the 5 min wait suggests condensate in the chamber (common practice; verify locally)",
} as const;

export const NON_CONDENSABLE_GAS = {
  maxPercent: 3.5,
  basis: "EN 285 / HTM 2010 steam quality: ≤ 3.5 ml of gas per 100 ml of condensate",
} as const;

export const SUPERHEAT = {
  maxK: 25,
  basis: "EN 285 / HTM 2010 steam quality: superheat of the expanded steam ≤ 25 K above the local boiling point",
} as const;

export const DRYNESS = {
  minMetal: 0.95,
  minOther: 0.9,
  /** kJ/(kg·K), specific heat capacity of water as the method states it */
  waterHeatCapacity: 4.18,
  /** kJ/K, effective heat capacity of the flask and fittings (an apparatus constant) */
  flaskHeatCapacity: 0.24,
  basis: "EN 285 / HTM 2010 dryness value: ≥ 0.95 for metal loads, ≥ 0.90 for other loads (calorimetric method)",
} as const;

export const BOWIE_DICK = {
  basis: "EN 285 steam penetration test (ISO 11140-3 indicator): a uniform colour change over the whole sheet passes",
} as const;

// EN 13060 type B: the hollow load test with a helix process challenge device (EN 867-5), from memory.
export const HOLLOW_LOAD = {
  basis: "EN 13060 hollow load test (helix process challenge device, EN 867-5 indicator): a uniform colour change of the whole strip passes",
} as const;

// Readings entered in mbar or mmHg come back from unit conversion a few ulps off; a result that
// equals the limit as written must compare as equal.
const TOLERANCE = 1e-9;
export const atMost = (value: number, limit: number) => value <= limit + TOLERANCE * Math.max(1, Math.abs(limit));
export const atLeast = (value: number, limit: number) => value >= limit - TOLERANCE * Math.max(1, Math.abs(limit));

/**
 * The air leakage (vacuum leak) test's figures, DOMAIN.md §2.5, each with its source tag: [found]
 * seen in a document, [memory] common practice from general knowledge. One home for them: the
 * logged analysis, the manual record, the profile form and the basis minimums all read these.
 */
export const AIR_LEAKAGE_TEST = {
  /** the wait after the valves close, s: 5 min (300 ± 10 s) [found: a sterilizer manual, HTM 2010 quoted] */
  waitS: 300,
  /** the test period after the wait, s: 10 min (600 ± 10 s) [found: same] */
  testS: 600,
  /** how far a marked t2 or t3 may sit from the nominal timing, s (DOMAIN §2.5: 300 ± 10 s, 600 ± 10 s) */
  timingToleranceS: 10,
  /** EN 285 / HTM 2010: at most 0.13 kPa/min (1.3 mbar/min) over the 10 min [found: HTM 2010 quoted] */
  maxLeakRateKpaPerMin: 0.13,
  /** EN 285: the deep vacuum the test starts from, below 7 kPa abs [memory; HTM 2010 about 4 kPa] */
  vacuumSetPointKpaAbs: 7,
  /** a rise above this during the 5 min wait suggests condensate rather than a leak, kPa [memory; verify] */
  condensateRiseKpa: 2,
} as const;

/** 1 mmHg in kPa: 101.325 / 760 (standard atmosphere = 760 mmHg, DOMAIN.md §4). */
export const MMHG_KPA = 101.325 / 760;

/** Leak-rate limits a profile may start from: the EN 285 figure, or the ANSI/AAMI ST8-style 1 mmHg/min (DOMAIN §2.5, [memory]). */
export const LEAK_LIMIT_PRESETS = [
  { label: "0.13 kPa/min (EN 285 / HTM 2010)", kpaPerMin: AIR_LEAKAGE_TEST.maxLeakRateKpaPerMin },
  { label: "1 mmHg/min (ANSI/AAMI ST8-style)", kpaPerMin: +MMHG_KPA.toFixed(4) },
] as const;

/** A leak rate as a technician reads it: "0.100 kPa/min". */
export function formatLeakRate(kpaPerMin: number | null | undefined): string {
  if (kpaPerMin === null || kpaPerMin === undefined || !Number.isFinite(kpaPerMin)) return "—";
  const text = kpaPerMin.toFixed(3);
  return `${text.startsWith("-") ? `\u2212${text.slice(1)}` : text} kPa/min`;
}

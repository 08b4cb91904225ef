import { DEFAULT_FREE_SPACE, GAP_FACTOR, type AcceptanceLimits, type CheckId } from "./types";
import { round } from "./words";

/** How each check reads in the result (the labels name the passing condition). */
export const CHECK_LABELS: Record<CheckId, string> = {
  "plateau-reached": "Reference reaches the sterilization temperature",
  "record-complete": "Record without gaps during the plateau",
  "equilibration-time": "Equilibration time",
  "holding-time": "Holding time",
  band: "All temperatures within the band during holding",
  "saturation-band": "Saturation temperature from the chamber pressure within the band during holding",
  spread: "Spread between channels during holding",
  saturation: "Reference agrees with saturated steam",
  "free-space": "Free-space sensor no hotter than allowed above the reference",
};

/** Where each check's limit comes from, in plain words. */
export function checkBases(limits: AcceptanceLimits): Record<CheckId, string> {
  const profile = "acceptance profile";
  const ts = limits.sterilizationTempC;
  const freeSpace = freeSpaceLimits(limits);
  return {
    "plateau-reached": `${profile}: sterilization temperature ${ts} °C, the lower limit of the band`,
    "record-complete":
      limits.maxSampleIntervalS === undefined
        ? `no interval between samples inside the plateau longer than ${GAP_FACTOR}× the record's median interval (common practice)`
        : `${profile}: no interval between samples inside the plateau longer than ${limits.maxSampleIntervalS} s, or ${GAP_FACTOR}× the record's median interval when that is shorter`,
    "equilibration-time": `${profile}: at most ${limits.maxEquilibrationS} s (EN 285 sets 15 s for chambers up to 800 l, 30 s above)`,
    "holding-time": `${profile}: at least ${limits.holdingTimeS} s at or above ${ts} °C (EN 285 minimums: 15 min at 121 °C, 10 min at 126 °C, 3 min at 134 °C)`,
    band: `${profile}: band ${ts} to ${round(bandTopC(limits), 3)} °C, Ts + ${limits.bandK} K (EN 285 band width 3 K)`,
    "saturation-band": `${profile}: band ${ts} to ${round(bandTopC(limits), 3)} °C, for Tsat(chamber pressure) as for every probe (EN 285)`,
    spread: `${profile}: at most ${limits.maxSpreadK} K between channels at any instant during holding (EN 285)`,
    saturation: `${profile}: reference within ±${limits.saturationLimitK} K of the saturation temperature at the chamber pressure (IAPWS-IF97) throughout the plateau period, up to the exhaust (EN 285)`,
    "free-space": `${profile}: the free-space sensor at most ${freeSpace.earlyK} K above the reference in the plateau's first ${freeSpace.earlyS} s and ${freeSpace.laterK} K after (EN 285 small-load test)`,
  };
}

/** The top of the sterilization band, °C. */
export const bandTopC = (limits: AcceptanceLimits) => limits.sterilizationTempC + limits.bandK;

/** The free-space limits of a profile, its defaults filled in. */
export function freeSpaceLimits(limits: AcceptanceLimits): { earlyK: number; earlyS: number; laterK: number } {
  return {
    earlyK: limits.freeSpaceEarlyK ?? DEFAULT_FREE_SPACE.freeSpaceEarlyK,
    earlyS: limits.freeSpaceEarlyS ?? DEFAULT_FREE_SPACE.freeSpaceEarlyS,
    laterK: limits.freeSpaceK ?? DEFAULT_FREE_SPACE.freeSpaceK,
  };
}

import type { AcceptanceLimits, CheckId } from "./types";
import { round } from "./words";

/** How each check reads in the result (the labels name the passing condition). */
export const CHECK_LABELS: Record<CheckId, string> = {
  "plateau-reached": "Reference reaches the sterilization temperature",
  "equilibration-time": "Equilibration time",
  "holding-time": "Holding time",
  band: "All temperatures within the band during holding",
  spread: "Spread between channels during holding",
  saturation: "Reference agrees with saturated steam",
};

/** Where each check's limit comes from, in plain words. */
export function checkBases(limits: AcceptanceLimits): Record<CheckId, string> {
  const profile = "acceptance profile";
  const ts = limits.sterilizationTempC;
  return {
    "plateau-reached": `${profile}: sterilization temperature ${ts} °C, the lower limit of the band`,
    "equilibration-time": `${profile}: at most ${limits.maxEquilibrationS} s (EN 285 sets 15 s for chambers up to 800 l, 30 s above)`,
    "holding-time": `${profile}: at least ${limits.holdingTimeS} s at or above ${ts} °C (EN 285 minimums: 15 min at 121 °C, 10 min at 126 °C, 3 min at 134 °C)`,
    band: `${profile}: band ${ts} to ${round(bandTopC(limits), 3)} °C, Ts + ${limits.bandK} K (EN 285 band width 3 K)`,
    spread: `${profile}: at most ${limits.maxSpreadK} K between channels at any instant during holding (EN 285)`,
    saturation: `${profile}: reference within ±${limits.saturationLimitK} K of the saturation temperature at the chamber pressure (IAPWS-IF97) throughout the plateau (EN 285)`,
  };
}

/** The top of the sterilization band, °C. */
export const bandTopC = (limits: AcceptanceLimits) => limits.sterilizationTempC + limits.bandK;

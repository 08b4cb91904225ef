import { CHECK_LABELS, bandTopC, freeSpaceLimits } from "./checks";
import type { AcceptanceLimits, Check, CheckId } from "./types";
import { describeDuration, fmt, round, seconds } from "./words";

// How each failed check reads in the one-line summary (the labels name the passing condition).
const FAILURE_WORDS: Partial<Record<CheckId, string>> = {
  "plateau-reached": "the reference did not reach the sterilization temperature",
  "record-complete": "the record has gaps during the plateau",
  "equilibration-time": "equilibration took too long or cannot be shown",
  "holding-time": "the holding time was too short",
  band: "a temperature left the sterilization band during holding",
  "saturation-band": "the saturation temperature of the chamber pressure left the band during holding",
  spread: "the channels differed too much during holding",
  saturation: "the reference did not follow saturated steam",
  "free-space": "the free-space sensor read too far above the reference",
};

export type PassFigures = { startS: number; equilibrationTime: number | null; holdingTime: number | null; largestDeviationK: number; freeSpace?: boolean };

/** Pass only when every check passed; the summary names the figures of a pass or every failure. */
export function decideVerdict(checks: Check[], limits: AcceptanceLimits, figures: PassFigures): { verdict: "pass" | "fail"; summary: string } {
  const verdict = checks.every((c) => c.passed) ? "pass" : "fail";
  if (verdict === "fail") {
    const failed = checks.filter((c) => !c.passed).map((c) => FAILURE_WORDS[c.id] ?? c.label.toLowerCase());
    return { verdict, summary: `Fail: ${failed.join("; ")}.` };
  }
  const summary =
    `Pass: plateau from ${seconds(round(figures.startS, 1))}, equilibration ${seconds(round(figures.equilibrationTime ?? 0, 1))}, holding ${describeDuration(round(figures.holdingTime ?? 0, 1))}; ` +
    `every ${figures.freeSpace ? "load " : ""}channel stayed within ${limits.sterilizationTempC}–${round(bandTopC(limits), 3)} °C and the reference followed saturated steam within ${fmt(figures.largestDeviationK, 2)} K.`;
  return { verdict, summary };
}

/** Without a plateau nothing after it can be measured: each of those checks fails with no figure. */
export function unmeasuredChecks(limits: AcceptanceLimits, bases: Record<CheckId, string>, gapLimitS: number, freeSpace: boolean): Check[] {
  const unmeasured: Array<readonly [CheckId, Check["unit"], Check["comparison"], number]> = [
    ["record-complete", "s", "at-most", gapLimitS],
    ["equilibration-time", "s", "at-most", limits.maxEquilibrationS],
    ["holding-time", "s", "at-least", limits.holdingTimeS],
    ["band", "°C", "at-most", bandTopC(limits)],
    ["saturation-band", "°C", "at-least", limits.sterilizationTempC],
    ["spread", "K", "at-most", limits.maxSpreadK],
    ["saturation", "K", "at-most", limits.saturationLimitK],
  ];
  if (freeSpace) unmeasured.push(["free-space", "K", "at-most", freeSpaceLimits(limits).laterK]);
  return unmeasured.map(([id, unit, comparison, limit]) => ({
    id,
    label: CHECK_LABELS[id],
    passed: false,
    measured: null,
    limit: round(limit, 3),
    comparison,
    unit,
    basis: bases[id],
  }));
}

export function noPlateauSummary(limits: AcceptanceLimits, peakC: number): string {
  return `Fail: the reference never reached ${limits.sterilizationTempC} °C (highest ${fmt(peakC, 2)} °C).`;
}

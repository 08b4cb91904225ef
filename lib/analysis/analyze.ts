import type { Recording } from "../logger-files/types";
import { channelSummaries, checkBand, checkSpread, measureHold } from "./band-spread";
import { bandTopC, checkBases } from "./checks";
import { checkEquilibration, timePlateau } from "./equilibration";
import { channelLethalities } from "./f0";
import { checkHolding } from "./holding";
import { choosePlateau, findPlateaus, noPlateauDiagnosis, plateauCheck, referencePeak, type PlateauSpan } from "./plateau";
import { checkSaturation, scanSaturation } from "./saturation";
import type { AcceptanceLimits, AnalysisResult, CheckId } from "./types";
import { validateLimits, validateRecording } from "./validate";
import { decideVerdict, noPlateauSummary, unmeasuredChecks } from "./verdict";
import { round } from "./words";

export { findPlateaus, PLATEAU_REARM_K } from "./plateau";
export { saturationTemperatureSeries } from "./saturation";

export const ENGINE_VERSION = "papin-analysis 1.0.0";

/** What every result carries, plateau or not, in the order the result lists it. */
type Common = Pick<AnalysisResult, "f0" | "referenceChannel" | "pressureChannel" | "limits" | "record"> & {
  f0Values: number[];
  bases: Record<CheckId, string>;
  peak: { maxC: number; atS: number };
  plateausFound: number;
};

/**
 * Analyses one plateau of a recording against the acceptance limits (DESIGN.md "The analysis"), in
 * steps: plateau, equilibration, holding, band and spread, saturation, F0, verdict.
 */
export function analyzeRecording(recording: Recording, limits: AcceptanceLimits, options: { plateau?: number } = {}): AnalysisResult {
  validateLimits(limits);
  validateRecording(recording);
  const { timesS, temperatures, referenceIndex } = recording;
  const f0Values = channelLethalities(temperatures, timesS, limits.f0ReferenceC, limits.f0ZK);
  const f0: Record<string, number> = {};
  temperatures.forEach((c, k) => (f0[c.header] = round(f0Values[k], 4)));
  const record = describeRecord(recording);
  const plateaus = findPlateaus(temperatures[referenceIndex].values, limits.sterilizationTempC);
  const wanted = choosePlateau(plateaus, options.plateau);
  const common: Common = {
    f0,
    f0Values,
    referenceChannel: temperatures[referenceIndex].header,
    pressureChannel: recording.pressure.header,
    limits: { ...limits },
    record,
    bases: checkBases(limits),
    peak: referencePeak(recording),
    plateausFound: plateaus.length,
  };
  if (plateaus.length === 0) return noPlateauResult(recording, limits, common);
  return plateauResult(recording, limits, plateaus[wanted], wanted, common);
}

/** The record's size and pace: samples, duration and the median interval between samples (of at most ~1000 intervals). */
function describeRecord(recording: Recording): AnalysisResult["record"] {
  const { timesS } = recording;
  const n = timesS.length;
  const intervals: number[] = [];
  const step = Math.max(1, Math.floor(n / 1000));
  for (let i = step; i < n; i += step) intervals.push(timesS[i] - timesS[i - 1]);
  intervals.sort((a, b) => a - b);
  return {
    startedAt: recording.startedAt,
    samples: n,
    durationS: round(timesS[n - 1] - timesS[0], 3),
    medianSampleIntervalS: round(intervals[Math.floor(intervals.length / 2)] ?? 0, 3),
  };
}

function noPlateauResult(recording: Recording, limits: AcceptanceLimits, common: Common): AnalysisResult {
  const ts = limits.sterilizationTempC;
  return {
    engineVersion: ENGINE_VERSION,
    verdict: "fail",
    summary: noPlateauSummary(limits, common.peak.maxC),
    plateau: null,
    plateausFound: 0,
    plateauIndex: null,
    equilibrationTime: null,
    holdingTime: null,
    saturation: { maxDeviation: null, lowestDeviation: null, highestDeviation: null, flags: [] },
    f0: common.f0,
    checks: [plateauCheck(0, common.peak.maxC, ts, common.bases["plateau-reached"]), ...unmeasuredChecks(limits, common.bases)],
    referenceChannel: common.referenceChannel,
    pressureChannel: common.pressureChannel,
    channels: channelSummaries(recording, common.f0Values, [], null),
    saturationTemperatureDuringHold: null,
    diagnoses: [noPlateauDiagnosis(common.referenceChannel, ts, common.peak)],
    limits: common.limits,
    record: common.record,
  };
}

function plateauResult(recording: Recording, limits: AcceptanceLimits, span: PlateauSpan, wanted: number, common: Common): AnalysisResult {
  const { bases } = common;
  const timing = timePlateau(recording, span, limits.sterilizationTempC);
  const channels = channelSummaries(recording, common.f0Values, timing.arrivals, timing.startS);
  const extremes = measureHold(recording, timing, channels);
  const scan = scanSaturation(recording, timing, limits);
  const steps = [
    { check: plateauCheck(common.plateausFound, common.peak.maxC, limits.sterilizationTempC, bases["plateau-reached"]), diagnoses: [] },
    checkEquilibration(recording, timing, limits, bases["equilibration-time"]),
    checkHolding(recording, timing, limits, bases["holding-time"]),
    checkBand(extremes, bandTopC(limits), bases.band),
    checkSpread(extremes, limits, bases.spread),
    checkSaturation(scan, limits, bases.saturation),
  ];
  const checks = steps.map((step) => step.check);
  const { equilibrationTime, holdingTime } = timing;
  const { verdict, summary } = decideVerdict(checks, limits, { startS: timing.startS, equilibrationTime, holdingTime, largestDeviationK: scan.largest });
  return {
    engineVersion: ENGINE_VERSION,
    verdict,
    summary,
    plateau: { start: round(timing.startS, 3), end: round(recording.timesS[timing.plateauEndIndex], 3) },
    plateausFound: common.plateausFound,
    plateauIndex: wanted,
    equilibrationTime: equilibrationTime === null ? null : round(equilibrationTime, 3),
    holdingTime: holdingTime === null ? null : round(holdingTime, 3),
    saturation: { maxDeviation: round(scan.largest, 3), lowestDeviation: round(scan.lowest, 3), highestDeviation: round(scan.highest, 3), flags: scan.flags },
    f0: common.f0,
    checks,
    referenceChannel: common.referenceChannel,
    pressureChannel: common.pressureChannel,
    channels,
    saturationTemperatureDuringHold: scan.duringHold,
    diagnoses: steps.flatMap((step) => step.diagnoses),
    limits: common.limits,
    record: common.record,
  };
}

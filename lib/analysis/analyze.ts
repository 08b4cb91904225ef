import type { Recording, RecordingSource } from "../logger-files/types";
import { STANDARD_ATMOSPHERE_KPA } from "../steam";
import { analyzeAirLeakage } from "./air-leakage";
import type { AirLeakageLimits, AirLeakageMarks } from "./air-leakage-types";
import { channelSummaries, checkBand, checkSpread, measureHold } from "./band-spread";
import { bandTopC, checkBases } from "./checks";
import { checkEquilibration, timePlateau } from "./equilibration";
import { channelLethalities } from "./f0";
import { checkFreeSpace } from "./free-space";
import { checkHolding } from "./holding";
import { choosePlateau, findPlateaus, noPlateauDiagnosis, plateauCheck, referencePeak, type PlateauSpan } from "./plateau";
import { checkRecordComplete, countMissing, findGaps, gapsOutsideNote, recordPace, type Pace } from "./record";
import { checkSaturation, scanSaturation } from "./saturation";
import { checkSaturationBand } from "./saturation-band";
import type { FlagWords } from "./saturation-words";
import type { AcceptanceLimits, AnalysisInput, AnalysisResult, Check, CheckId, CycleAnalysis, Diagnosis } from "./types";
import { validateLimits, validateRecording } from "./validate";
import { decideVerdict, noPlateauSummary, unmeasuredChecks } from "./verdict";
import { round } from "./words";

export { findPlateaus, PLATEAU_REARM_K } from "./plateau";
export { saturationTemperatureSeries } from "./saturation";

export const ENGINE_VERSION = "papin-analysis 2.0.0";

/** What every result carries, plateau or not, in the order the result lists it. */
type Common = Pick<AnalysisResult, "f0" | "referenceChannel" | "pressureChannel" | "limits" | "record"> & {
  f0Values: number[];
  bases: Record<CheckId, string>;
  peak: { maxC: number; atS: number };
  plateausFound: number;
  pace: Pace;
  source: RecordingSource;
  words: FlagWords;
};

/** A recording built in code (not read from a file) has absolute pressure by construction, but nobody said so. */
const UNSTATED_SOURCE: RecordingSource = {
  pressureReference: { kind: "absolute", source: "assumed" },
  atmosphere: { kpa: STANDARD_ATMOSPHERE_KPA, source: "standard" },
  warnings: [],
};

/** Which analysis a cycle gets: the plateau analysis, or the air leakage test's (issue 10, item 6). */
export type AnalysisRequest = { kind: "thermometric"; limits: AcceptanceLimits; plateau?: number } | { kind: "air-leakage"; limits: AirLeakageLimits; marks?: AirLeakageMarks | null };

/** The kind switch: each test kind judged on its own terms. */
export function analyzeCycleRecording(recording: Recording, request: AnalysisRequest): CycleAnalysis {
  if (request.kind === "air-leakage") {
    return analyzeAirLeakage(recording, request.limits, { marks: request.marks, engineVersion: ENGINE_VERSION, source: recording.source ?? UNSTATED_SOURCE });
  }
  return analyzeRecording(recording, request.limits, { plateau: request.plateau });
}

/**
 * Analyses one plateau of a recording against the acceptance limits (DESIGN.md "The analysis"), in
 * steps: record pace, plateau, equilibration, holding, band and spread, saturation, F0, verdict.
 */
export function analyzeRecording(recording: Recording, limits: AcceptanceLimits, options: { plateau?: number } = {}): AnalysisResult {
  validateLimits(limits);
  validateRecording(recording);
  const { timesS, temperatures, referenceIndex } = recording;
  const pace = recordPace(timesS, limits);
  const f0Values = channelLethalities(temperatures, timesS, limits.f0ReferenceC, limits.f0ZK, pace.maxIntervalS);
  const f0: Record<string, number> = {};
  temperatures.forEach((c, k) => (f0[c.header] = round(f0Values[k], 4)));
  const plateaus = findPlateaus(temperatures[referenceIndex].values, limits.sterilizationTempC);
  const wanted = choosePlateau(plateaus, options.plateau);
  const source = recording.source ?? UNSTATED_SOURCE;
  const common: Common = {
    f0,
    f0Values,
    referenceChannel: temperatures[referenceIndex].header,
    pressureChannel: recording.pressure.header,
    limits: { ...limits },
    record: describeRecord(recording, pace),
    bases: checkBases(limits),
    peak: referencePeak(recording),
    plateausFound: plateaus.length,
    pace,
    source,
    words: { reference: temperatures[referenceIndex].header, pressureReference: source.pressureReference, atmosphere: source.atmosphere },
  };
  if (plateaus.length === 0) return noPlateauResult(recording, limits, common);
  return plateauResult(recording, limits, plateaus[wanted], wanted, common);
}

/** The record's size and pace: samples, duration and the median interval between samples. */
function describeRecord(recording: Recording, pace: Pace): AnalysisResult["record"] {
  const { timesS } = recording;
  const n = timesS.length;
  return { startedAt: recording.startedAt, samples: n, durationS: round(timesS[n - 1] - timesS[0], 3), medianSampleIntervalS: round(pace.samplingIntervalS, 3) };
}

/** How the record was read and what it holds: stated beside the checks by the command, the record page and the report. */
function describeInput(recording: Recording, common: Common, gaps: AnalysisInput["gaps"], notes: Array<string | null>): AnalysisInput {
  const { source, pace } = common;
  return {
    pressureReference: source.pressureReference,
    atmosphere: source.atmosphere,
    samplingInterval: round(pace.samplingIntervalS, 3),
    maxIntervalS: round(pace.maxIntervalS, 3),
    gaps,
    pressureMissing: countMissing(recording.pressure.values),
    warnings: [...source.warnings, ...notes.filter((n): n is string => n !== null)],
  };
}

function noPlateauResult(recording: Recording, limits: AcceptanceLimits, common: Common): AnalysisResult {
  const ts = limits.sterilizationTempC;
  const freeSpace = (recording.freeSpaceIndex ?? -1) >= 0;
  return {
    kind: "thermometric",
    engineVersion: ENGINE_VERSION,
    verdict: "fail",
    summary: noPlateauSummary(limits, common.peak.maxC),
    plateau: null,
    plateauPeriod: null,
    plateausFound: 0,
    plateauIndex: null,
    equilibrationTime: null,
    holdingTime: null,
    saturation: { maxDeviation: null, lowestDeviation: null, highestDeviation: null, flags: [] },
    f0: common.f0,
    checks: [plateauCheck(0, common.peak.maxC, ts, common.bases["plateau-reached"]), ...unmeasuredChecks(limits, common.bases, common.pace.maxIntervalS, freeSpace)],
    referenceChannel: common.referenceChannel,
    pressureChannel: common.pressureChannel,
    channels: channelSummaries(recording, common.f0Values, [], null),
    saturationTemperatureDuringHold: null,
    diagnoses: [noPlateauDiagnosis(common.referenceChannel, ts, common.peak)],
    limits: common.limits,
    record: common.record,
    input: describeInput(recording, common, [], []),
  };
}

function plateauResult(recording: Recording, limits: AcceptanceLimits, span: PlateauSpan, wanted: number, common: Common): AnalysisResult {
  const { bases, pace, words } = common;
  const { timesS } = recording;
  const timing = timePlateau(recording, span, limits.sterilizationTempC, pace);
  // The record must speak for the whole plateau period and the hold, whichever ends later.
  const judgedEnd = Math.max(timing.periodEndIndex, timing.holdEnd);
  const gapScan = findGaps(recording, timing.startIndex, judgedEnd, pace.maxIntervalS);
  const channels = channelSummaries(recording, common.f0Values, timing.arrivals, timing.startS);
  const extremes = measureHold(recording, timing, channels);
  const scan = scanSaturation(recording, timing, limits, words);
  const freeSpace = checkFreeSpace(recording, timing, limits, bases["free-space"]);
  const steps: Array<{ check: Check; diagnoses: Diagnosis[] }> = [
    { check: plateauCheck(common.plateausFound, common.peak.maxC, limits.sterilizationTempC, bases["plateau-reached"]), diagnoses: [] },
    checkRecordComplete(gapScan, pace, bases["record-complete"]),
    checkEquilibration(recording, timing, limits, bases["equilibration-time"]),
    checkHolding(recording, timing, limits, bases["holding-time"]),
    checkBand(extremes, bandTopC(limits), bases.band),
    checkSaturationBand(scan, limits, words, bases["saturation-band"]),
    checkSpread(extremes, limits, bases.spread),
    checkSaturation(scan, limits, bases.saturation),
    ...(freeSpace ? [freeSpace] : []),
  ];
  const checks = steps.map((step) => step.check);
  const { equilibrationTime, holdingTime } = timing;
  const { verdict, summary } = decideVerdict(checks, limits, { startS: timing.startS, equilibrationTime, holdingTime, largestDeviationK: scan.largest, freeSpace: freeSpace !== null });
  return {
    kind: "thermometric",
    engineVersion: ENGINE_VERSION,
    verdict,
    summary,
    plateau: { start: round(timing.startS, 3), end: round(timesS[timing.plateauEndIndex], 3) },
    plateauPeriod: { start: round(timing.startS, 3), end: round(timesS[timing.periodEndIndex], 3) },
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
    input: describeInput(recording, common, gapScan.gaps, [gapsOutsideNote(timesS, timing.startIndex, judgedEnd, pace.maxIntervalS)]),
  };
}

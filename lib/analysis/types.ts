import type { AtmosphereUsed, PressureReference } from "../logger-files/types";
import type { AirLeakageResult } from "./air-leakage-types";

export type AcceptanceLimits = {
  /** Ts: lower limit of the sterilization band, °C */
  sterilizationTempC: number;
  /** minimum holding time, s */
  holdingTimeS: number;
  /** width of the band above Ts, K */
  bandK: number;
  /** longest allowed equilibration time, s */
  maxEquilibrationS: number;
  /** largest allowed difference between channels at one instant during holding, K */
  maxSpreadK: number;
  /** largest allowed |reference − Tsat(chamber pressure)| during the plateau, K */
  saturationLimitK: number;
  /** F0 reference temperature, °C */
  f0ReferenceC: number;
  /** F0 z-value, K */
  f0ZK: number;
  /** longest interval between samples allowed inside the plateau, s; without it, 3× the median interval */
  maxSampleIntervalS?: number;
  /** free-space sensor: largest excess over the reference in the plateau's first freeSpaceEarlyS, K (default 5) */
  freeSpaceEarlyK?: number;
  /** free-space sensor: how long the early allowance lasts from the plateau start, s (default 60) */
  freeSpaceEarlyS?: number;
  /** free-space sensor: largest excess over the reference after that, K (default 2) */
  freeSpaceK?: number;
};

/** EN 285 figures where the standard sets them, US/PDA practice for F0 (DOMAIN.md §2.3, §3). */
export const DEFAULT_LIMITS = {
  bandK: 3,
  maxEquilibrationS: 15,
  maxSpreadK: 2,
  saturationLimitK: 2,
  f0ReferenceC: 121.1,
  f0ZK: 10,
} as const satisfies Omit<AcceptanceLimits, "sterilizationTempC" | "holdingTimeS">;

/** EN 285 small-load test: the free-space sensor may exceed the reference by 5 K in the plateau's first 60 s, 2 K after (DOMAIN.md §2.3 e, from memory). */
export const DEFAULT_FREE_SPACE = { freeSpaceEarlyK: 5, freeSpaceEarlyS: 60, freeSpaceK: 2 } as const;

/** A gap is an interval over this many times the median sampling interval (issue 9, rule 3). */
export const GAP_FACTOR = 3;

/**
 * Comparisons against Ts and the band edges allow this much, K: a reading of exactly 249.98 °F is
 * 121.1 °C, but (249.98 − 32) × 5/9 comes out 121.09999999999998 in binary floating point.
 */
export const EDGE_TOLERANCE_K = 1e-6;

export type CheckId = "plateau-reached" | "record-complete" | "equilibration-time" | "holding-time" | "band" | "saturation-band" | "spread" | "saturation" | "free-space";

export type Check = {
  id: CheckId;
  label: string;
  passed: boolean;
  /** null when the figure could not be measured (e.g. no plateau) */
  measured: number | null;
  limit: number | null;
  /** "at-most": measured ≤ limit passes; "at-least": measured ≥ limit passes */
  comparison: "at-most" | "at-least";
  unit: "s" | "K" | "°C";
  /** where the limit comes from, in plain words */
  basis: string;
};

export type SaturationFlag = {
  /** seconds since the first sample */
  start: number;
  end: number;
  durationS: number;
  kind: "below" | "above";
  /** the deviation (reference − Tsat) of largest size in the span, K, signed: negative = below (colder than saturated steam), positive = above */
  worst: number;
  diagnosis: string;
};

export type ChannelSummary = {
  header: string;
  /** free-space: the sensor above the pack, judged by its own check and left out of equilibration, holding, band and spread */
  role: "reference" | "load" | "free-space";
  /** blank cells of this channel in the whole record */
  missing: number;
  minDuringHold: number | null;
  maxDuringHold: number | null;
  meanDuringHold: number | null;
  /** minutes at the F0 reference temperature */
  f0: number;
  /** seconds since the first sample when the channel first reached Ts in this plateau; null if never */
  firstArrival: number | null;
  /** seconds after the plateau start; null if never */
  arrivalAfterPlateauStart: number | null;
};

export type Diagnosis = { checkId: CheckId; text: string };

/** A stretch the record cannot speak for: no row (channel null) or no reading of one channel, s since the first sample. */
export type RecordGap = { start: number; end: number; durationS: number; channel: string | null };

/** What the record brings and how it was read: what the record and report state beside the checks. */
export type AnalysisInput = {
  pressureReference: PressureReference;
  /** the atmospheric pressure that made gauge readings absolute (unused when the reference is absolute) */
  atmosphere: AtmosphereUsed;
  /** typical interval between samples: the median, s */
  samplingInterval: number;
  /** the longest interval allowed inside the plateau, s: the profile's maximum, or 3× the median, whichever is shorter */
  maxIntervalS: number;
  /** gaps inside the plateau period */
  gaps: RecordGap[];
  /** blank cells of the pressure column in the whole record */
  pressureMissing: number;
  /** what the reader and the analysis noticed that does not fail a check by itself */
  warnings: string[];
};

/** A thermometric analysis (plateau, equilibration, holding, band, saturation, F0). */
export type AnalysisResult = {
  /** absent in analyses stored before air leakage tests were analysed: read as thermometric */
  kind?: "thermometric";
  engineVersion: string;
  verdict: "pass" | "fail";
  /** one or two plain sentences */
  summary: string;
  /** start: the reference reaches Ts; end: the end of the holding time (the reference's last reading at Ts when there was no hold) */
  plateau: { start: number; end: number } | null;
  /**
   * the span the saturation check covers: from the plateau start to the start of the exhaust
   * (README "How Papin judges a cycle"); absent in analyses stored by engine 1.x
   */
  plateauPeriod?: { start: number; end: number } | null;
  plateausFound: number;
  /** 0-based index of the analysed plateau, null when none was found */
  plateauIndex: number | null;
  equilibrationTime: number | null;
  holdingTime: number | null;
  saturation: {
    /** largest |reference − Tsat(p)| over the plateau, K; null without a plateau */
    maxDeviation: number | null;
    /** most negative and most positive deviation, K */
    lowestDeviation: number | null;
    highestDeviation: number | null;
    flags: SaturationFlag[];
  };
  /** per temperature column, header exactly as in the file: minutes */
  f0: Record<string, number>;
  checks: Check[];
  referenceChannel: string;
  pressureChannel: string;
  channels: ChannelSummary[];
  /** saturation temperature from chamber pressure during holding, °C */
  saturationTemperatureDuringHold: { min: number; max: number; mean: number } | null;
  diagnoses: Diagnosis[];
  limits: AcceptanceLimits;
  record: { startedAt: string | null; samples: number; durationS: number; medianSampleIntervalS: number };
  /** absent in analyses stored by engine 1.x */
  input?: AnalysisInput;
};

/** What a cycle's analysis can be: thermometric, or a logged air leakage test. */
export type CycleAnalysis = AnalysisResult | AirLeakageResult;

export const isAirLeakage = (analysis: CycleAnalysis | null | undefined): analysis is AirLeakageResult => analysis?.kind === "air-leakage";

/** The thermometric analysis of a cycle, or null when it has none or is an air leakage test. */
export const thermometricOf = (analysis: CycleAnalysis | null | undefined): AnalysisResult | null => (analysis && analysis.kind !== "air-leakage" ? analysis : null);

export class AnalysisError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "AnalysisError";
  }
}

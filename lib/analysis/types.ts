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

export type CheckId = "plateau-reached" | "equilibration-time" | "holding-time" | "band" | "spread" | "saturation";

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
  /** the deviation (reference − Tsat) of largest size in the span, K, signed */
  worst: number;
  diagnosis: string;
};

export type ChannelSummary = {
  header: string;
  role: "reference" | "load";
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

export type AnalysisResult = {
  engineVersion: string;
  verdict: "pass" | "fail";
  /** one or two plain sentences */
  summary: string;
  plateau: { start: number; end: number } | null;
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
};

export class AnalysisError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "AnalysisError";
  }
}

export { analyzeRecording, analyzeCycleRecording, findPlateaus, saturationTemperatureSeries, ENGINE_VERSION, PLATEAU_REARM_K, type AnalysisRequest } from "./analyze";
export { analyzeAirLeakage, pressureAt } from "./air-leakage";
export { judgeLeakRate, type LeakRateJudgement, type LeakReadings } from "./air-leakage-rate";
export type { AirLeakageCheck, AirLeakageCheckId, AirLeakageDiagnosis, AirLeakageLimits, AirLeakageMarks, AirLeakageResult, LeakTimeSource } from "./air-leakage-types";
export { downsampleSeries, type DownsampledSeries } from "./downsample";
export { lethalityMinutes, lethalRate } from "./f0";
export {
  AnalysisError,
  DEFAULT_LIMITS,
  DEFAULT_FREE_SPACE,
  EDGE_TOLERANCE_K,
  GAP_FACTOR,
  type AcceptanceLimits,
  type AnalysisInput,
  type AnalysisResult,
  type CycleAnalysis,
  isAirLeakage,
  thermometricOf,
  type ChannelSummary,
  type Check,
  type CheckId,
  type Diagnosis,
  type RecordGap,
  type SaturationFlag,
} from "./types";

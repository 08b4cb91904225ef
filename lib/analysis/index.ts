export { analyzeRecording, findPlateaus, saturationTemperatureSeries, ENGINE_VERSION, PLATEAU_REARM_K } from "./analyze";
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
  type ChannelSummary,
  type Check,
  type CheckId,
  type Diagnosis,
  type RecordGap,
  type SaturationFlag,
} from "./types";

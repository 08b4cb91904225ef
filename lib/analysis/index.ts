export { analyzeRecording, findPlateaus, saturationTemperatureSeries, ENGINE_VERSION, PLATEAU_REARM_K } from "./analyze";
export { downsampleSeries, type DownsampledSeries } from "./downsample";
export { lethalityMinutes, lethalRate } from "./f0";
export { AnalysisError, DEFAULT_LIMITS, type AcceptanceLimits, type AnalysisResult, type ChannelSummary, type Check, type CheckId, type Diagnosis, type SaturationFlag } from "./types";

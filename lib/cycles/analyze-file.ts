import { readLoggerFile, type MappingOverrides, type Recording } from "@/lib/logger-files";
import { analyzeCycleRecording, ENGINE_VERSION, type AcceptanceLimits, type AirLeakageLimits, type AirLeakageMarks, type AnalysisRequest, type CycleAnalysis } from "@/lib/analysis";
import { canonicalJson, sha256Hex } from "@/lib/integrity";
import { atmosphereAtAltitudeKpa, STANDARD_ATMOSPHERE_KPA } from "@/lib/steam";
import type { AcceptanceProfile } from "@/db/schema";

/** The site's atmospheric pressure for gauge readings: measured, else from altitude, else standard. */
export function siteAtmosphereKpa(site: { atmosphereKpa: number | null; altitudeM: number | null }): number {
  if (site.atmosphereKpa) return site.atmosphereKpa;
  if (site.altitudeM !== null && site.altitudeM !== undefined) return atmosphereAtAltitudeKpa(site.altitudeM);
  return STANDARD_ATMOSPHERE_KPA;
}

/** The profile's limits as the analysis takes them; without a maximum sampling interval, the analysis uses 3× the median. */
export function limitsOf(profile: AcceptanceProfile): AcceptanceLimits {
  const limits: AcceptanceLimits = {
    sterilizationTempC: profile.sterilizationTempC,
    holdingTimeS: profile.holdingTimeS,
    bandK: profile.bandK,
    maxEquilibrationS: profile.maxEquilibrationS,
    maxSpreadK: profile.maxSpreadK,
    saturationLimitK: profile.saturationLimitK,
    f0ReferenceC: profile.f0ReferenceC,
    f0ZK: profile.f0ZK,
    freeSpaceEarlyK: profile.freeSpaceEarlyK,
    freeSpaceEarlyS: profile.freeSpaceEarlyS,
    freeSpaceK: profile.freeSpaceK,
  };
  if (profile.maxSampleIntervalS !== null && profile.maxSampleIntervalS !== undefined) limits.maxSampleIntervalS = profile.maxSampleIntervalS;
  return limits;
}

/** The profile's air leakage limits (DOMAIN.md §2.5): the leak-rate limit and the vacuum set point. */
export function leakLimitsOf(profile: AcceptanceProfile): AirLeakageLimits {
  const limits: AirLeakageLimits = { maxLeakRateKpaPerMin: profile.leakRateLimitKpaPerMin, vacuumSetPointKpaAbs: profile.leakVacuumSetPointKpaAbs };
  if (profile.maxSampleIntervalS !== null && profile.maxSampleIntervalS !== undefined) limits.maxSampleIntervalS = profile.maxSampleIntervalS;
  return limits;
}

/** Which analysis a cycle's test kind gets: a logged air leakage test its own, every other kind the thermometric one. */
export const analysisKindOf = (testKind: string | undefined): AnalysisRequest["kind"] => (testKind === "air-leakage" ? "air-leakage" : "thermometric");

export type FileAnalysis = {
  sha256: string;
  inputHash: string;
  engineVersion: string;
  limits: AcceptanceLimits | AirLeakageLimits;
  mapping: MappingOverrides;
  dialect: unknown;
  columns: unknown;
  startedAt: string | null;
  result: CycleAnalysis;
  /** what the analysis read, stored with it so the chart and the report need not read the file again */
  recording: Recording;
};

/** What besides bytes, profile and mapping decides an analysis: the cycle's test kind, and for an air leakage test the user's marked times. */
export type AnalysisChoice = { testKind?: string; marks?: AirLeakageMarks | null };

/**
 * One logger file in, one analysis out: pure apart from hashing, so the same bytes, mapping and
 * limits always give the same figures and the same input hash. The mapping is the user's (absolute
 * or gauge in it counts as confirmed); atmosphereKpa is the site's, used unless the mapping has one.
 * An air leakage test may hold only time and chamber pressure: its mapping says so, so the file
 * reads the same way again for the chart and the report.
 */
export function analyzeLoggerBytes(bytes: Uint8Array, profile: AcceptanceProfile, mapping: MappingOverrides = {}, atmosphereKpa?: number, choice: AnalysisChoice = {}): FileAnalysis {
  const kind = analysisKindOf(choice.testKind);
  const fromSite = atmosphereKpa !== undefined && mapping.atmosphereKpa === undefined;
  let effectiveMapping: MappingOverrides = fromSite ? { ...mapping, atmosphereKpa } : mapping;
  if (kind === "air-leakage") effectiveMapping = { ...effectiveMapping, temperaturesOptional: true };
  const atmosphereSource = fromSite ? "site" : mapping.atmosphereKpa === undefined ? "standard" : "mapping";
  const { recording, dialect, columns } = readLoggerFile(bytes, effectiveMapping, { overrideSource: "user", atmosphereSource });
  const request: AnalysisRequest = kind === "air-leakage" ? { kind, limits: leakLimitsOf(profile), marks: choice.marks ?? null } : { kind, limits: limitsOf(profile) };
  const result = analyzeCycleRecording(recording, request);
  const sha256 = sha256Hex(bytes);
  // A thermometric input hash keeps the shape it had before air leakage tests, so earlier hashes still compare.
  const hashed =
    kind === "air-leakage"
      ? { file: sha256, mapping: effectiveMapping, limits: request.limits, engine: ENGINE_VERSION, kind, marks: choice.marks ?? null }
      : { file: sha256, mapping: effectiveMapping, limits: request.limits, engine: ENGINE_VERSION };
  return {
    sha256,
    inputHash: sha256Hex(canonicalJson(hashed)),
    engineVersion: ENGINE_VERSION,
    limits: request.limits,
    mapping: effectiveMapping,
    dialect,
    columns,
    startedAt: recording.startedAt,
    result,
    recording,
  };
}

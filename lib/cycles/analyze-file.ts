import { readLoggerFile, type MappingOverrides } from "@/lib/logger-files";
import { analyzeRecording, ENGINE_VERSION, type AcceptanceLimits, type AnalysisResult } from "@/lib/analysis";
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

export type FileAnalysis = {
  sha256: string;
  inputHash: string;
  engineVersion: string;
  limits: AcceptanceLimits;
  mapping: MappingOverrides;
  dialect: unknown;
  columns: unknown;
  startedAt: string | null;
  result: AnalysisResult;
};

/**
 * One logger file in, one analysis out: pure apart from hashing, so the same bytes, mapping and
 * limits always give the same figures and the same input hash. The mapping is the user's (absolute
 * or gauge in it counts as confirmed); atmosphereKpa is the site's, used unless the mapping has one.
 */
export function analyzeLoggerBytes(bytes: Uint8Array, profile: AcceptanceProfile, mapping: MappingOverrides = {}, atmosphereKpa?: number): FileAnalysis {
  const fromSite = atmosphereKpa !== undefined && mapping.atmosphereKpa === undefined;
  const effectiveMapping: MappingOverrides = fromSite ? { ...mapping, atmosphereKpa } : mapping;
  const atmosphereSource = fromSite ? "site" : mapping.atmosphereKpa === undefined ? "standard" : "mapping";
  const { recording, dialect, columns } = readLoggerFile(bytes, effectiveMapping, { overrideSource: "user", atmosphereSource });
  const limits = limitsOf(profile);
  const result = analyzeRecording(recording, limits);
  const sha256 = sha256Hex(bytes);
  return {
    sha256,
    inputHash: sha256Hex(canonicalJson({ file: sha256, mapping: effectiveMapping, limits, engine: ENGINE_VERSION })),
    engineVersion: ENGINE_VERSION,
    limits,
    mapping: effectiveMapping,
    dialect,
    columns,
    startedAt: recording.startedAt,
    result,
  };
}

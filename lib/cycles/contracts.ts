/**
 * Shapes of the cycle API's JSON, shared by the route handlers, the pages and the client
 * components (and stable for scripts and logger gateways: see DESIGN "Public HTTP API").
 */
import type { AnalysisInput, AnalysisResult, CycleAnalysis, RecordGap } from "@/lib/analysis/types";
import type { AirLeakageResult } from "@/lib/analysis/air-leakage-types";
import type { AtmosphereUsed, ColumnMapping, Dialect, InspectResult, MappingOverrides, PressureReference } from "@/lib/logger-files/types";
import type { CycleStatus, LoadType, ProfileBasis, SignatureMeaning, TestKind } from "@/lib/domain";
import type { ChannelPosition } from "./positions";
import type { FileReplacement } from "./file-replacement";

export type { FileReplacement, ChannelPosition };
export type { AirLeakageResult, AnalysisInput, AnalysisResult, AtmosphereUsed, CycleAnalysis, ColumnMapping, Dialect, InspectResult, MappingOverrides, PressureReference, RecordGap };

export type CycleListItem = {
  id: string;
  cycleNumber: string;
  status: CycleStatus;
  verdict: "pass" | "fail" | null;
  testKind: TestKind;
  startedAt: string | null;
  createdAt: string;
  sterilizer: { id: string; name: string };
  profile: { id: string; name: string };
  loadDescription: string;
  createdByName: string;
};

export type CycleListResponse = { items: CycleListItem[]; total: number; page: number; pageSize: number };

export type CycleFile = { id: string; name: string; size: number; sha256: string; uploadedAt: string; uploadedBy: string; dialect: Dialect | null; mapping: MappingOverrides | null };

export type SignatureView = {
  id: string;
  printedName: string;
  role: string;
  meaning: SignatureMeaning;
  reason: string | null;
  signedAt: string;
  bundleHash: string;
  valid: boolean;
  /** why the signature does not verify (null or absent when it does) */
  problem?: string | null;
};

/** One analysis of the cycle, as the record and the report list them: when, who, why, the verdict and the file read. */
export type AnalysisHistoryEntry = {
  id: string;
  createdAt: string;
  verdict: "pass" | "fail";
  engineVersion: string;
  inputHash: string;
  /** why it was made; null for the first analysis */
  reason: string | null;
  createdByName: string | null;
  fileName: string;
  fileSha256: string;
};

/** The instrument's calibration certificate in force on the cycle's date (null: none predates the test). */
export type InstrumentCalibration = { certificateNumber: string; calibratedOn: string; dueOn: string; testDate: string; lapsed: boolean };

/** Another cycle of the site holding a file with the same bytes, and the reason given for it. */
export type SharedFile = { fileName: string; sha256: string; cycleId: string; cycleNumber: string; reason: string | null };

export type HistoryEntry = { seq: number; at: string; actorEmail: string | null; action: string; reason: string | null; newValue: string | null };

export type CycleDetail = {
  id: string;
  cycleNumber: string;
  status: CycleStatus;
  verdict: "pass" | "fail" | null;
  testKind: TestKind;
  loadDescription: string;
  /** the test pack or load that was run (null: not recorded) and its lot or batch ("" when none was given) */
  loadType: LoadType | null;
  loadLot: string;
  startedAt: string | null;
  createdAt: string;
  submittedAt: string | null;
  createdBy: { id: string; name: string };
  site: { id: string; name: string; timeZone: string; atmosphereKpa: number };
  sterilizer: { id: string; name: string; serialNumber: string; chamberVolumeL: number };
  profile: {
    id: string;
    name: string;
    sterilizationTempC: number;
    bandK: number;
    holdingTime: number;
    holdingTimeS: number;
    maxEquilibrationS: number;
    maxSpreadK: number;
    saturationLimitK: number;
    f0ReferenceC: number;
    f0ZK: number;
    /** the standard the limits claim, or "local" (then basisReason says why) */
    basis: ProfileBasis;
    basisReason: string | null;
  };
  instrument: { id: string; name: string; serialNumber: string; calibration: InstrumentCalibration | null } | null;
  files: CycleFile[];
  /** the current analysis: the analyze command's JSON and more; `kind` "air-leakage" for a logged air leakage test */
  analysis: CycleAnalysis | null;
  analysisId: string | null;
  /** each temperature channel of the current analysis with where its probe sat, from the mapping that analysis read */
  positions: ChannelPosition[];
  /** why an approval would be refused for missing positions (a thermometric test); null when they are complete or not needed */
  positionProblem: string | null;
  /** newest first */
  analysisHistory: AnalysisHistoryEntry[];
  /** the logger file replaced after the first analysis, and how the recordings differ; null when never replaced */
  fileReplacement: FileReplacement | null;
  sharedFiles: SharedFile[];
  signatures: SignatureView[];
  supersedesId: string | null;
  report: { id: string; reportNumber: string; sha256: string } | null;
};

/** GET /api/cycles/{id}/series: chart data, downsampled keeping each bucket's extremes. */
export type SeriesResponse = {
  startedAt: string | null;
  /** seconds since the first sample */
  timesS: number[];
  channels: Array<{
    header: string;
    kind: "temperature" | "pressure" | "saturation";
    /** "°C" for temperature and saturation, "kPa abs" for pressure */
    unit: string;
    role: "reference" | "load" | "pressure" | "saturation";
    /** null where a value is missing or (saturation) outside the liquid–vapour line */
    values: Array<number | null>;
  }>;
  plateau: { start: number; end: number } | null;
  band: { low: number; high: number };
  flags: AnalysisResult["saturation"]["flags"];
  window: { from: number; to: number };
  totalSamples: number;
  fullResolution: boolean;
};

/** POST /api/logger-files/inspect (multipart `file`, optional `instrumentId`): the guessed mapping. */
export type InspectResponse = InspectResult & {
  name: string;
  size: number;
  sha256: string;
  warnings: string[];
  /** the instrument's saved mapping, if any, applied to this guess */
  savedMapping: MappingOverrides | null;
};

/** POST /api/cycles → 201 */
export type CreateCycleResponse = { id: string; status: CycleStatus; analysis: CycleAnalysis };

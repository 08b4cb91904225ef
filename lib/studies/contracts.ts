/**
 * Shapes of the qualification-study API's JSON (issue 14), shared by the route handlers, the pages, the report and the
 * client components. `allowed` is what the actor who asked may do now; the services enforce the same rules.
 */
import type { IndicatorKind, IndicatorResult, PatternItem, PatternPosition, StudyKind, StudySignatureMeaning, StudyStatus, DeviationSource, DeviationStatus } from "@/lib/domain/studies";
import type { StudyCriteria, StudySummary } from "@/lib/analysis/study-types";
import type { LoadType } from "@/lib/domain/sensor-positions";
import type { Role } from "@/lib/domain";

export type { StudyCriteria, StudySummary };

/** A new loading pattern, described inline when a study is planned. */
export type LoadingPatternInput = { name: string; description?: string; loadType?: LoadType | null; items: PatternItem[]; positions: PatternPosition[] };

export type StudyInput = {
  sterilizerId: string;
  kind: StudyKind;
  profileId: string;
  runsRequired?: number;
  title?: string;
  /** an existing pattern's id (of the same sterilizer), or a new pattern */
  loadingPattern: string | LoadingPatternInput;
  minF0Min?: number | null;
  maxSpreadK?: number | null;
  indicatorsRequired?: boolean;
  protocol?: string;
  requalificationMonths?: number;
};

/** What a draft's author may change; the pattern's fields change the study's own pattern. */
export type StudyDraftChanges = Partial<Omit<StudyInput, "sterilizerId" | "loadingPattern"> & { loadingPattern: LoadingPatternInput }>;

export type StudyListRow = {
  id: string;
  studyNumber: string;
  title: string;
  kind: StudyKind;
  status: StudyStatus;
  createdAt: string;
  sterilizer: { id: string; name: string };
  loadingPattern: { id: string; name: string };
  runsAttached: number;
  runsRequired: number;
  openDeviations: number;
};

export type StudyRunView = {
  id: string;
  runNumber: number;
  cycleId: string;
  cycleNumber: string;
  startedAt: string | null;
  cycleStatus: string;
  cycleVerdict: "pass" | "fail" | null;
  analysisId: string;
  sensorMap: Record<string, string>;
  attachedAt: string;
  attachedBy: { id: string; name: string };
  /** the attached analysis's own figures (the report's run table) */
  equilibrationTimeS: number | null;
  holdingTimeS: number | null;
};

export type StudyIndicatorView = {
  id: string;
  runId: string;
  positionId: string;
  kind: IndicatorKind;
  result: IndicatorResult;
  organism: string | null;
  lot: string;
  population: number | null;
  incubation: string | null;
  readBy: string;
  readAt: string;
  reason: string | null;
  recordedAt: string;
  recordedBy: { id: string; name: string };
  /** the latest reading of its (run, position, kind): the one that counts */
  current: boolean;
};

export type StudyDeviationView = {
  id: string;
  runId: string | null;
  source: DeviationSource;
  what: string;
  impact: string;
  rootCause: string;
  capaReference: string;
  status: DeviationStatus;
  openedAt: string;
  openedBy: { id: string; name: string } | null;
  closedAt: string | null;
  closedBy: { id: string; name: string } | null;
  closeReason: string | null;
};

export type StudySignatureView = { id: string; meaning: StudySignatureMeaning; printedName: string; role: Role; signedAt: string; reason: string | null; userId: string; contentHash: string };

export type StudyDetail = {
  id: string;
  studyNumber: string;
  title: string;
  kind: StudyKind;
  status: StudyStatus;
  createdAt: string;
  author: { id: string; name: string };
  sterilizer: { id: string; name: string };
  profile: { id: string; name: string; sterilizationTempC: number; holdingTimeS: number; f0ReferenceC: number; f0ZK: number; maxSpreadK: number };
  loadingPattern: {
    id: string;
    name: string;
    description: string;
    loadType: LoadType | null;
    items: PatternItem[];
    positions: PatternPosition[];
    photoAttachmentId: string | null;
    requalificationDueOn: string | null;
    requiredBeforeUse: boolean;
  };
  criteria: StudyCriteria & { minF0Source: "study" | "profile"; maxSpreadSource: "study" | "profile" };
  protocol: string;
  requalificationMonths: number;
  runs: StudyRunView[];
  summary: StudySummary;
  indicators: StudyIndicatorView[];
  deviations: StudyDeviationView[];
  signatures: StudySignatureView[];
  report: { reportNumber: string; sha256: string; createdAt: string } | null;
  allowed: { edit: boolean; attach: boolean; record: boolean; sign: StudySignatureMeaning[]; closeDeviation: boolean };
};

/** One temperature channel of a cycle and the pattern position proposed (or confirmed) for it. */
export type SensorMapProposal = {
  channels: Array<{ header: string; placement: string | null; positionId: string | null }>;
  /** pattern position ids no channel is proposed for */
  missing: string[];
  /** every pattern position has exactly one channel, and no channel was ambiguous */
  complete: boolean;
  /** the map the proposal amounts to: header → position id */
  sensorMap: Record<string, string>;
};

export type AttachableCycle = { id: string; cycleNumber: string; startedAt: string | null; status: string; verdict: "pass" | "fail" | null };

export type IndicatorInput = {
  positionId: string;
  kind: IndicatorKind;
  result: IndicatorResult;
  organism?: string | null;
  lot: string;
  population?: number | null;
  incubation?: string | null;
  readBy: string;
  readAt: string;
  /** required when this corrects an earlier reading of the same run, position and kind */
  reason?: string | null;
};

export type DeviationInput = { what: string; runId?: string | null; impact?: string; rootCause?: string; capaReference?: string };
export type DeviationChanges = { impact?: string; rootCause?: string; capaReference?: string };

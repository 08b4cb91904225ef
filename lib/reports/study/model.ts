import type { StudyCriteria, StudySummary } from "@/lib/analysis/study-types";
import type { DeviationSource, IndicatorKind, IndicatorResult, PatternItem, PatternPosition, StudyKind, StudySignatureMeaning, StudyStatus } from "@/lib/domain/studies";

/**
 * What a study report prints: the fields of the service's StudyDetail (design of issue 14) that the PDF reads. Written
 * structurally so the service's StudyDetail fits it as it is; times are ISO 8601 texts.
 */
export type StudyReportDetail = {
  id: string;
  studyNumber: string;
  title: string | null;
  kind: StudyKind;
  status: StudyStatus;
  createdAt: string;
  author: { id: string; name: string };
  sterilizer: { id: string; name: string };
  profile: { id: string; name: string; sterilizationTempC: number; holdingTimeS: number; f0ReferenceC: number; f0ZK: number; maxSpreadK?: number | null };
  loadingPattern: {
    id: string;
    name: string;
    description: string | null;
    loadType: string | null;
    items: PatternItem[];
    positions: PatternPosition[];
    requalificationDueOn: string | null;
  };
  criteria: StudyCriteria & { minF0Source: "study" | "profile"; maxSpreadSource: "study" | "profile" };
  protocol: string | null;
  requalificationMonths: number;
  runs: Array<{
    id: string;
    runNumber: number;
    cycleId: string;
    cycleNumber: string;
    startedAt: string | null;
    cycleStatus: string;
    cycleVerdict: string | null;
    /** channel header → pattern position id */
    sensorMap: Record<string, string>;
    attachedAt: string;
    /** the run's cycle analysis, when the service gives them (else the report prints the positions' longest equilibration) */
    equilibrationTimeS?: number | null;
    holdingTimeS?: number | null;
  }>;
  summary: StudySummary;
  indicators: Array<{
    id: string;
    runId: string;
    positionId: string;
    kind: IndicatorKind;
    result: IndicatorResult;
    organism: string | null;
    lot: string | null;
    population: string | number | null;
    incubation: string | null;
    readBy: string | null;
    readAt: string | null;
    reason: string | null;
    current: boolean;
  }>;
  deviations: Array<{
    id: string;
    runId: string | null;
    source: DeviationSource;
    what: string;
    impact: string | null;
    rootCause: string | null;
    capaReference: string | null;
    status: "open" | "closed";
    openedAt: string;
    openedBy: string | { name: string } | null;
    closedAt: string | null;
    closedBy: string | { name: string } | null;
    closeReason: string | null;
  }>;
  signatures: Array<{ id: string; meaning: StudySignatureMeaning; printedName: string; role: string; signedAt: string; reason: string | null }>;
};

export type StudyReportOptions = {
  reportNumber: string;
  /** ISO 8601; also the PDF's creation date, so the same study gives the same bytes */
  generatedAt: string;
  /** true until QA approval: every page says "DRAFT — NOT APPROVED" */
  draft: boolean;
  /** the site's name and clock; without them times print in UTC */
  site?: { name: string; timeZone: string };
};

export const STUDY_REPORT_VERIFY_HINT =
  "To check this report, sign in to Papin and drop the PDF on Signed archive › Check a report, or POST it to /api/reports/verify. A byte-for-byte match names the archived study.";

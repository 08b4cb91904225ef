import "server-only";
import { getStudyRecordRows, getStudyRow, listStudyRows, type StudyRecordRows } from "@/db/queries/studies";
import type { Actor } from "@/db/queries/users";
import { can } from "@/lib/auth/permissions";
import { AppError, notFound } from "@/lib/errors";
import { isClosedStudyStatus, profileMinimumF0, STUDY_SIGNATURE_MEANINGS, type StudyStatus } from "@/lib/domain/studies";
import { thermometricOf, type CycleAnalysis } from "@/lib/analysis/types";
import type { RunIndicator, StudyRunInput } from "@/lib/analysis/study-types";
import { summarizeStudy } from "@/lib/analysis/study-summary";
import type { StudyDetail, StudyIndicatorView, StudyListRow } from "@/lib/studies/contracts";
import { studySignatureRefusal } from "@/lib/studies/sign-rules";
import { assertAllowed } from "./access";
import { siteIdOf } from "./site";

export const STUDY_PAGE_SIZE = 25;

/** The study row of the actor's site, or 404 (another site's study does not exist for this actor). */
export async function studyOfSite(actor: Actor, id: string) {
  const row = await getStudyRow({ siteId: siteIdOf(actor, "studies"), id });
  if (!row) throw notFound("That study");
  return row;
}

export async function listStudies({
  actor,
  status,
  page = 1,
}: {
  actor: Actor;
  status?: StudyStatus;
  page?: number;
}): Promise<{ rows: StudyListRow[]; total: number; page: number; pageSize: number }> {
  assertAllowed(actor, "study:read", "see qualification studies");
  const { rows, total } = await listStudyRows({ siteId: siteIdOf(actor, "studies"), status, page, pageSize: STUDY_PAGE_SIZE });
  return {
    rows: rows.map((r) => ({
      id: r.id,
      studyNumber: r.studyNumber,
      title: r.title,
      kind: r.kind,
      status: r.status,
      createdAt: r.createdAt,
      sterilizer: { id: r.sterilizerId, name: r.sterilizerName },
      loadingPattern: { id: r.patternId, name: r.patternName },
      runsAttached: Number(r.runsAttached),
      runsRequired: r.runsRequired,
      openDeviations: Number(r.openDeviations),
    })),
    total,
    page,
    pageSize: STUDY_PAGE_SIZE,
  };
}

/** The latest reading per (run, position, kind) counts; rows come oldest first. */
function indicatorViews(rows: StudyRecordRows["indicators"]): StudyIndicatorView[] {
  const latest = new Map<string, string>();
  for (const { indicator: i } of rows) latest.set(`${i.studyRunId}|${i.positionId}|${i.kind}`, i.id);
  return rows.map(({ indicator: i, recordedByName }) => ({
    id: i.id,
    runId: i.studyRunId,
    positionId: i.positionId,
    kind: i.kind,
    result: i.result,
    organism: i.organism,
    lot: i.lot,
    population: i.population,
    incubation: i.incubation,
    readBy: i.readBy,
    readAt: i.readAt,
    reason: i.reason,
    recordedAt: i.recordedAt,
    recordedBy: { id: i.recordedBy, name: recordedByName },
    current: latest.get(`${i.studyRunId}|${i.positionId}|${i.kind}`) === i.id,
  }));
}

/** The study's criteria: its own where the protocol sets them, else the profile's (the source is stated). */
export function criteriaOf(rows: Pick<StudyRecordRows, "study" | "profile">): StudyDetail["criteria"] {
  const { study, profile } = rows;
  return {
    sterilizationTempC: profile.sterilizationTempC,
    minF0Min: study.minF0Min ?? profileMinimumF0(profile),
    maxSpreadK: study.maxSpreadK ?? profile.maxSpreadK,
    indicatorsRequired: study.indicatorsRequired,
    runsRequired: study.runsRequired,
    minF0Source: study.minF0Min === null ? "profile" : "study",
    maxSpreadSource: study.maxSpreadK === null ? "profile" : "study",
  };
}

/** The summary's input for one run: the analysis it was attached with, its map and current indicators. */
export function runInputOf(run: StudyRecordRows["runs"][number], indicators: StudyIndicatorView[]): StudyRunInput {
  const analysis = thermometricOf(run.analysisResult as CycleAnalysis);
  if (!analysis) throw new AppError(409, `Run ${run.run.runNumber} has no thermometric analysis.`);
  const current: RunIndicator[] = indicators.filter((i) => i.current && i.runId === run.run.id).map((i) => ({ positionId: i.positionId, kind: i.kind, result: i.result }));
  return {
    runId: run.run.id,
    runNumber: run.run.runNumber,
    cycleNumber: run.cycleNumber,
    cycleStatus: run.cycleStatus,
    cycleVerdict: run.cycleVerdict,
    analysis,
    sensorMap: run.run.sensorMap,
    indicators: current,
  };
}

/** The whole study as its page, the API and the report read it; `allowed` is what this actor may do now. */
export function studyDetailOf(actor: Actor, rows: StudyRecordRows): StudyDetail {
  const { study, pattern, profile } = rows;
  const criteria = criteriaOf(rows);
  const indicators = indicatorViews(rows.indicators);
  const summary = summarizeStudy({ criteria, positions: pattern.positions, runs: rows.runs.map((r) => runInputOf(r, indicators)) });
  const deviations = rows.deviations.map(({ deviation: d, openedByName, closedByName }) => ({
    id: d.id,
    runId: d.studyRunId,
    source: d.source,
    what: d.what,
    impact: d.impact,
    rootCause: d.rootCause,
    capaReference: d.capaReference,
    status: d.status,
    openedAt: d.openedAt,
    openedBy: d.openedBy ? { id: d.openedBy, name: openedByName ?? "" } : null,
    closedAt: d.closedAt,
    closedBy: d.closedBy ? { id: d.closedBy, name: closedByName ?? "" } : null,
    closeReason: d.closeReason,
  }));
  const signatures = rows.signatures.map((s) => ({
    id: s.id,
    meaning: s.meaning,
    printedName: s.printedName,
    role: s.role,
    signedAt: s.signedAt,
    reason: s.reason,
    userId: s.userId,
    contentHash: s.contentHash,
  }));
  const openDeviations = deviations.filter((d) => d.status === "open").length;
  const ruleInput = {
    actor,
    status: study.status,
    authorId: study.createdBy,
    signatures,
    seriesComplete: summary.consecutive.complete,
    pendingRuns: summary.runs.filter((r) => r.judgement === "pending").length,
    openDeviations,
    runsRequired: study.runsRequired,
  };
  const closed = isClosedStudyStatus(study.status);
  return {
    id: study.id,
    studyNumber: study.studyNumber,
    title: study.title,
    kind: study.kind,
    status: study.status,
    createdAt: study.createdAt,
    author: { id: study.createdBy, name: rows.authorName },
    sterilizer: { id: study.sterilizerId, name: rows.sterilizerName },
    profile: {
      id: profile.id,
      name: profile.name,
      sterilizationTempC: profile.sterilizationTempC,
      holdingTimeS: profile.holdingTimeS,
      f0ReferenceC: profile.f0ReferenceC,
      f0ZK: profile.f0ZK,
      maxSpreadK: profile.maxSpreadK,
    },
    loadingPattern: {
      id: pattern.id,
      name: pattern.name,
      description: pattern.description,
      loadType: pattern.loadType,
      items: pattern.items,
      positions: pattern.positions,
      photoAttachmentId: pattern.photoAttachmentId,
      requalificationDueOn: pattern.requalificationDueOn,
      requiredBeforeUse: pattern.requiredBeforeUse,
    },
    criteria,
    protocol: study.protocol,
    requalificationMonths: study.requalificationMonths,
    runs: rows.runs.map((r) => ({
      id: r.run.id,
      runNumber: r.run.runNumber,
      cycleId: r.run.cycleId,
      cycleNumber: r.cycleNumber,
      startedAt: r.startedAt,
      cycleStatus: r.cycleStatus,
      cycleVerdict: r.cycleVerdict,
      analysisId: r.run.analysisId,
      sensorMap: r.run.sensorMap,
      attachedAt: r.run.attachedAt,
      attachedBy: { id: r.run.attachedBy, name: r.attachedByName },
      equilibrationTimeS: thermometricOf(r.analysisResult as CycleAnalysis)?.equilibrationTime ?? null,
      holdingTimeS: thermometricOf(r.analysisResult as CycleAnalysis)?.holdingTime ?? null,
    })),
    summary,
    indicators,
    deviations,
    signatures,
    report: rows.report,
    allowed: {
      edit: can(actor.role, "study:plan") && study.status === "draft",
      attach: can(actor.role, "study:run") && (study.status === "protocol-approved" || study.status === "running"),
      record: can(actor.role, "study:run") && study.status === "running",
      sign: STUDY_SIGNATURE_MEANINGS.filter((m) => studySignatureRefusal(ruleInput, m, "a reason") === null),
      closeDeviation: can(actor.role, "deviation:close") && !closed && openDeviations > 0,
    },
  };
}

export async function getStudyDetail({ actor, id }: { actor: Actor; id: string }): Promise<StudyDetail> {
  assertAllowed(actor, "study:read", "see qualification studies");
  const study = await studyOfSite(actor, id);
  const rows = await getStudyRecordRows({ studyId: study.id });
  if (!rows) throw notFound("That study");
  return studyDetailOf(actor, rows);
}

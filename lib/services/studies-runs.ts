import "server-only";
import { getCycleWithAnalysis, getStudyRecordRows, listAttachableCycleRows } from "@/db/queries/studies";
import { insertStudyRun, type NewDeviation } from "@/db/queries/studies-writes";
import type { Actor } from "@/db/queries/users";
import { AppError, notFound } from "@/lib/errors";
import { summarizeStudy } from "@/lib/analysis/study-summary";
import type { RunJudgement } from "@/lib/analysis/study-types";
import { thermometricOf, type CycleAnalysis } from "@/lib/analysis/types";
import type { MappingOverrides } from "@/lib/logger-files/types";
import type { AttachableCycle, SensorMapProposal } from "@/lib/studies/contracts";
import { missingSentence, proposeSensorMap as proposeMap, sensorMapProblem } from "@/lib/studies/sensor-map";
import { assertAllowed } from "./access";
import { auditActor, siteIdOf } from "./site";
import { criteriaOf, getStudyDetail, runInputOf, studyOfSite } from "./studies-detail";

const SIGNED = ["approved", "failure-confirmed"];
const ATTACHING = ["protocol-approved", "running"] as const;

/** The cycle to attach, checked: the study's sterilizer and profile, signed, with a thermometric analysis, not yet attached. */
async function attachableCycle(actor: Actor, study: { id: string; sterilizerId: string; profileId: string }, cycleId: string) {
  const found = await getCycleWithAnalysis({ siteId: siteIdOf(actor, "studies"), cycleId });
  if (!found) throw new AppError(404, "That cycle was not found on your site.", "cycleId");
  const { cycle } = found;
  if (cycle.sterilizerId !== study.sterilizerId) throw new AppError(409, `Cycle ${cycle.cycleNumber} ran on another sterilizer; a study's runs are cycles of its own sterilizer.`, "cycleId");
  if (cycle.profileId !== study.profileId) throw new AppError(409, `Cycle ${cycle.cycleNumber} was judged against another profile than the study's; attach cycles of the study's profile.`, "cycleId");
  if (!SIGNED.includes(cycle.status)) {
    throw new AppError(409, `Cycle ${cycle.cycleNumber} is not signed yet: only an approved cycle or a confirmed failure can be a study run.`, "cycleId");
  }
  const analysis = thermometricOf(found.analysisResult as CycleAnalysis | null);
  if (!analysis || !cycle.currentAnalysisId) throw new AppError(409, `Cycle ${cycle.cycleNumber} has no thermometric analysis, so it cannot be a study run.`, "cycleId");
  const mapping = (found.analysisMapping ?? null) as MappingOverrides | null;
  return { cycle, analysis, analysisId: cycle.currentAnalysisId, placements: mapping?.positions ?? null };
}

export async function proposeSensorMap({ actor, id, cycleId }: { actor: Actor; id: string; cycleId: string }): Promise<SensorMapProposal> {
  assertAllowed(actor, "study:read", "see qualification studies");
  const study = await studyOfSite(actor, id);
  const rows = await getStudyRecordRows({ studyId: study.id });
  if (!rows) throw notFound("That study");
  const { analysis, placements } = await attachableCycle(actor, study, cycleId);
  return proposeMap({ headers: analysis.channels.map((c) => c.header), placements, positions: rows.pattern.positions });
}

export async function listAttachableCycles({ actor, id }: { actor: Actor; id: string }): Promise<AttachableCycle[]> {
  assertAllowed(actor, "study:read", "see qualification studies");
  const study = await studyOfSite(actor, id);
  return listAttachableCycleRows({ siteId: study.siteId, studyId: study.id, sterilizerId: study.sterilizerId, profileId: study.profileId });
}

/** The study's runs with their judgements, and the signed cycles that could be attached next (GET /api/studies/{id}/runs). */
export async function listStudyRuns({ actor, id }: { actor: Actor; id: string }) {
  const detail = await getStudyDetail({ actor, id });
  return { runs: detail.runs, judgements: detail.summary.runs, attachable: await listAttachableCycles({ actor, id }) };
}

/**
 * Attaches a signed cycle as the study's next run with its confirmed sensor map (or the proposal, when it maps every
 * position unambiguously), judges it against the study's criteria, and opens a deviation when it failed — one transaction.
 */
export async function attachRun({ actor, id, cycleId, sensorMap }: { actor: Actor; id: string; cycleId: string; sensorMap?: Record<string, string> }) {
  assertAllowed(actor, "study:run", "attach runs to studies");
  const study = await studyOfSite(actor, id);
  if (!(ATTACHING as readonly string[]).includes(study.status)) {
    throw new AppError(
      409,
      study.status === "draft" ? "The study's protocol must be approved before runs are attached." : `This study is ${study.status.replace(/-/g, " ")}; runs are attached only while it is running.`,
    );
  }
  const rows = await getStudyRecordRows({ studyId: study.id });
  if (!rows) throw notFound("That study");
  const { cycle, analysis, analysisId, placements } = await attachableCycle(actor, study, cycleId);
  const attached = rows.runs.find((r) => r.run.cycleId === cycle.id);
  if (attached) throw new AppError(409, `Cycle ${cycle.cycleNumber} is already run ${attached.run.runNumber} of this study; a cycle counts once.`, "cycleId");
  const headers = analysis.channels.map((c) => c.header);
  const positions = rows.pattern.positions;
  let map: Record<string, string>;
  if (sensorMap) {
    const problem = sensorMapProblem({ sensorMap, headers, positions });
    if (problem) throw new AppError(409, problem, "sensorMap");
    map = sensorMap;
  } else {
    const proposal = proposeMap({ headers, placements, positions });
    if (!proposal.complete) throw new AppError(409, missingSentence(proposal.missing), "sensorMap");
    map = proposal.sensorMap;
  }
  const runId = crypto.randomUUID();
  const judged = judgeNewRun(rows, { runId, cycle, analysis, analysisId, map });
  const at = new Date().toISOString();
  const what = (runNumber: number) => `Run ${runNumber} (cycle ${cycle.cycleNumber}) failed: ${judged.reasons.join(" ")}`;
  const deviationIds = judged.judgement === "fail" ? [crypto.randomUUID()] : [];
  const deviations = (runNumber: number): NewDeviation[] => deviationIds.map((did) => ({ id: did, studyRunId: runId, source: "failed-run", what: what(runNumber), openedBy: actor.id }));
  const inserted = await insertStudyRun({
    studyId: study.id,
    fromStatuses: [...ATTACHING],
    run: { id: runId, cycleId: cycle.id, analysisId, sensorMap: map, attachedBy: actor.id },
    at,
    deviations,
    audit: (runNumber) => [
      {
        ...auditActor(actor),
        action: "study-run.attach",
        entityType: "study",
        entityId: study.id,
        oldValue: { status: study.status },
        newValue: { status: "running", run: runId, runNumber, cycleId: cycle.id, cycleNumber: cycle.cycleNumber, analysisId, sensorMap: map, judgement: judged.judgement, reasons: judged.reasons },
      },
      ...deviations(runNumber).map((d) => ({
        ...auditActor(actor),
        action: "study-deviation.open",
        entityType: "study",
        entityId: study.id,
        newValue: { deviation: d.id, run: runId, source: d.source, what: d.what },
      })),
    ],
  });
  if (!inserted) throw new AppError(409, "The study changed while you were attaching the run; reload it and try again.");
  return { runId, runNumber: inserted.runNumber, judgement: judged.judgement, reasons: judged.reasons };
}

/** The new run's judgement, from the summary of the runs so far plus this one (it has no indicators yet). */
function judgeNewRun(
  rows: NonNullable<Awaited<ReturnType<typeof getStudyRecordRows>>>,
  run: {
    runId: string;
    cycle: { cycleNumber: string; status: string; verdict: "pass" | "fail" | null };
    analysis: NonNullable<ReturnType<typeof thermometricOf>>;
    analysisId: string;
    map: Record<string, string>;
  },
): { judgement: RunJudgement; reasons: string[] } {
  const runs = rows.runs.map((r) => runInputOf(r, []));
  const runNumber = (rows.runs.at(-1)?.run.runNumber ?? 0) + 1;
  runs.push({
    runId: run.runId,
    runNumber,
    cycleNumber: run.cycle.cycleNumber,
    cycleStatus: run.cycle.status,
    cycleVerdict: run.cycle.verdict,
    analysis: run.analysis,
    sensorMap: run.map,
    indicators: [],
  });
  const summary = summarizeStudy({ criteria: criteriaOf(rows), positions: rows.pattern.positions, runs });
  const mine = summary.runs.find((r) => r.runId === run.runId);
  if (!mine) throw new AppError(500, "The run could not be judged.");
  return { judgement: mine.judgement, reasons: mine.reasons };
}

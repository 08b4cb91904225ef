import "server-only";
import { getStudyRecordRows, type StudyRecordRows } from "@/db/queries/studies";
import { insertStudyDeviation, insertStudyIndicator, updateStudyDeviationRow, type NewDeviation } from "@/db/queries/studies-writes";
import type { Actor } from "@/db/queries/users";
import { AppError, notFound } from "@/lib/errors";
import { INDICATOR_KIND_LABELS, INDICATOR_RESULT_LABELS, isClosedStudyStatus, isPositiveIndicator } from "@/lib/domain/studies";
import type { DeviationChanges, DeviationInput, IndicatorInput } from "@/lib/studies/contracts";
import { deviationInputSchema, indicatorInputSchema } from "@/lib/validations/studies";
import { assertAllowed } from "./access";
import { auditActor } from "./site";
import { studyOfSite } from "./studies-detail";

/** Indicator readings and deviations of a study (issue 14 §4, §5): each change in one transaction with its ledger event. */

async function recordRows(actor: Actor, id: string): Promise<StudyRecordRows> {
  const study = await studyOfSite(actor, id);
  const rows = await getStudyRecordRows({ studyId: study.id });
  if (!rows) throw notFound("That study");
  return rows;
}

/** Records an indicator reading of a run at a position; a second reading of the same run, position and kind is a correction with a reason. A positive one opens a deviation. */
export async function recordIndicator({ actor, id, runId, input }: { actor: Actor; id: string; runId: string; input: IndicatorInput }) {
  assertAllowed(actor, "study:run", "record indicator results");
  const rows = await recordRows(actor, id);
  const data = indicatorInputSchema.parse({ ...input, runId });
  if (rows.study.status !== "running") throw new AppError(409, "Indicator results are recorded while the study's runs are in progress.");
  const run = rows.runs.find((r) => r.run.id === runId);
  if (!run) throw new AppError(404, "That run is not part of this study.", "runId");
  const position = rows.pattern.positions.find((p) => p.id === data.positionId);
  if (!position) throw new AppError(400, `The loading pattern has no position ${data.positionId}.`, "positionId");
  const earlier = rows.indicators.filter((i) => i.indicator.studyRunId === runId && i.indicator.positionId === data.positionId && i.indicator.kind === data.kind).at(-1)?.indicator;
  const reason = data.reason?.trim() || null;
  if (earlier && !reason) throw new AppError(400, `A ${data.kind} indicator of run ${run.run.runNumber} at ${position.id} was already recorded; give the reason for the correction.`, "reason");
  const indicatorId = crypto.randomUUID();
  const recordedAt = new Date().toISOString();
  const positive = isPositiveIndicator(data.result);
  const deviation: NewDeviation | null = positive
    ? {
        id: crypto.randomUUID(),
        studyRunId: runId,
        source: "positive-indicator",
        what: `Run ${run.run.runNumber} (cycle ${run.cycleNumber}), position ${position.id} (${position.label}): the ${INDICATOR_KIND_LABELS[data.kind].toLowerCase()} of lot ${data.lot} read "${INDICATOR_RESULT_LABELS[data.result]}", so the run fails.`,
        openedBy: actor.id,
      }
    : null;
  const indicator = {
    id: indicatorId,
    studyRunId: runId,
    positionId: position.id,
    kind: data.kind,
    result: data.result,
    organism: data.organism?.trim() || null,
    lot: data.lot,
    population: data.population ?? null,
    incubation: data.incubation?.trim() || null,
    readBy: data.readBy,
    readAt: data.readAt,
    reason,
    recordedBy: actor.id,
    recordedAt,
  };
  const ok = await insertStudyIndicator({
    studyId: rows.study.id,
    indicator,
    deviations: deviation ? [deviation] : [],
    audit: [
      {
        ...auditActor(actor),
        action: earlier ? "study-indicator.correct" : "study-indicator.record",
        entityType: "study",
        entityId: rows.study.id,
        oldValue: earlier ? { indicator: earlier.id, result: earlier.result, lot: earlier.lot, readBy: earlier.readBy, readAt: earlier.readAt } : null,
        newValue: { ...indicator, runNumber: run.run.runNumber },
        reason,
      },
      ...(deviation
        ? [
            {
              ...auditActor(actor),
              action: "study-deviation.open",
              entityType: "study",
              entityId: rows.study.id,
              newValue: { deviation: deviation.id, run: runId, source: deviation.source, what: deviation.what },
            },
          ]
        : []),
    ],
  });
  if (!ok) throw new AppError(409, "The study changed while you were recording; reload it and try again.");
  return { id: indicatorId, deviationId: deviation?.id ?? null };
}

/** A deviation raised by a person (source "raised"), while the study is open for runs or review. */
export async function raiseDeviation({ actor, id, input }: { actor: Actor; id: string; input: DeviationInput }) {
  assertAllowed(actor, "study:run", "raise deviations");
  const rows = await recordRows(actor, id);
  const data = deviationInputSchema.parse(input);
  if (data.runId && !rows.runs.some((r) => r.run.id === data.runId)) throw new AppError(404, "That run is not part of this study.", "runId");
  const open = ["protocol-approved", "running", "ready-for-review"] as const;
  if (!(open as readonly string[]).includes(rows.study.status)) throw new AppError(409, "Deviations are raised once the protocol is approved and until the study is closed.");
  const deviation: NewDeviation = {
    id: crypto.randomUUID(),
    studyRunId: data.runId ?? null,
    source: "raised",
    what: data.what,
    impact: data.impact ?? "",
    rootCause: data.rootCause ?? "",
    capaReference: data.capaReference ?? "",
    openedBy: actor.id,
  };
  const ok = await insertStudyDeviation({
    studyId: rows.study.id,
    openStatuses: [...open],
    deviation,
    audit: { ...auditActor(actor), action: "study-deviation.open", entityType: "study", entityId: rows.study.id, newValue: { deviation: deviation.id, ...deviation } },
  });
  if (!ok) throw new AppError(409, "The study changed while you were raising the deviation; reload it and try again.");
  return { id: deviation.id };
}

async function openDeviationOf(actor: Actor, id: string, deviationId: string) {
  const rows = await recordRows(actor, id);
  if (isClosedStudyStatus(rows.study.status)) throw new AppError(409, "This study is closed and changes no more.");
  const deviation = rows.deviations.find((d) => d.deviation.id === deviationId)?.deviation;
  if (!deviation) throw new AppError(404, "That deviation is not part of this study.");
  if (deviation.status !== "open") throw new AppError(409, "This deviation is closed and stays closed; raise a new one if needed.");
  return { rows, deviation };
}

const DEVIATION_FIELDS = ["impact", "rootCause", "capaReference"] as const;

/** Writes an open deviation's impact assessment, root cause or CAPA reference (audited old → new). */
export async function updateDeviation({ actor, id, deviationId, changes }: { actor: Actor; id: string; deviationId: string; changes: DeviationChanges }) {
  assertAllowed(actor, "study:run", "investigate deviations");
  const { rows, deviation } = await openDeviationOf(actor, id, deviationId);
  const oldValue: Record<string, string> = {};
  const newValue: Record<string, string> = {};
  for (const key of DEVIATION_FIELDS) {
    const next = changes[key]?.trim();
    if (next === undefined || next === deviation[key]) continue;
    oldValue[key] = deviation[key];
    newValue[key] = next;
  }
  if (Object.keys(newValue).length === 0) return { id: deviationId, changed: false };
  const ok = await updateStudyDeviationRow({
    studyId: rows.study.id,
    deviationId,
    values: newValue,
    at: new Date().toISOString(),
    audit: {
      ...auditActor(actor),
      action: "study-deviation.edit",
      entityType: "study",
      entityId: rows.study.id,
      oldValue: { deviation: deviationId, ...oldValue },
      newValue: { deviation: deviationId, ...newValue },
    },
  });
  if (!ok) throw new AppError(409, "This deviation was closed meanwhile; reload the study.");
  return { id: deviationId, changed: true };
}

/** Closes a deviation (engineer), with a reason; its impact and root cause must be written first. */
export async function closeDeviation({ actor, id, deviationId, reason }: { actor: Actor; id: string; deviationId: string; reason: string }) {
  assertAllowed(actor, "deviation:close", "close deviations");
  const cleanReason = reason?.trim();
  if (!cleanReason) throw new AppError(400, "Give the reason for closing the deviation.", "reason");
  const { rows, deviation } = await openDeviationOf(actor, id, deviationId);
  const missing = [!deviation.impact.trim() && "the impact assessment", !deviation.rootCause.trim() && "the root cause"].filter(Boolean);
  if (missing.length) throw new AppError(409, `Write ${missing.join(" and ")} before closing the deviation.`);
  const at = new Date().toISOString();
  const ok = await updateStudyDeviationRow({
    studyId: rows.study.id,
    deviationId,
    values: { status: "closed", closedBy: actor.id, closedAt: at, closeReason: cleanReason },
    at,
    audit: {
      ...auditActor(actor),
      action: "study-deviation.close",
      entityType: "study",
      entityId: rows.study.id,
      oldValue: { deviation: deviationId, status: "open" },
      newValue: { deviation: deviationId, status: "closed" },
      reason: cleanReason,
    },
  });
  if (!ok) throw new AppError(409, "This deviation was closed meanwhile; reload the study.");
  return { id: deviationId, status: "closed" as const };
}

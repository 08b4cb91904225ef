import "server-only";
import { and, count, eq, inArray, max } from "drizzle-orm";
import { getDb, type Executor } from "@/db";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";
import { loadingPatterns, studies, studyDeviations, studyIndicators, studyReports, studyRuns, studySignatures, users } from "@/db/schema";
import type { StudyStatus } from "@/lib/domain/studies";
import type { DeviationSource } from "@/lib/domain/studies";
import type { StudyIndicator } from "@/db/schema";

/** Writes of qualification studies: each one transaction with its audit events (issue 14). */

type Hook = (tx: Executor) => Promise<void>;
export type NewDeviation = { id: string; studyRunId: string | null; source: DeviationSource; what: string; impact?: string; rootCause?: string; capaReference?: string; openedBy: string };

async function insertDeviations(tx: Executor, studyId: string, deviations: NewDeviation[]) {
  for (const d of deviations) await tx.insert(studyDeviations).values({ ...d, studyId });
}

/**
 * Attaches a run with the next run number while the study is in one of `fromStatuses`, moves the study to running, and
 * opens the deviations the run's judgement calls for. Null when the study had moved on meanwhile.
 */
export async function insertStudyRun(input: {
  studyId: string;
  fromStatuses: StudyStatus[];
  run: { id: string; cycleId: string; analysisId: string; sensorMap: Record<string, string>; attachedBy: string };
  at: string;
  deviations: (runNumber: number) => NewDeviation[];
  audit: (runNumber: number) => AuditInput[];
}): Promise<{ runNumber: number } | null> {
  return getDb().transaction(async (tx) => {
    const moved = await tx
      .update(studies)
      .set({ status: "running", updatedAt: input.at })
      .where(and(eq(studies.id, input.studyId), inArray(studies.status, input.fromStatuses)))
      .returning({ id: studies.id });
    if (moved.length === 0) return null;
    const [{ last }] = await tx
      .select({ last: max(studyRuns.runNumber) })
      .from(studyRuns)
      .where(eq(studyRuns.studyId, input.studyId));
    const runNumber = (last ?? 0) + 1;
    await tx.insert(studyRuns).values({ ...input.run, studyId: input.studyId, runNumber, attachedAt: input.at });
    await insertDeviations(tx, input.studyId, input.deviations(runNumber));
    for (const event of input.audit(runNumber)) await appendAuditEvent(tx, event);
    return { runNumber };
  });
}

/** Adds an indicator reading (a correction is a new row) and any deviation it opens, while the study is running. */
export async function insertStudyIndicator(input: {
  studyId: string;
  indicator: Omit<StudyIndicator, "recordedAt"> & { recordedAt: string };
  deviations: NewDeviation[];
  audit: AuditInput[];
}): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    const [study] = await tx.select({ status: studies.status }).from(studies).where(eq(studies.id, input.studyId)).limit(1);
    if (study?.status !== "running") return false;
    await tx.insert(studyIndicators).values(input.indicator);
    await insertDeviations(tx, input.studyId, input.deviations);
    for (const event of input.audit) await appendAuditEvent(tx, event);
    return true;
  });
}

/** Opens deviations (raised by hand) while the study is in one of `openStatuses`. */
export async function insertStudyDeviation(input: { studyId: string; openStatuses: StudyStatus[]; deviation: NewDeviation; audit: AuditInput }): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    const [study] = await tx.select({ status: studies.status }).from(studies).where(eq(studies.id, input.studyId)).limit(1);
    if (!study || !input.openStatuses.includes(study.status)) return false;
    await insertDeviations(tx, input.studyId, [input.deviation]);
    await appendAuditEvent(tx, input.audit);
    return true;
  });
}

/** Writes an open deviation's fields, or closes it; false when it was closed meanwhile. */
export async function updateStudyDeviationRow(input: {
  studyId: string;
  deviationId: string;
  values: Partial<{ impact: string; rootCause: string; capaReference: string; status: "closed"; closedBy: string; closedAt: string; closeReason: string }>;
  at: string;
  audit: AuditInput;
}): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    const updated = await tx
      .update(studyDeviations)
      .set({ ...input.values, updatedAt: input.at })
      .where(and(eq(studyDeviations.id, input.deviationId), eq(studyDeviations.studyId, input.studyId), eq(studyDeviations.status, "open")))
      .returning({ id: studyDeviations.id });
    if (updated.length === 0) return false;
    await appendAuditEvent(tx, input.audit);
    return true;
  });
}

export async function countOpenDeviations({ studyId, tx }: { studyId: string; tx?: Executor }): Promise<number> {
  const [{ n }] = await (tx ?? getDb())
    .select({ n: count() })
    .from(studyDeviations)
    .where(and(eq(studyDeviations.studyId, studyId), eq(studyDeviations.status, "open")));
  return n;
}

/**
 * Applies a study signature in one transaction: the status move (only from `fromStatus`), the signature, the signer's
 * cleared failure count, whatever `inside` adds (the archived report, the pattern's due date) and the audit event.
 * `before` runs first and throws to refuse (the study changed). False when the status had moved.
 */
export async function applyStudySignature(input: {
  studyId: string;
  fromStatus: StudyStatus;
  nextStatus: StudyStatus;
  signature: typeof studySignatures.$inferInsert & { id: string };
  at: string;
  before?: Hook;
  inside?: Hook;
  audit: AuditInput;
}): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    await input.before?.(tx);
    const moved = await tx
      .update(studies)
      .set({ status: input.nextStatus, updatedAt: input.at })
      .where(and(eq(studies.id, input.studyId), eq(studies.status, input.fromStatus)))
      .returning({ id: studies.id });
    if (moved.length === 0) return false;
    await tx.insert(studySignatures).values(input.signature);
    await tx.update(users).set({ failedSigningAttempts: 0, signingLockedUntil: null }).where(eq(users.id, input.signature.userId));
    await input.inside?.(tx);
    await appendAuditEvent(tx, input.audit);
    return true;
  });
}

/** Sets a loading pattern's next requalification date (inside the QA approval's transaction). */
export async function setRequalificationDue(tx: Executor, { patternId, dueOn, at }: { patternId: string; dueOn: string; at: string }) {
  await tx.update(loadingPatterns).set({ requalificationDueOn: dueOn, updatedAt: at }).where(eq(loadingPatterns.id, patternId));
}

/** The study report archived at QA approval (inside the signature's transaction); append-only. */
export async function insertStudyReportRow(tx: Executor, input: { studyId: string; signatureId: string; reportNumber: string; sha256: string; bytes: Uint8Array }) {
  await tx.insert(studyReports).values({ ...input, sizeBytes: input.bytes.byteLength, bytes: Buffer.from(input.bytes) });
}

import "server-only";
import { and, asc, count, desc, eq, inArray, like, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { getDb, type Executor } from "@/db";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";
import {
  acceptanceProfiles,
  analyses,
  cycles,
  loadingPatterns,
  sterilizers,
  studies,
  studyDeviations,
  studyIndicators,
  studyReports,
  studyRuns,
  studySignatures,
  users,
  type NewLoadingPattern,
  type NewStudy,
} from "@/db/schema";
import type { StudyStatus } from "@/lib/domain/studies";

/** Reads of qualification studies (issue 14); every read is bounded to one site. */

export async function getSterilizerOnSite({ siteId, id }: { siteId: string; id: string }) {
  const [row] = await getDb()
    .select()
    .from(sterilizers)
    .where(and(eq(sterilizers.id, id), eq(sterilizers.siteId, siteId)))
    .limit(1);
  return row;
}

export async function getProfileOnSite({ siteId, id }: { siteId: string; id: string }) {
  const [row] = await getDb()
    .select()
    .from(acceptanceProfiles)
    .where(and(eq(acceptanceProfiles.id, id), eq(acceptanceProfiles.siteId, siteId)))
    .limit(1);
  return row;
}

export async function getLoadingPatternOnSite({ siteId, id }: { siteId: string; id: string }) {
  const [row] = await getDb()
    .select()
    .from(loadingPatterns)
    .where(and(eq(loadingPatterns.id, id), eq(loadingPatterns.siteId, siteId)))
    .limit(1);
  return row;
}

export async function getStudyRow({ siteId, id, tx }: { siteId: string; id: string; tx?: Executor }) {
  const [row] = await (tx ?? getDb())
    .select()
    .from(studies)
    .where(and(eq(studies.id, id), eq(studies.siteId, siteId)))
    .limit(1);
  return row;
}

/**
 * Inserts the study (and its new loading pattern) with its number "QS-<year>-<nnn>", one above the highest of the site's
 * year, and the audit events, in one transaction. Two plans saved at the same instant may pick the same number: the
 * unique index refuses the second, whose transaction rolled back whole, and it is tried again with the next number.
 */
export async function insertStudy(input: {
  siteId: string;
  year: string;
  pattern?: NewLoadingPattern & { id: string };
  study: Omit<NewStudy, "studyNumber" | "title"> & { id: string; title: string | null };
  audit: (studyNumber: string) => AuditInput[];
}): Promise<{ id: string; studyNumber: string }> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await insertStudyOnce(input);
    } catch (error) {
      if (attempt >= 4 || !isStudyNumberTaken(error)) throw error;
    }
  }
}

export const isStudyNumberTaken = (error: unknown): boolean => {
  const text = `${(error as { message?: string })?.message ?? ""} ${String((error as { cause?: unknown })?.cause ?? "")}`;
  return /UNIQUE constraint failed: studies\.site_id, studies\.study_number/.test(text);
};

function insertStudyOnce(input: Parameters<typeof insertStudy>[0]): Promise<{ id: string; studyNumber: string }> {
  return getDb().transaction(async (tx) => {
    if (input.pattern) await tx.insert(loadingPatterns).values(input.pattern);
    const prefix = `QS-${input.year}-`;
    const [{ highest }] = await tx
      .select({ highest: sql<number | null>`max(cast(substr(${studies.studyNumber}, ${prefix.length + 1}) as integer))` })
      .from(studies)
      .where(and(eq(studies.siteId, input.siteId), like(studies.studyNumber, `${prefix}%`)));
    const studyNumber = `${prefix}${String((highest ?? 0) + 1).padStart(3, "0")}`;
    await tx.insert(studies).values({ ...input.study, studyNumber, title: input.study.title ?? studyNumber });
    for (const event of input.audit(studyNumber)) await appendAuditEvent(tx, event);
    return { id: input.study.id, studyNumber };
  });
}

/** Changes a draft study (and its pattern) only while it is still a draft; false when it had moved on. */
export async function updateStudyDraftRow(input: {
  siteId: string;
  id: string;
  values: Partial<NewStudy>;
  pattern?: { id: string; values: Partial<NewLoadingPattern> };
  at: string;
  audit: AuditInput;
}): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    const updated = await tx
      .update(studies)
      .set({ ...input.values, updatedAt: input.at })
      .where(and(eq(studies.id, input.id), eq(studies.siteId, input.siteId), eq(studies.status, "draft")))
      .returning({ id: studies.id });
    if (updated.length === 0) return false;
    if (input.pattern)
      await tx
        .update(loadingPatterns)
        .set({ ...input.pattern.values, updatedAt: input.at })
        .where(eq(loadingPatterns.id, input.pattern.id));
    await appendAuditEvent(tx, input.audit);
    return true;
  });
}

export async function listStudyRows({ siteId, status, page, pageSize }: { siteId: string; status?: StudyStatus; page: number; pageSize: number }) {
  const where = and(eq(studies.siteId, siteId), status ? eq(studies.status, status) : undefined);
  const rows = await getDb()
    .select({
      id: studies.id,
      studyNumber: studies.studyNumber,
      title: studies.title,
      kind: studies.kind,
      status: studies.status,
      createdAt: studies.createdAt,
      runsRequired: studies.runsRequired,
      sterilizerId: sterilizers.id,
      sterilizerName: sterilizers.name,
      patternId: loadingPatterns.id,
      patternName: loadingPatterns.name,
      runsAttached: sql<number>`(select count(*) from ${studyRuns} where ${studyRuns.studyId} = ${studies.id})`,
      openDeviations: sql<number>`(select count(*) from ${studyDeviations} where ${studyDeviations.studyId} = ${studies.id} and ${studyDeviations.status} = 'open')`,
    })
    .from(studies)
    .innerJoin(sterilizers, eq(studies.sterilizerId, sterilizers.id))
    .innerJoin(loadingPatterns, eq(studies.loadingPatternId, loadingPatterns.id))
    .where(where)
    .orderBy(desc(studies.createdAt), desc(studies.studyNumber))
    .limit(pageSize)
    .offset((page - 1) * pageSize);
  const [{ total }] = await getDb().select({ total: count() }).from(studies).where(where);
  return { rows, total };
}

/** Everything a study's detail shows, read from its rows (the caller checked the site through getStudyRow). */
export async function getStudyRecordRows({ studyId, tx }: { studyId: string; tx?: Executor }) {
  const db = tx ?? getDb();
  const [head] = await db
    .select({ study: studies, pattern: loadingPatterns, profile: acceptanceProfiles, sterilizerName: sterilizers.name, authorName: users.name })
    .from(studies)
    .innerJoin(loadingPatterns, eq(studies.loadingPatternId, loadingPatterns.id))
    .innerJoin(acceptanceProfiles, eq(studies.profileId, acceptanceProfiles.id))
    .innerJoin(sterilizers, eq(studies.sterilizerId, sterilizers.id))
    .innerJoin(users, eq(studies.createdBy, users.id))
    .where(eq(studies.id, studyId))
    .limit(1);
  if (!head) return undefined;
  const runs = await db
    .select({
      run: studyRuns,
      cycleNumber: cycles.cycleNumber,
      startedAt: cycles.startedAt,
      cycleStatus: cycles.status,
      cycleVerdict: cycles.verdict,
      analysisResult: analyses.result,
      analysisVerdict: analyses.verdict,
      attachedByName: users.name,
    })
    .from(studyRuns)
    .innerJoin(cycles, eq(studyRuns.cycleId, cycles.id))
    .innerJoin(analyses, eq(studyRuns.analysisId, analyses.id))
    .innerJoin(users, eq(studyRuns.attachedBy, users.id))
    .where(eq(studyRuns.studyId, studyId))
    .orderBy(asc(studyRuns.runNumber));
  const runIds = runs.map((r) => r.run.id);
  const indicators = runIds.length
    ? await db
        .select({ indicator: studyIndicators, recordedByName: users.name })
        .from(studyIndicators)
        .innerJoin(users, eq(studyIndicators.recordedBy, users.id))
        .where(inArray(studyIndicators.studyRunId, runIds))
        .orderBy(asc(studyIndicators.recordedAt), asc(studyIndicators.id))
    : [];
  const opener = alias(users, "opener");
  const closer = alias(users, "closer");
  const deviations = await db
    .select({ deviation: studyDeviations, openedByName: opener.name, closedByName: closer.name })
    .from(studyDeviations)
    .leftJoin(opener, eq(studyDeviations.openedBy, opener.id))
    .leftJoin(closer, eq(studyDeviations.closedBy, closer.id))
    .where(eq(studyDeviations.studyId, studyId))
    .orderBy(asc(studyDeviations.openedAt), asc(studyDeviations.id));
  const signatures = await db.select().from(studySignatures).where(eq(studySignatures.studyId, studyId)).orderBy(asc(studySignatures.signedAt), asc(studySignatures.id));
  const [report] = await db
    .select({ reportNumber: studyReports.reportNumber, sha256: studyReports.sha256, createdAt: studyReports.createdAt })
    .from(studyReports)
    .where(eq(studyReports.studyId, studyId))
    .orderBy(desc(studyReports.createdAt))
    .limit(1);
  return { ...head, runs, indicators, deviations, signatures, report: report ?? null };
}

export type StudyRecordRows = NonNullable<Awaited<ReturnType<typeof getStudyRecordRows>>>;

/** Signed cycles of this sterilizer and profile with an analysis, not yet attached to the study; newest first. */
export async function listAttachableCycleRows({ siteId, studyId, sterilizerId, profileId }: { siteId: string; studyId: string; sterilizerId: string; profileId: string }) {
  return getDb()
    .select({ id: cycles.id, cycleNumber: cycles.cycleNumber, startedAt: cycles.startedAt, status: cycles.status, verdict: cycles.verdict })
    .from(cycles)
    .where(
      and(
        eq(cycles.siteId, siteId),
        eq(cycles.sterilizerId, sterilizerId),
        eq(cycles.profileId, profileId),
        inArray(cycles.status, ["approved", "failure-confirmed"]),
        sql`${cycles.currentAnalysisId} is not null`,
        sql`not exists (select 1 from ${studyRuns} where ${studyRuns.studyId} = ${studyId} and ${studyRuns.cycleId} = ${cycles.id})`,
      ),
    )
    .orderBy(desc(cycles.startedAt), desc(cycles.createdAt))
    .limit(200);
}

/** A cycle of the site with its current analysis (result and the mapping it read). */
export async function getCycleWithAnalysis({ siteId, cycleId }: { siteId: string; cycleId: string }) {
  const [row] = await getDb()
    .select({ cycle: cycles, analysisResult: analyses.result, analysisMapping: analyses.mapping, analysisVerdict: analyses.verdict })
    .from(cycles)
    .leftJoin(analyses, eq(cycles.currentAnalysisId, analyses.id))
    .where(and(eq(cycles.id, cycleId), eq(cycles.siteId, siteId)))
    .limit(1);
  return row;
}

export async function countOtherStudiesOfPattern({ patternId, studyId }: { patternId: string; studyId: string }): Promise<number> {
  const [{ n }] = await getDb()
    .select({ n: count() })
    .from(studies)
    .where(and(eq(studies.loadingPatternId, patternId), sql`${studies.id} <> ${studyId}`));
  return n;
}

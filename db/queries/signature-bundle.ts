import "server-only";
import { asc, eq } from "drizzle-orm";
import { getDb, type Executor } from "@/db";
import { analyses, cycles, loggerFiles } from "@/db/schema";

/**
 * The stored rows a signature binds to: the cycle, the analysis that was shown, and every file's
 * bytes (in upload order), with the analysis the cycle points at now (id and time) to compare.
 * Null when the analysis does not belong to the cycle.
 */
export async function getRecordBundleRows({ cycleId, analysisId, tx }: { cycleId: string; analysisId: string; tx?: Executor }) {
  const db = tx ?? getDb();
  const [cycle] = await db.select().from(cycles).where(eq(cycles.id, cycleId)).limit(1);
  const [analysis] = await db.select().from(analyses).where(eq(analyses.id, analysisId)).limit(1);
  if (!cycle || !analysis || analysis.cycleId !== cycleId) return null;
  const files = await db
    .select({ name: loggerFiles.name, bytes: loggerFiles.bytes, uploadedAt: loggerFiles.uploadedAt })
    .from(loggerFiles)
    .where(eq(loggerFiles.cycleId, cycleId))
    .orderBy(asc(loggerFiles.uploadedAt), asc(loggerFiles.id));
  const [current] = cycle.currentAnalysisId ? await db.select({ id: analyses.id, createdAt: analyses.createdAt }).from(analyses).where(eq(analyses.id, cycle.currentAnalysisId)).limit(1) : [];
  return { cycle, analysis, files, currentAnalysis: current ?? null };
}

export type RecordBundleRows = NonNullable<Awaited<ReturnType<typeof getRecordBundleRows>>>;

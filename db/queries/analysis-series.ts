import "server-only";
import { eq } from "drizzle-orm";
import { getDb, type Executor } from "@/db";
import { analyses, analysisSeries, cycles } from "@/db/schema";

export type AnalysisSeriesColumns = { meta: unknown; sampleCount: number; timesS: Uint8Array; channelValues: Uint8Array; overview?: unknown };

const bufferOf = (bytes: Uint8Array) => Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);

/**
 * Stores the columns of the recording that the cycle's current analysis read. Called inside the
 * transaction that wrote that analysis (its id is already the cycle's current one), so both commit
 * or roll back together.
 */
export async function insertSeriesOfCurrentAnalysis(tx: Executor, { cycleId, columns }: { cycleId: string; columns: AnalysisSeriesColumns }) {
  const [cycle] = await tx.select({ analysisId: cycles.currentAnalysisId }).from(cycles).where(eq(cycles.id, cycleId)).limit(1);
  if (!cycle?.analysisId) throw new Error(`Cycle ${cycleId} has no current analysis to store a series for.`);
  await tx.insert(analysisSeries).values({
    analysisId: cycle.analysisId,
    meta: columns.meta,
    sampleCount: columns.sampleCount,
    timesS: bufferOf(columns.timesS),
    channelValues: bufferOf(columns.channelValues),
    overview: columns.overview ?? null,
  });
}

/** An analysis's stored columns with its result; undefined when the analysis is not there, series null when it predates stored columns. */
export async function getAnalysisSeries({ analysisId }: { analysisId: string }) {
  const [row] = await getDb()
    .select({
      result: analyses.result,
      meta: analysisSeries.meta,
      sampleCount: analysisSeries.sampleCount,
      timesS: analysisSeries.timesS,
      channelValues: analysisSeries.channelValues,
    })
    .from(analyses)
    .leftJoin(analysisSeries, eq(analysisSeries.analysisId, analyses.id))
    .where(eq(analyses.id, analysisId))
    .limit(1);
  if (!row) return undefined;
  const { result, meta, sampleCount, timesS, channelValues } = row;
  return { result, series: sampleCount === null || !timesS || !channelValues ? null : { meta, sampleCount, timesS, channelValues } };
}

/** The whole-record view stored with an analysis's columns, without reading the columns; null when none was stored. */
export async function getSeriesOverview({ analysisId }: { analysisId: string }): Promise<unknown> {
  const [row] = await getDb().select({ overview: analysisSeries.overview }).from(analysisSeries).where(eq(analysisSeries.analysisId, analysisId)).limit(1);
  return row?.overview ?? null;
}

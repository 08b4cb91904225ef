import "server-only";
import { getAnalysedFile, getCycleRow } from "@/db/queries/cycles";
import { readLoggerFile, type MappingOverrides, type Recording } from "@/lib/logger-files";
import { getAnalysisSeries, getSeriesOverview } from "@/db/queries/analysis-series";
import { buildSeries, recordingFromColumns, usableOverview, type SeriesMeta } from "@/lib/cycles/series";
import { OVERVIEW_POINTS } from "@/lib/cycles/chart-model";
import type { CycleAnalysis } from "@/lib/analysis/types";
import type { SeriesResponse } from "@/lib/cycles/contracts";
import { processLru } from "@/lib/lru";
import { assertAllowed, type Actor } from "./access";

// Decoding the stored columns (or, for an older analysis, re-reading the file) is the costly part of a chart
// request; keep the last few recordings (an analysis is never changed) so that zooming does not repeat it.
type Loaded = { recording: Recording; result: CycleAnalysis };
const recordingCache = processLru<Loaded>("recordings", 4);

/** The recording an analysis read: from its stored columns, or by parsing its file again when it has none (analyses made before they were stored). */
async function readRecording(analysisId: string): Promise<Loaded | undefined> {
  const stored = await getAnalysisSeries({ analysisId });
  if (!stored) return undefined;
  const recording = stored.series ? recordingFromColumns({ ...stored.series, meta: stored.series.meta as SeriesMeta }) : undefined;
  if (recording) return { recording, result: stored.result as CycleAnalysis };
  const row = await getAnalysedFile({ analysisId });
  if (!row) return undefined;
  return { recording: readLoggerFile(new Uint8Array(row.bytes), (row.fileMapping ?? {}) as MappingOverrides).recording, result: row.result as CycleAnalysis };
}

async function recordingOfAnalysis(analysisId: string): Promise<Loaded | undefined> {
  const cached = recordingCache.get(analysisId);
  if (cached) return cached;
  const loaded = await readRecording(analysisId);
  if (loaded) recordingCache.set(analysisId, loaded);
  return loaded;
}

/** Chart data of a cycle's current analysis; undefined when the cycle or its analysis is not there. */
export async function getCycleSeries({
  actor,
  id,
  fromS,
  toS,
  points = OVERVIEW_POINTS,
}: {
  actor: Actor;
  id: string;
  fromS?: number;
  toS?: number;
  points?: number;
}): Promise<SeriesResponse | undefined> {
  assertAllowed(actor, "cycle:read", "read cycles");
  const cycle = await getCycleRow({ actor, id });
  if (!cycle?.currentAnalysisId) return undefined;
  const maxPoints = Math.min(Math.max(Math.trunc(points), 50), 20000);
  // The whole-record view was built when the analysis was stored (an analysis never changes): no sample is read.
  const overview = fromS === undefined && toS === undefined ? usableOverview(await getSeriesOverview({ analysisId: cycle.currentAnalysisId }), maxPoints) : null;
  if (overview) return { ...overview, startedAt: cycle.startedAt ?? overview.startedAt };
  const loaded = await recordingOfAnalysis(cycle.currentAnalysisId);
  if (!loaded) return undefined;
  const series = buildSeries(loaded.recording, loaded.result, { fromS, toS, points: maxPoints });
  // The cycle's start instant (the file's clock read in the site's zone, or the start the user gave
  // for an elapsed-only file), so the chart's clock times are the site's.
  return { ...series, startedAt: cycle.startedAt ?? series.startedAt };
}

import "server-only";
import { getAnalysedFile, getCycleRow } from "@/db/queries/cycles";
import { readLoggerFile, type MappingOverrides, type Recording } from "@/lib/logger-files";
import { buildSeries } from "@/lib/cycles/series";
import type { CycleAnalysis } from "@/lib/analysis/types";
import type { SeriesResponse } from "@/lib/cycles/contracts";
import { assertAllowed, type Actor } from "./access";

// Re-reading a day-long file costs a few hundred milliseconds; keep the last few parsed recordings
// so that zooming the chart does not parse it again.
const holder = globalThis as unknown as { __papinRecordings?: Map<string, Recording> };
const recordingCache = holder.__papinRecordings ?? new Map<string, Recording>();
holder.__papinRecordings = recordingCache;
const CACHED_RECORDINGS = 4;

async function recordingOfAnalysis(analysisId: string): Promise<{ recording: Recording; result: CycleAnalysis } | undefined> {
  const row = await getAnalysedFile({ analysisId });
  if (!row) return undefined;
  let recording = recordingCache.get(analysisId);
  if (!recording) {
    recording = readLoggerFile(new Uint8Array(row.bytes), (row.fileMapping ?? {}) as MappingOverrides).recording;
    recordingCache.set(analysisId, recording);
    while (recordingCache.size > CACHED_RECORDINGS) recordingCache.delete(recordingCache.keys().next().value!);
  }
  return { recording, result: row.result as CycleAnalysis };
}

/** Chart data of a cycle's current analysis; undefined when the cycle or its analysis is not there. */
export async function getCycleSeries({ actor, id, fromS, toS, points = 3000 }: { actor: Actor; id: string; fromS?: number; toS?: number; points?: number }): Promise<SeriesResponse | undefined> {
  assertAllowed(actor, "cycle:read", "read cycles");
  const cycle = await getCycleRow({ actor, id });
  if (!cycle?.currentAnalysisId) return undefined;
  const loaded = await recordingOfAnalysis(cycle.currentAnalysisId);
  if (!loaded) return undefined;
  const maxPoints = Math.min(Math.max(Math.trunc(points), 50), 20000);
  const series = buildSeries(loaded.recording, loaded.result, { fromS, toS, points: maxPoints });
  // The cycle's start instant (the file's clock read in the site's zone, or the start the user gave
  // for an elapsed-only file), so the chart's clock times are the site's.
  return { ...series, startedAt: cycle.startedAt ?? series.startedAt };
}

import { downsampleSeries, saturationTemperatureSeries, thermometricOf, type CycleAnalysis } from "@/lib/analysis";
import type { Recording } from "@/lib/logger-files";
import type { SeriesResponse } from "./contracts";
import { OVERVIEW_POINTS } from "./chart-model";

const finiteOrNull = (v: number) => (Number.isFinite(v) ? Math.round(v * 1000) / 1000 : null);

/**
 * Chart data of one recording as GET /api/cycles/{id}/series sends it: every temperature channel,
 * chamber pressure and the saturation temperature from pressure, downsampled keeping each bucket's
 * extremes, or at full resolution when the window holds no more samples than `points`.
 */
export function buildSeries(recording: Recording, result: CycleAnalysis, { fromS, toS, points }: { fromS?: number; toS?: number; points: number }): SeriesResponse {
  const saturation = saturationTemperatureSeries(recording.pressure.values);
  // An air leakage test has no plateau, band or saturation flags; its chart takes the pressure alone.
  const thermometric = thermometricOf(result);
  const temps = recording.temperatures;
  const all = [...temps.map((t) => t.values), recording.pressure.values, saturation];
  const down = downsampleSeries(recording.timesS, all, points, fromS, toS);
  const times = recording.timesS;
  const n = times.length;
  const from = fromS ?? times[0] ?? 0;
  const to = toS ?? times[n - 1] ?? 0;
  let inWindow = 0;
  for (let i = 0; i < n; i++) if (times[i] >= from && times[i] <= to) inWindow++;
  return {
    startedAt: recording.startedAt,
    timesS: down.timesS.map((t) => Math.round(t * 1000) / 1000),
    channels: [
      ...temps.map((t, i) => ({
        header: t.header,
        kind: "temperature" as const,
        unit: "°C",
        role: i === recording.referenceIndex ? ("reference" as const) : ("load" as const),
        values: down.series[i].map(finiteOrNull),
      })),
      { header: recording.pressure.header, kind: "pressure" as const, unit: "kPa abs", role: "pressure" as const, values: down.series[temps.length].map(finiteOrNull) },
      { header: "Saturation temperature from pressure", kind: "saturation" as const, unit: "°C", role: "saturation" as const, values: down.series[temps.length + 1].map(finiteOrNull) },
    ],
    plateau: thermometric?.plateau ?? null,
    band: thermometric ? { low: thermometric.limits.sterilizationTempC, high: thermometric.limits.sterilizationTempC + thermometric.limits.bandK } : { low: 0, high: 0 },
    flags: thermometric?.saturation.flags ?? [],
    window: { from, to },
    totalSamples: n,
    fullResolution: inWindow <= points,
  };
}

/**
 * The whole-record view as each analysis stores it (analysis_series.overview). `format` names the shape buildSeries
 * gives: raise SERIES_FORMAT when that shape or its downsampling changes, and stored views of the old format are
 * ignored (the series is built from the columns again).
 */
export const SERIES_FORMAT = 1;
export type StoredOverview = { format: number; points: number; series: SeriesResponse };

export function seriesOverviewOf(recording: Recording, result: CycleAnalysis): StoredOverview {
  return { format: SERIES_FORMAT, points: OVERVIEW_POINTS, series: buildSeries(recording, result, { points: OVERVIEW_POINTS }) };
}

/** A stored whole-record view this code can serve as the answer to a request for `points` over the whole record; null otherwise. */
export function usableOverview(stored: unknown, points: number): SeriesResponse | null {
  const overview = stored as Partial<StoredOverview> | null | undefined;
  if (!overview || overview.format !== SERIES_FORMAT || overview.points !== points || !overview.series) return null;
  return overview.series;
}

/** What the stored columns of a recording carry besides the samples. */
export type SeriesMeta = {
  startedAt: string | null;
  temperatureHeaders: string[];
  pressureHeader: string;
  referenceIndex: number;
  freeSpaceIndex?: number;
  source?: Recording["source"];
};

export type RecordingColumns = { meta: SeriesMeta; sampleCount: number; timesS: Uint8Array; channelValues: Uint8Array };

// Float64 keeps every sample exactly, so a chart from the columns equals one from a re-parse; the
// bytes are the machine's order, which the columns require to be little-endian.
const littleEndian = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

const float64Of = (bytes: Uint8Array) => {
  const aligned = new Uint8Array(bytes.byteLength);
  aligned.set(bytes);
  return new Float64Array(aligned.buffer);
};

/** A recording as stored columns: times, then each temperature channel, then chamber pressure. */
export function recordingToColumns(recording: Recording): RecordingColumns {
  if (!littleEndian) throw new Error("Stored series columns are little-endian; this machine is not.");
  const n = recording.timesS.length;
  const channels = [...recording.temperatures.map((t) => t.values), recording.pressure.values];
  const values = new Float64Array(n * channels.length);
  channels.forEach((c, i) => values.set(c.subarray(0, n), i * n));
  const { startedAt, referenceIndex, freeSpaceIndex, source } = recording;
  return {
    meta: { startedAt, temperatureHeaders: recording.temperatures.map((t) => t.header), pressureHeader: recording.pressure.header, referenceIndex, freeSpaceIndex, source },
    sampleCount: n,
    timesS: new Uint8Array(recording.timesS.buffer, recording.timesS.byteOffset, n * 8),
    channelValues: new Uint8Array(values.buffer),
  };
}

/** The recording back from its columns; undefined when their sizes do not add up (then the file is read again). */
export function recordingFromColumns({ meta, sampleCount: n, timesS, channelValues }: RecordingColumns): Recording | undefined {
  const channelCount = meta.temperatureHeaders.length + 1;
  if (!littleEndian || timesS.byteLength !== n * 8 || channelValues.byteLength !== n * 8 * channelCount) return undefined;
  const values = float64Of(channelValues);
  const channel = (i: number) => values.subarray(i * n, (i + 1) * n);
  return {
    startedAt: meta.startedAt,
    timesS: float64Of(timesS),
    temperatures: meta.temperatureHeaders.map((header, i) => ({ header, values: channel(i) })),
    pressure: { header: meta.pressureHeader, values: channel(channelCount - 1) },
    referenceIndex: meta.referenceIndex,
    ...(meta.freeSpaceIndex === undefined ? {} : { freeSpaceIndex: meta.freeSpaceIndex }),
    ...(meta.source === undefined ? {} : { source: meta.source }),
  };
}

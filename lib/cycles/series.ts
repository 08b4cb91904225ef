import { downsampleSeries, saturationTemperatureSeries, thermometricOf, type CycleAnalysis } from "@/lib/analysis";
import type { Recording } from "@/lib/logger-files";
import type { SeriesResponse } from "./contracts";

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

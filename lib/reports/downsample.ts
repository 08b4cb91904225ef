import { pickExtremes, takeAt } from "@/lib/analysis/downsample";
import type { SeriesResponse } from "@/lib/cycles/contracts";

/**
 * The series cut to at most maxPoints points for print by the one downsampler (lib/analysis):
 * each bucket's lowest and highest reading per channel, so no peak or dip is lost; a bucket with
 * no reading stays a gap. With fromS/toS only that window is kept. Plateau, band, flags and totals
 * are carried over.
 */
export function downsampleForReport(series: SeriesResponse, maxPoints: number, fromS?: number, toS?: number): SeriesResponse {
  const times = series.timesS;
  const { begin, end, buckets } = pickExtremes(
    times,
    series.channels.map((c) => c.values),
    maxPoints,
    fromS,
    toS,
  );
  const window = end - begin > 0 ? { from: times[begin], to: times[end - 1] } : series.window;
  if (!buckets) {
    const whole = begin === 0 && end === times.length;
    return {
      ...series,
      timesS: whole ? times : times.slice(begin, end),
      channels: whole ? series.channels : series.channels.map((c) => ({ ...c, values: c.values.slice(begin, end) })),
      window,
    };
  }
  return {
    ...series,
    timesS: takeAt(times, buckets.timeIndexes, null) as number[],
    channels: series.channels.map((c, k) => ({ ...c, values: takeAt(c.values, buckets.valueIndexes[k], null) })),
    window,
    fullResolution: false,
  };
}

/**
 * Every n-th sample (plus the last), untouched: for the phase diagram, where a temperature has to
 * be paired with the pressure read at the same instant.
 */
export function strideIndexes(length: number, maxPoints: number, keepFrom?: number, keepTo?: number): number[] {
  if (length <= 0) return [];
  const step = Math.max(1, Math.ceil(length / Math.max(2, maxPoints)));
  const out: number[] = [];
  for (let i = 0; i < length; i += step) out.push(i);
  if (keepFrom !== undefined && keepTo !== undefined) {
    const fineStep = Math.max(1, Math.ceil((keepTo - keepFrom) / Math.max(2, maxPoints / 2)));
    for (let i = keepFrom; i <= keepTo && i < length; i += fineStep) out.push(i);
    out.sort((a, b) => a - b);
  }
  if (out[out.length - 1] !== length - 1) out.push(length - 1);
  return out.filter((v, i) => i === 0 || v !== out[i - 1]);
}

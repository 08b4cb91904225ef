import type { SeriesResponse } from "@/lib/cycles/contracts";
import { lowerBound } from "@/lib/analysis/downsample";

/**
 * The series cut to at most maxPoints points for print, keeping each bucket's lowest and highest
 * reading per channel (in the order they came), so no peak or dip is lost; a bucket with no
 * reading stays a gap.
 * With fromS/toS only that window is kept. Plateau, band, flags and totals are carried over.
 */
export function downsampleForReport(series: SeriesResponse, maxPoints: number, fromS?: number, toS?: number): SeriesResponse {
  const times = series.timesS;
  const begin = fromS === undefined ? 0 : lowerBound(times, fromS);
  const end = toS === undefined ? times.length : lowerBound(times, toS + 1e-9 * Math.max(1, Math.abs(toS)));
  const count = Math.max(0, end - begin);
  const limit = Math.max(2, Math.floor(maxPoints));
  const window = count > 0 ? { from: times[begin], to: times[end - 1] } : series.window;
  if (count <= limit) {
    const whole = begin === 0 && end === times.length;
    return {
      ...series,
      timesS: whole ? times : times.slice(begin, end),
      channels: whole ? series.channels : series.channels.map((c) => ({ ...c, values: c.values.slice(begin, end) })),
      window,
    };
  }
  const buckets = Math.floor(limit / 2);
  const outTimes: number[] = new Array(buckets * 2);
  const outValues: Array<Array<number | null>> = series.channels.map(() => new Array(buckets * 2));
  for (let b = 0; b < buckets; b++) {
    const from = begin + Math.floor((b * count) / buckets);
    const to = begin + Math.floor(((b + 1) * count) / buckets);
    outTimes[2 * b] = times[from];
    outTimes[2 * b + 1] = times[to - 1];
    for (let k = 0; k < series.channels.length; k++) {
      const values = series.channels[k].values;
      let minIndex = -1;
      let maxIndex = -1;
      for (let i = from; i < to; i++) {
        const v = values[i];
        if (v === null || v === undefined || !Number.isFinite(v)) continue;
        if (minIndex < 0 || v < (values[minIndex] as number)) minIndex = i;
        if (maxIndex < 0 || v > (values[maxIndex] as number)) maxIndex = i;
      }
      if (minIndex < 0) {
        outValues[k][2 * b] = null;
        outValues[k][2 * b + 1] = null;
        continue;
      }
      const firstIsMin = minIndex <= maxIndex;
      outValues[k][2 * b] = values[firstIsMin ? minIndex : maxIndex] as number;
      outValues[k][2 * b + 1] = values[firstIsMin ? maxIndex : minIndex] as number;
    }
  }
  return {
    ...series,
    timesS: outTimes,
    channels: series.channels.map((c, k) => ({ ...c, values: outValues[k] })),
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

export { lowerBound as indexAtOrAfter };

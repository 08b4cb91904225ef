export type DownsampledSeries = { timesS: number[]; series: number[][] };

/** First index whose time is at or after `value` (times ascending). */
export function lowerBound(times: ArrayLike<number>, value: number): number {
  let lo = 0;
  let hi = times.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (times[mid] < value) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Reduces series on a shared time axis to at most maxPoints points for a chart. Each bucket
 * keeps two points: for every series its minimum and maximum, in the order they occurred,
 * placed at the bucket's first and last sample times; so no peak or dip disappears. Windows
 * with no more than maxPoints samples come back at full resolution.
 */
export function downsampleSeries(timesS: Float64Array, series: Float64Array[], maxPoints: number, fromS?: number, toS?: number): DownsampledSeries {
  const begin = fromS === undefined ? 0 : lowerBound(timesS, fromS);
  const end = toS === undefined ? timesS.length : lowerBound(timesS, toS + 1e-9 * Math.max(1, Math.abs(toS)));
  const count = Math.max(0, end - begin);
  const limit = Math.max(2, Math.floor(maxPoints));
  if (count <= limit) {
    return {
      timesS: Array.from(timesS.subarray(begin, end)),
      series: series.map((s) => Array.from(s.subarray(begin, end))),
    };
  }
  const buckets = Math.floor(limit / 2);
  const outTimes: number[] = new Array(buckets * 2);
  const outSeries: number[][] = series.map(() => new Array(buckets * 2));
  for (let b = 0; b < buckets; b++) {
    const from = begin + Math.floor((b * count) / buckets);
    const to = begin + Math.floor(((b + 1) * count) / buckets); // exclusive
    outTimes[2 * b] = timesS[from];
    outTimes[2 * b + 1] = timesS[to - 1];
    for (let k = 0; k < series.length; k++) {
      const values = series[k];
      let minIndex = from;
      let maxIndex = from;
      for (let i = from + 1; i < to; i++) {
        const v = values[i];
        if (v < values[minIndex]) minIndex = i;
        if (v > values[maxIndex]) maxIndex = i;
      }
      const firstIsMin = minIndex <= maxIndex;
      outSeries[k][2 * b] = firstIsMin ? values[minIndex] : values[maxIndex];
      outSeries[k][2 * b + 1] = firstIsMin ? values[maxIndex] : values[minIndex];
    }
  }
  return { timesS: outTimes, series: outSeries };
}

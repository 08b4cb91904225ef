/**
 * The one downsampler, for the web chart's series and the PDF report alike. Each bucket keeps two
 * points: for every series its lowest and highest reading, in the order they occurred, placed at
 * the bucket's first and last sample times; so no peak or dip disappears. A reading that is not a
 * finite number (a gap) is passed over; a bucket with no reading stays a gap. Windows with no more
 * than maxPoints samples come back at full resolution.
 */

export type DownsampledSeries = { timesS: number[]; series: number[][] };

/** The samples kept, by index: the window [begin, end) and, when it had to be cut, two indexes per bucket. */
export type ExtremesPick = {
  begin: number;
  end: number;
  /** null when the window fits in maxPoints: take every sample from begin to end */
  buckets: null | {
    /** the bucket's first and last sample, for the time axis */
    timeIndexes: Int32Array;
    /** per series, the sample of each kept reading; −1 where the bucket holds no reading */
    valueIndexes: Int32Array[];
  };
};

type Readings = ArrayLike<number | null | undefined>;

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

export function pickExtremes(timesS: ArrayLike<number>, series: ReadonlyArray<Readings>, maxPoints: number, fromS?: number, toS?: number): ExtremesPick {
  const begin = fromS === undefined ? 0 : lowerBound(timesS, fromS);
  const end = toS === undefined ? timesS.length : lowerBound(timesS, toS + 1e-9 * Math.max(1, Math.abs(toS)));
  const count = Math.max(0, end - begin);
  const limit = Math.max(2, Math.floor(maxPoints));
  if (count <= limit) return { begin, end, buckets: null };
  const buckets = Math.floor(limit / 2);
  const timeIndexes = new Int32Array(buckets * 2);
  const valueIndexes = series.map(() => new Int32Array(buckets * 2));
  for (let b = 0; b < buckets; b++) {
    const from = begin + Math.floor((b * count) / buckets);
    const to = begin + Math.floor(((b + 1) * count) / buckets); // exclusive
    timeIndexes[2 * b] = from;
    timeIndexes[2 * b + 1] = to - 1;
    for (let k = 0; k < series.length; k++) pickBucket(series[k], from, to, valueIndexes[k], 2 * b);
  }
  return { begin, end, buckets: { timeIndexes, valueIndexes } };
}

function pickBucket(values: Readings, from: number, to: number, out: Int32Array, at: number): void {
  let minIndex = -1;
  let maxIndex = -1;
  let min = Infinity;
  let max = -Infinity;
  for (let i = from; i < to; i++) {
    const v = values[i] as number;
    if (!Number.isFinite(v)) continue; // null, undefined and NaN included
    if (v < min) {
      minIndex = i;
      min = v;
    }
    if (v > max) {
      maxIndex = i;
      max = v;
    }
  }
  const firstIsMin = minIndex <= maxIndex;
  out[at] = firstIsMin ? minIndex : maxIndex;
  out[at + 1] = firstIsMin ? maxIndex : minIndex;
}

/** Series on a shared time axis cut to at most maxPoints points for the web chart; a gap comes back as NaN. */
export function downsampleSeries(timesS: Float64Array, series: Float64Array[], maxPoints: number, fromS?: number, toS?: number): DownsampledSeries {
  const { begin, end, buckets } = pickExtremes(timesS, series, maxPoints, fromS, toS);
  if (!buckets) {
    return { timesS: Array.from(timesS.subarray(begin, end)), series: series.map((s) => Array.from(s.subarray(begin, end))) };
  }
  return { timesS: takeAt(timesS, buckets.timeIndexes, NaN), series: series.map((s, k) => takeAt(s, buckets.valueIndexes[k], NaN)) };
}

/** The readings at the picked indexes, `gap` where none was picked (−1). */
export function takeAt<T extends number | null>(values: ArrayLike<number | null | undefined>, indexes: Int32Array, gap: T): Array<number | T> {
  const out = new Array<number | T>(indexes.length);
  for (let j = 0; j < indexes.length; j++) {
    const i = indexes[j];
    out[j] = i < 0 ? gap : (values[i] as number);
  }
  return out;
}

/**
 * The one chart-scale module: value→pixel scales, round-number ticks and SVG path data, shared by
 * the record page's charts and the PDF report's charts. Pure: numbers in, numbers and strings out.
 */

export type Scale = (value: number) => number;

export function scaleLinear(domain: [number, number], range: [number, number]): Scale {
  const [d0, d1] = domain;
  const [r0, r1] = range;
  const k = d1 === d0 ? 0 : (r1 - r0) / (d1 - d0);
  return (v: number) => r0 + (v - d0) * k;
}

export function scaleLog(domain: [number, number], range: [number, number]): Scale {
  const linear = scaleLinear([Math.log10(domain[0]), Math.log10(domain[1])], range);
  return (v: number) => linear(Math.log10(v));
}

// ---------------------------------------------------------------------------------------------
// Ticks

const STEPS = [1, 2, 5, 10];
const STEPS_WITH_QUARTERS = [1, 2, 2.5, 5, 10];

/** The smallest round step (a mantissa × 10^k) at least as wide as `rawStep`. */
function niceStep(rawStep: number, mantissas: readonly number[] = STEPS): number {
  const magnitude = 10 ** Math.floor(Math.log10(rawStep));
  return (mantissas.find((m) => m * magnitude >= rawStep) ?? 10) * magnitude;
}

/** Round-number ticks covering [min, max] (the axis grows to the outer ticks), about `count` of them. */
export function niceTicks(min: number, max: number, count = 6): { ticks: number[]; min: number; max: number; step: number } {
  if (!Number.isFinite(min) || !Number.isFinite(max)) return { ticks: [0, 1], min: 0, max: 1, step: 1 };
  if (max - min < 1e-9) {
    min -= 1;
    max += 1;
  }
  const step = niceStep((max - min) / Math.max(1, count), STEPS_WITH_QUARTERS);
  const lo = Math.floor(min / step + 1e-9) * step;
  const hi = Math.ceil(max / step - 1e-9) * step;
  const ticks: number[] = [];
  for (let v = lo; v <= hi + step * 1e-6; v += step) ticks.push(Number(v.toPrecision(12)) + 0);
  return { ticks, min: lo, max: hi, step };
}

/** Round-number ticks inside a fixed [min, max]: steps of 1, 2 or 5 × 10^k, about `target` of them. */
export function linearTicks(min: number, max: number, target = 8): number[] {
  if (!(max > min)) return [min];
  const step = niceStep((max - min) / Math.max(target, 1));
  const ticks: number[] = [];
  for (let v = Math.ceil(min / step) * step; v <= max + step * 1e-9; v += step) ticks.push(Number(v.toPrecision(12)));
  return ticks;
}

/** Log-axis ticks: 1-2-5 per decade when few decades are shown, whole decades when many. */
export function logTicks(min: number, max: number): Array<{ value: number; major: boolean }> {
  if (!(min > 0 && max > min)) return [];
  const decades = Math.log10(max) - Math.log10(min);
  // A narrow window (a plateau close-up) reads best with evenly stepped values.
  if (decades < 0.5)
    return linearTicks(min, max, 8)
      .filter((v) => v >= min && v <= max)
      .map((value) => ({ value, major: false }));
  const mantissas = decades <= 1.2 ? [1, 1.5, 2, 3, 4, 5, 6, 8] : decades <= 2.5 ? [1, 2, 3, 5] : decades <= 5 ? [1, 3] : [1];
  const out: Array<{ value: number; major: boolean }> = [];
  for (let k = Math.floor(Math.log10(min)); k <= Math.ceil(Math.log10(max)); k++) {
    for (const m of mantissas) {
      const value = Number((m * 10 ** k).toPrecision(12));
      if (value >= min * (1 - 1e-9) && value <= max * (1 + 1e-9)) out.push({ value, major: m === 1 });
    }
  }
  return out;
}

/** Steps of an elapsed-time axis in seconds: tenths for a close-up, then whole minutes and hours. */
export const TIME_STEPS_S = [0.1, 0.2, 0.5, 1, 2, 5, 10, 15, 30, 60, 120, 300, 600, 900, 1200, 1800, 3600, 7200, 10800, 14400, 21600, 43200, 86400] as const;

/** Ticks on an elapsed-time axis in seconds, about `count` of them, no closer than `minStepS`. */
export function timeTicks(fromS: number, toS: number, count = 8, minStepS = 5): { ticks: number[]; stepS: number } {
  const span = Math.max(1, toS - fromS);
  const stepS = TIME_STEPS_S.find((s) => s >= minStepS && span / s <= count) ?? Math.ceil(span / count / 86400) * 86400;
  const ticks: number[] = [];
  for (let v = Math.ceil(fromS / stepS - 1e-9) * stepS; v <= toS + 1e-6; v += stepS) ticks.push(v + 0); // + 0 turns −0 into 0
  return { ticks, stepS };
}

/** Smallest and largest finite value over several series. */
export function extent(series: Array<ArrayLike<number | null>>): [number, number] | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const values of series) {
    for (let i = 0; i < values.length; i++) {
      const v = values[i];
      if (v === null || v === undefined || !Number.isFinite(v)) continue;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  return lo <= hi ? [lo, hi] : null;
}

// ---------------------------------------------------------------------------------------------
// Paths

/**
 * SVG path data built point by point, in pixels rounded to `decimals` places. A point that is not
 * finite lifts the pen; a point that rounds onto the one before is dropped, so the path stays small.
 */
function pathWriter(decimals: number) {
  const k = 10 ** decimals;
  let d = "";
  let pen = false;
  let lastX = NaN;
  let lastY = NaN;
  return {
    lift() {
      pen = false;
    },
    to(x: number, y: number) {
      if (!Number.isFinite(x) || !Number.isFinite(y)) {
        pen = false;
        return;
      }
      const px = Math.round(x * k) / k + 0;
      const py = Math.round(y * k) / k + 0;
      if (pen && px === lastX && py === lastY) return;
      d += `${pen ? "L" : "M"}${px} ${py}`;
      pen = true;
      lastX = px;
      lastY = py;
    },
    text: () => d,
  };
}

/** A line through a series (xs[i], ys[i]), broken where a value is missing. */
export function linePath(xs: ArrayLike<number>, ys: ArrayLike<number | null>, x: Scale, y: Scale, decimals = 2): string {
  const path = pathWriter(decimals);
  for (let i = 0; i < xs.length; i++) {
    const v = ys[i];
    if (v === null || v === undefined) path.lift();
    else path.to(x(xs[i]), y(v));
  }
  return path.text();
}

/**
 * A line through (x, y) data points, broken at a null point or one the scales cannot place (a
 * missing value, or a pressure of zero on a log scale); `close` joins the end back to the start.
 */
export function pointsPath(points: ReadonlyArray<readonly [number, number] | null>, x: Scale, y: Scale, options: { close?: boolean; decimals?: number } = {}): string {
  const path = pathWriter(options.decimals ?? 2);
  for (const point of points) {
    if (point === null) path.lift();
    else path.to(x(point[0]), y(point[1]));
  }
  const d = path.text();
  return options.close && d ? `${d}Z` : d;
}

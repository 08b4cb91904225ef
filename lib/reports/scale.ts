/** Scales, ticks and path strings for the report's vector charts (pure). */


export function scaleLinear(domain: [number, number], range: [number, number]) {
  const [d0, d1] = domain;
  const [r0, r1] = range;
  const k = d1 === d0 ? 0 : (r1 - r0) / (d1 - d0);
  return (v: number) => r0 + (v - d0) * k;
}

export function scaleLog(domain: [number, number], range: [number, number]) {
  const linear = scaleLinear([Math.log10(domain[0]), Math.log10(domain[1])], range);
  return (v: number) => linear(Math.log10(v));
}

const NICE = [1, 2, 2.5, 5, 10];

/** Round-number ticks covering [min, max], about `count` of them. */
export function niceTicks(min: number, max: number, count = 6): { ticks: number[]; min: number; max: number; step: number } {
  if (!Number.isFinite(min) || !Number.isFinite(max)) return { ticks: [0, 1], min: 0, max: 1, step: 1 };
  if (max - min < 1e-9) {
    min -= 1;
    max += 1;
  }
  const raw = (max - min) / Math.max(1, count);
  const magnitude = 10 ** Math.floor(Math.log10(raw));
  const step = (NICE.find((n) => n * magnitude >= raw) ?? 10) * magnitude;
  const lo = Math.floor(min / step + 1e-9) * step;
  const hi = Math.ceil(max / step - 1e-9) * step;
  const ticks: number[] = [];
  for (let v = lo; v <= hi + step * 1e-6; v += step) ticks.push(Number(v.toPrecision(12)) + 0);
  return { ticks, min: lo, max: hi, step };
}

const TIME_STEPS_S = [5, 10, 15, 30, 60, 120, 300, 600, 900, 1200, 1800, 3600, 7200, 10800, 14400, 21600, 43200, 86400];

/** Ticks on an elapsed-time axis in seconds, at whole minutes or hours once the span allows. */
export function timeTicks(fromS: number, toS: number, count = 8): { ticks: number[]; stepS: number } {
  const span = Math.max(1, toS - fromS);
  const stepS = TIME_STEPS_S.find((s) => span / s <= count) ?? Math.ceil(span / count / 86400) * 86400;
  const ticks: number[] = [];
  for (let v = Math.ceil(fromS / stepS - 1e-9) * stepS; v <= toS + 1e-6; v += stepS) ticks.push(v + 0); // + 0 turns −0 into 0
  return { ticks, stepS };
}

export function timeTickLabel(seconds: number, stepS: number): string {
  if (stepS >= 3600) return `${Math.round(seconds / 3600)} h`;
  if (stepS >= 60) {
    const minutes = Math.round(seconds / 60);
    return minutes >= 120 ? `${Math.floor(minutes / 60)} h ${String(minutes % 60).padStart(2, "0")}` : `${minutes}`;
  }
  const m = Math.floor(seconds / 60);
  const s = Math.round(seconds - m * 60);
  return `${m}:${String(s).padStart(2, "0")}`;
}

export function timeAxisUnit(stepS: number): string {
  if (stepS >= 3600) return "h";
  if (stepS >= 60) return "min";
  return "min:s";
}

const r = (v: number) => Math.round(v * 100) / 100;

/**
 * An SVG path through the points, broken where a value is missing; consecutive points that land
 * on the same spot are dropped so the path stays small.
 */
export function linePath(xs: ArrayLike<number>, ys: ArrayLike<number | null>, x: (v: number) => number, y: (v: number) => number): string {
  let d = "";
  let pen = false;
  let lastX = NaN;
  let lastY = NaN;
  for (let i = 0; i < xs.length; i++) {
    const v = ys[i];
    if (v === null || v === undefined || !Number.isFinite(v)) {
      pen = false;
      continue;
    }
    const px = r(x(xs[i]));
    const py = r(y(v));
    if (pen && px === lastX && py === lastY) continue;
    d += `${pen ? "L" : "M"}${px} ${py}`;
    pen = true;
    lastX = px;
    lastY = py;
  }
  return d;
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

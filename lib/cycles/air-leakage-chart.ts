import type { AirLeakageResult, LeakTimeSource } from "@/lib/analysis/air-leakage-types";
import { linePath, niceTicks, scaleLinear, timeTicks } from "@/lib/charts/scale";
import type { SeriesResponse } from "./contracts";

export type LeakMark = { label: "t1" | "t2" | "t3"; timeS: number; pressureKpa: number | null; source: LeakTimeSource; x: number; y: number | null };

/** The air leakage chart in pixels: the pressure trace around the test, t1/t2/t3 marked, the vacuum set point; the record page and the report draw the same. */
export type LeakChartGeometry = {
  plot: { x: number; y: number; w: number; h: number };
  path: string;
  marks: LeakMark[];
  setPoint: { y: number; kpa: number } | null;
  pressureTicks: Array<{ y: number; kpa: number }>;
  timeTicks: Array<{ x: number; s: number }>;
  timeStepS: number;
  window: { from: number; to: number };
};

/** The span the chart shows: a minute (or a tenth of the test) either side of t1 to t3, inside the record. */
export function leakChartWindow(analysis: AirLeakageResult, recordEndS: number): { from: number; to: number } {
  const margin = Math.max(60, (analysis.t3 - analysis.t1) * 0.1);
  return { from: Math.max(0, Math.min(analysis.vacuum.atS, analysis.t1) - margin), to: Math.min(recordEndS, analysis.t3 + margin) };
}

/** Lays out the pressure chart for one width and height; margins hold the axis labels. */
export function leakChartGeometry(series: SeriesResponse, analysis: AirLeakageResult, size: { width: number; height: number }): LeakChartGeometry {
  const pressure = series.channels.find((c) => c.kind === "pressure");
  const times = series.timesS;
  const window = leakChartWindow(analysis, times[times.length - 1] ?? analysis.t3);
  const plot = { x: 40, y: 10, w: size.width - 52, h: size.height - 38 };
  const values: number[] = [analysis.limits.vacuumSetPointKpaAbs];
  for (const p of [analysis.p1, analysis.p2, analysis.p3]) if (p !== null) values.push(p);
  // The scale fits the hold (deepest vacuum to t3), where the leak shows; the evacuation above it leaves the plot.
  const holdFrom = Math.min(analysis.vacuum.atS, analysis.t1);
  times.forEach((t, i) => {
    const v = pressure?.values[i];
    if (t >= holdFrom && t <= analysis.t3 && v !== null && v !== undefined) values.push(v);
  });
  const [low, high] = [Math.min(...values), Math.max(...values)];
  const ticks = niceTicks(low - (high - low) * 0.05, high + (high - low) * 0.05, 5);
  const x = scaleLinear([window.from, Math.max(window.to, window.from + 1)], [plot.x, plot.x + plot.w]);
  const y = scaleLinear([ticks.min, ticks.max], [plot.y + plot.h, plot.y]);
  const inWindow = times.map((t) => (t >= window.from && t <= window.to ? t : NaN));
  const time = timeTicks(window.from, window.to, 7, 30);
  const mark = (label: LeakMark["label"], timeS: number, pressureKpa: number | null, source: LeakTimeSource): LeakMark => ({
    label,
    timeS,
    pressureKpa,
    source,
    x: x(timeS),
    y: pressureKpa === null ? null : y(pressureKpa),
  });
  return {
    plot,
    path: pressure ? linePath(inWindow, pressure.values, x, y) : "",
    marks: [
      mark("t1", analysis.t1, analysis.p1, analysis.timeSources.t1),
      mark("t2", analysis.t2, analysis.p2, analysis.timeSources.t2),
      mark("t3", analysis.t3, analysis.p3, analysis.timeSources.t3),
    ],
    setPoint: { y: y(analysis.limits.vacuumSetPointKpaAbs), kpa: analysis.limits.vacuumSetPointKpaAbs },
    pressureTicks: ticks.ticks.map((kpa) => ({ y: y(kpa), kpa })),
    timeTicks: time.ticks.map((s) => ({ x: x(s), s })),
    timeStepS: time.stepS,
    window,
  };
}

"use client";

import { useId } from "react";
import type { AirLeakageResult } from "@/lib/cycles/contracts";
import { leakChartGeometry, leakChartWindow } from "@/lib/cycles/air-leakage-chart";
import { formatElapsed } from "@/lib/cycles/chart-model";
import { formatPressure } from "@/lib/domain";
import { CHART } from "@/components/cycles/record/chart-colors";
import { WINDOW_POINTS, useSeries } from "@/components/cycles/record/series-fetch";

const W = 760;
const H = 300;

/** The chamber pressure around the test with t1, t2 and t3 marked, and the vacuum set point. */
export function AirLeakageChart({ cycleId, cycleNumber, analysis }: { cycleId: string; cycleNumber: string; analysis: AirLeakageResult }) {
  const titleId = useId();
  const descId = useId();
  const clipId = useId();
  const window = leakChartWindow(analysis, analysis.record.durationS);
  const { data, error, isLoading } = useSeries(cycleId, window, WINDOW_POINTS);
  if (error) return <p className="text-sm text-fail-700">The chart data could not be loaded: {error.message}</p>;
  if (isLoading || !data) return <div className="h-[300px] animate-pulse rounded-md bg-paper-sunk" aria-label="Loading the pressure chart" />;
  const g = leakChartGeometry(data, analysis, { width: W, height: H });
  const describe = g.marks
    .map((m) => `${m.label} at ${formatElapsed(m.timeS)}: ${m.pressureKpa === null ? "not in the record" : formatPressure(m.pressureKpa, { digits: 2, reference: "abs" })}`)
    .join("; ");
  return (
    <figure>
      <svg viewBox={`0 0 ${W} ${H}`} className="h-auto w-full" role="img" aria-labelledby={titleId} aria-describedby={descId} data-testid="leak-chart">
        <title id={titleId}>{`Chamber pressure during the air leakage test of cycle ${cycleNumber}`}</title>
        <desc id={descId}>{describe}</desc>
        {g.pressureTicks.map((t) => (
          <g key={`p${t.kpa}`}>
            <line x1={g.plot.x} x2={g.plot.x + g.plot.w} y1={t.y} y2={t.y} stroke={CHART.grid} />
            <text x={g.plot.x - 6} y={t.y + 3} textAnchor="end" fontSize={10} fill={CHART.inkMuted}>
              {t.kpa}
            </text>
          </g>
        ))}
        {g.timeTicks.map((t) => (
          <text key={`t${t.s}`} x={t.x} y={g.plot.y + g.plot.h + 14} textAnchor="middle" fontSize={10} fill={CHART.inkMuted}>
            {formatElapsed(t.s)}
          </text>
        ))}
        <text x={8} y={g.plot.y + 8} fontSize={10} fill={CHART.inkMuted}>
          kPa abs
        </text>
        <text x={g.plot.x + g.plot.w} y={H - 4} textAnchor="end" fontSize={10} fill={CHART.inkMuted}>
          time since the first sample (min:s)
        </text>
        {g.setPoint && (
          <g>
            <line x1={g.plot.x} x2={g.plot.x + g.plot.w} y1={g.setPoint.y} y2={g.setPoint.y} stroke={CHART.bandEdge} strokeDasharray="5 3" />
            <text x={g.plot.x + 4} y={g.setPoint.y - 4} fontSize={10} fill={CHART.onLine}>
              {`vacuum set point ${formatPressure(g.setPoint.kpa, { digits: 1, reference: "abs" })}`}
            </text>
          </g>
        )}
        <clipPath id={clipId}>
          <rect x={g.plot.x} y={g.plot.y} width={g.plot.w} height={g.plot.h} />
        </clipPath>
        <path d={g.path} fill="none" stroke={CHART.pressure} strokeWidth={1.6} clipPath={`url(#${clipId})`} />
        {g.marks.map((m) => (
          <g key={m.label} data-testid={`leak-mark-${m.label}`}>
            <line x1={m.x} x2={m.x} y1={g.plot.y} y2={g.plot.y + g.plot.h} stroke={CHART.plateau} strokeDasharray={m.source === "marked" ? "2 2" : undefined} />
            {m.y !== null && <circle cx={m.x} cy={m.y} r={4} fill={CHART.raised} stroke={CHART.plateau} strokeWidth={2} />}
            <text x={m.x + 4} y={g.plot.y + 10} fontSize={11} fontWeight={600} fill={CHART.plateau}>
              {m.label}
            </text>
          </g>
        ))}
      </svg>
      <figcaption className="mt-1 text-xs text-ink-muted">
        Chamber pressure from the logger file around the test. t1: the valves close (a dashed line: a time marked by the user); t2 after the 5 min wait; t3 10 min later. The dashed green line is the
        vacuum set point the evacuation must reach.
      </figcaption>
    </figure>
  );
}

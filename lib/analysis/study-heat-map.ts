import type { RunJudgement, StudySummary } from "./study-types";

export type HeatMapMetric = "f0" | "minTemp";

export type HeatMapCell = {
  runNumber: number;
  /** F0 in minutes or the minimum temperature during holding in °C; null: the run has no reading at this position */
  value: number | null;
  /** this position was the run's cold spot */
  coldSpot: boolean;
};

export type HeatMapGrid = {
  metric: HeatMapMetric;
  runs: Array<{ runNumber: number; cycleNumber: string; judgement: RunJudgement }>;
  rows: Array<{ position: string; label: string; overallColdSpot: boolean; cells: HeatMapCell[] }>;
};

/** Positions × runs, the values a heat map prints (page and report draw the same grid). */
export function heatMapGrid(summary: StudySummary, metric: HeatMapMetric): HeatMapGrid {
  const runs = summary.runs.map((r) => ({ runNumber: r.runNumber, cycleNumber: r.cycleNumber, judgement: r.judgement }));
  const rows = summary.positions.map((p) => {
    const values = metric === "f0" ? p.f0ByRun : p.minTempByRun;
    return {
      position: p.position,
      label: p.label,
      overallColdSpot: summary.coldSpot?.position === p.position,
      cells: runs.map((r) => ({ runNumber: r.runNumber, value: values[r.runNumber] ?? null, coldSpot: p.coldSpotRuns.includes(r.runNumber) })),
    };
  });
  return { metric, runs, rows };
}

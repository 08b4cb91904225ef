import type { AnalysisResult, CheckId } from "@/lib/analysis/types";

export type AnalysedCycle = { cycleId: string; cycleNumber: string; startedAt: string | null; createdAt: string; result: AnalysisResult };

export type TrendPoint = {
  cycleId: string;
  cycleNumber: string;
  at: string;
  /** null when the figure could not be measured (no plateau, for instance) */
  value: number | null;
  limit: number | null;
  passed: boolean | null;
};

export type TrendFigure = {
  id: "equilibration" | "holding" | "saturation" | "spread";
  label: string;
  unit: "s" | "K";
  /** "at-most": points above the limit fail; "at-least": points below it fail */
  comparison: "at-most" | "at-least";
  points: TrendPoint[];
};

export type TrendSummary = {
  figures: TrendFigure[];
  analysed: number;
  passed: number;
  /** 0..1, null without analysed cycles */
  passRate: number | null;
  /** failures counted per check */
  failuresByCheck: Partial<Record<CheckId, number>>;
};

const FIGURES: Array<{ id: TrendFigure["id"]; check: CheckId; label: string; unit: "s" | "K"; comparison: "at-most" | "at-least" }> = [
  { id: "equilibration", check: "equilibration-time", label: "Equilibration time", unit: "s", comparison: "at-most" },
  { id: "holding", check: "holding-time", label: "Holding time", unit: "s", comparison: "at-least" },
  { id: "saturation", check: "saturation", label: "Largest deviation from saturated steam", unit: "K", comparison: "at-most" },
  { id: "spread", check: "spread", label: "Spread between channels during holding", unit: "K", comparison: "at-most" },
];

/** Figures over time from the stored analyses of one sterilizer's cycles, oldest first. */
export function trendsFromAnalyses(cycles: readonly AnalysedCycle[]): TrendSummary {
  const sorted = [...cycles].sort((a, b) => (a.startedAt ?? a.createdAt).localeCompare(b.startedAt ?? b.createdAt));
  const figures: TrendFigure[] = FIGURES.map((f) => ({ id: f.id, label: f.label, unit: f.unit, comparison: f.comparison, points: [] }));
  const failuresByCheck: Partial<Record<CheckId, number>> = {};
  let passed = 0;
  for (const c of sorted) {
    const r = c.result;
    if (r.verdict === "pass") passed++;
    for (const check of r.checks ?? []) if (!check.passed) failuresByCheck[check.id] = (failuresByCheck[check.id] ?? 0) + 1;
    FIGURES.forEach((f, i) => {
      const check = r.checks?.find((k) => k.id === f.check);
      let value = check?.measured ?? null;
      if (value === null) {
        if (f.id === "equilibration") value = r.equilibrationTime;
        if (f.id === "holding") value = r.holdingTime;
        if (f.id === "saturation") value = r.saturation?.maxDeviation ?? null;
      }
      const limit = check?.limit ?? fallbackLimit(f.id, r);
      figures[i].points.push({
        cycleId: c.cycleId,
        cycleNumber: c.cycleNumber,
        at: c.startedAt ?? c.createdAt,
        value: value !== null && Number.isFinite(value) ? value : null,
        limit,
        passed: check ? check.passed : null,
      });
    });
  }
  return { figures, analysed: sorted.length, passed, passRate: sorted.length ? passed / sorted.length : null, failuresByCheck };
}

function fallbackLimit(id: TrendFigure["id"], r: AnalysisResult): number | null {
  const l = r.limits;
  if (!l) return null;
  if (id === "equilibration") return l.maxEquilibrationS;
  if (id === "holding") return l.holdingTimeS;
  if (id === "saturation") return l.saturationLimitK;
  return l.maxSpreadK;
}

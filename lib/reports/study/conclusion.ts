/** The study report's words that are worked out rather than printed as stored: the conclusion and each run's key figures. */
import { formatDuration, plural } from "@/lib/domain";
import { heatValueText } from "@/lib/charts/heat-map";
import { fixed } from "../text";
import type { StudyReportDetail } from "./model";

export type StudyConclusion = { tone: "pass" | "fail" | "open"; word: string; caption: string; sentence: string };

/** F0 as the page's heat map prints it: two decimals below 100 min, so 59.96 never reads as a passing 60.0. */
export const f0Text = (minutes: number | null | undefined): string => heatValueText(minutes ?? null, "f0");

export const personName = (who: string | { name: string } | null | undefined): string => (who === null || who === undefined ? "—" : typeof who === "string" ? who : who.name);

export const positionLabel = (detail: StudyReportDetail, positionId: string): string => {
  const position = detail.loadingPattern.positions.find((p) => p.id === positionId);
  return position ? `${position.id} (${position.label})` : positionId;
};

/**
 * One sentence that says where the study stands. It claims the criteria were met only when the study is approved, the
 * series is complete, no run is pending and no deviation is open (fail closed); otherwise it says what is missing.
 */
export function studyConclusion(detail: StudyReportDetail): StudyConclusion {
  const { summary, criteria } = detail;
  const open = detail.deviations.filter((d) => d.status === "open").length;
  const pending = summary.runs.filter((r) => r.judgement === "pending").length;
  const { passing, required, complete } = summary.consecutive;
  const cold = summary.coldSpot;
  if (detail.status === "failed") {
    const reason = [...detail.signatures].reverse().find((s) => s.meaning === "failed")?.reason;
    return { tone: "fail", word: "FAILED", caption: "STUDY", sentence: `The study failed and is closed${reason ? `: ${reason}` : "."}${/[.!?]$/.test(reason ?? ".") ? "" : "."}` };
  }
  const series = `${passing} of ${required} consecutive passing ${required === 1 ? "run" : "runs"}`;
  if (detail.status === "approved" && complete && open === 0 && pending === 0 && cold) {
    const spread = summary.spreadK === null ? "" : `, the largest spread between positions was ${fixed(summary.spreadK, 2)} K (limit ${fixed(criteria.maxSpreadK, 1)} K)`;
    return {
      tone: "pass",
      word: "APPROVED",
      caption: "STUDY",
      sentence: `The study met its acceptance criteria: the last ${plural(required, "run")} passed in a row; the cold spot ${positionLabel(detail, cold.position)} received at least ${f0Text(cold.minF0)} min F0 in every run (at least ${f0Text(criteria.minF0Min)} min required)${spread}; every deviation is closed.`,
    };
  }
  const missing: string[] = [];
  if (!complete) missing.push(series);
  if (pending > 0) missing.push(`${plural(pending, "run")} waiting for indicator results`);
  if (open > 0) missing.push(`${plural(open, "deviation")} open`);
  if (missing.length === 0) missing.push(`${series}, no deviation open; waiting for review and QA approval`);
  return { tone: "open", word: "NOT CONCLUDED", caption: "STUDY", sentence: `The study is not concluded: ${missing.join("; ")}.` };
}

/** A run's equilibration: the cycle's own when the service gives it, else the latest arrival at Ts over its positions. */
export function runEquilibrationText(detail: StudyReportDetail, runId: string): string {
  const run = detail.runs.find((r) => r.id === runId);
  if (run?.equilibrationTimeS !== undefined) return formatDuration(run.equilibrationTimeS);
  const positions = detail.summary.runs.find((r) => r.runId === runId)?.positions ?? [];
  if (positions.length === 0) return "—";
  if (positions.some((p) => p.equilibrationS === null)) return "not reached";
  return `${formatDuration(Math.max(...positions.map((p) => p.equilibrationS as number)))} (latest position)`;
}

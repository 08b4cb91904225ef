import type { ReactNode } from "react";
import { CYCLE_STATUS_LABELS, type CycleStatus, type Verdict } from "@/lib/domain";

const TONES = {
  neutral: "bg-paper-sunk text-ink-soft ring-ink-line",
  pass: "bg-pass-50 text-pass-700 ring-pass-500/30",
  fail: "bg-fail-50 text-fail-700 ring-fail-500/30",
  caution: "bg-caution-50 text-caution-700 ring-caution-500/30",
  steam: "bg-steam-50 text-steam-700 ring-steam-500/30",
  brass: "bg-brass-50 text-brass-700 ring-brass-500/30",
} as const;

export type BadgeTone = keyof typeof TONES;

export function Badge({ tone = "neutral", children }: { tone?: BadgeTone; children: ReactNode }) {
  return <span className={`inline-flex items-center gap-1 rounded-full px-2 py-0.5 text-xs font-medium ring-1 ring-inset ${TONES[tone]}`}>{children}</span>;
}

export function VerdictBadge({ verdict }: { verdict: Verdict | null | undefined }) {
  if (verdict === "pass") return <Badge tone="pass">✓ Pass</Badge>;
  if (verdict === "fail") return <Badge tone="fail">✕ Fail</Badge>;
  return <Badge>Not analysed</Badge>;
}

const STATUS_TONES: Record<CycleStatus, BadgeTone> = { draft: "neutral", submitted: "steam", approved: "pass", "failure-confirmed": "fail", returned: "caution" };

export function StatusBadge({ status }: { status: CycleStatus }) {
  return <Badge tone={STATUS_TONES[status]}>{CYCLE_STATUS_LABELS[status]}</Badge>;
}

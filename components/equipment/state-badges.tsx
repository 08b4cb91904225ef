import { Badge } from "@/components/ui/badge";
import type { CalibrationState, ScheduleStatus } from "@/lib/periodic-tests";
import { formatDate } from "@/lib/format";
import { plural } from "@/lib/domain";

/** Calibration state in words and a symbol, never colour alone. */
export function CalibrationBadge({ state, daysLeft, dueOn }: { state: CalibrationState; daysLeft: number | null; dueOn?: string | null }) {
  if (state === "none") return <Badge tone="fail">✕ No certificate</Badge>;
  if (state === "overdue") return <Badge tone="fail">✕ Overdue since {formatDate(dueOn)}</Badge>;
  if (state === "due-soon") return <Badge tone="caution">▲ Due in {plural(daysLeft ?? 0, "day")}</Badge>;
  return <Badge tone="pass">✓ Valid until {formatDate(dueOn)}</Badge>;
}

export function ScheduleBadge({ status }: { status: ScheduleStatus }) {
  switch (status.state) {
    case "failed":
      return <Badge tone="fail">✕ Last attempt failed: repeat needed</Badge>;
    case "never":
      return <Badge tone="fail">✕ No passing test on record</Badge>;
    case "overdue":
      return <Badge tone="fail">✕ Overdue by {plural(-(status.daysLeft ?? 0), "day")}</Badge>;
    case "due-today":
      return <Badge tone="caution">▲ Due today</Badge>;
    case "due-soon":
      return <Badge tone="caution">▲ Due in {plural(status.daysLeft ?? 0, "day")}</Badge>;
    default:
      return <Badge tone="pass">✓ Up to date</Badge>;
  }
}

export function ResultBadge({ result }: { result: "pass" | "fail" }) {
  return result === "pass" ? <Badge tone="pass">✓ Pass</Badge> : <Badge tone="fail">✕ Fail</Badge>;
}

export function intervalWords(days: number): string {
  if (days === 1) return "Daily";
  if (days === 7) return "Weekly";
  if (days >= 28 && days <= 31) return "Monthly";
  if (days >= 89 && days <= 92) return "Quarterly";
  if (days >= 365 && days <= 366) return "Yearly";
  return `Every ${days} days`;
}

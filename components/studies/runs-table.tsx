import Link from "next/link";
import { TableFrame } from "@/components/ui/table-frame";
import { EmptyState } from "@/components/ui/panel";
import { formatDateTime, formatNumber } from "@/lib/format";
import { CYCLE_STATUS_LABELS, type CycleStatus } from "@/lib/domain";
import type { StudyDetail } from "@/lib/studies/contracts";
import { RunJudgementBadge } from "./status-badge";

/** The attached runs in order, each with its judgement, the reasons in sentences and its key figures. */
export function RunsTable({ detail, timeZone }: { detail: StudyDetail; timeZone: string }) {
  if (detail.runs.length === 0) return <EmptyState title="No run attached yet.">Runs are signed cycles of this sterilizer and profile, attached once the protocol is approved.</EmptyState>;
  const summaries = new Map(detail.summary.runs.map((r) => [r.runId, r]));
  const label = (positionId: string) => detail.loadingPattern.positions.find((p) => p.id === positionId)?.label ?? positionId;
  return (
    <TableFrame label="Runs">
      <table className="data-table" data-testid="runs-table">
        <thead>
          <tr>
            <th>Run</th>
            <th>Cycle</th>
            <th>Judgement</th>
            <th>Lowest F0 (cold spot)</th>
            <th>Spread</th>
            <th>Attached</th>
          </tr>
        </thead>
        <tbody>
          {detail.runs.map((run) => {
            const s = summaries.get(run.id);
            return (
              <tr key={run.id}>
                <td className="font-medium">Run {run.runNumber}</td>
                <td className="text-sm">
                  <Link href={`/cycles/${run.cycleId}`} className="text-steam-700 underline underline-offset-2">
                    {run.cycleNumber}
                  </Link>
                  <span className="block text-xs text-ink-muted">
                    {formatDateTime(run.startedAt, timeZone)} · {CYCLE_STATUS_LABELS[run.cycleStatus as CycleStatus] ?? run.cycleStatus}
                  </span>
                </td>
                <td className="text-sm">
                  {s ? <RunJudgementBadge judgement={s.judgement} /> : "—"}
                  {s && s.reasons.length > 0 && (
                    <ul className="mt-1 list-disc space-y-0.5 pl-4 text-xs text-ink-soft">
                      {s.reasons.map((r, i) => (
                        <li key={i}>{r}</li>
                      ))}
                    </ul>
                  )}
                </td>
                <td className="text-sm">
                  {s?.coldSpot ? (
                    <>
                      {formatNumber(s.coldSpot.f0Min, 1)} min
                      <span className="block text-xs text-ink-muted">
                        {s.coldSpot.positionId} · {label(s.coldSpot.positionId)}
                      </span>
                    </>
                  ) : (
                    "—"
                  )}
                </td>
                <td className="whitespace-nowrap text-sm">{s?.spreadK === null || s?.spreadK === undefined ? "—" : `${formatNumber(s.spreadK, 2)} K`}</td>
                <td className="text-xs text-ink-muted">
                  {formatDateTime(run.attachedAt, timeZone)}
                  <span className="block">by {run.attachedBy.name}</span>
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </TableFrame>
  );
}

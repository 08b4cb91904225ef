import Link from "next/link";
import { StatusBadge, VerdictBadge } from "@/components/ui/badge";
import { EmptyState } from "@/components/ui/panel";
import { formatDateTime } from "@/lib/format";
import type { CycleStatus, Verdict } from "@/lib/domain";

export type CycleSummary = {
  id: string;
  cycleNumber: string;
  status: CycleStatus;
  verdict: Verdict | null;
  startedAt: string | null;
  sterilizerName: string;
};

export function CycleList({ items, empty, timeZone }: { items: CycleSummary[]; empty: string; timeZone: string }) {
  if (items.length === 0) return <EmptyState title={empty} />;
  return (
    <ul className="divide-y divide-ink-line/60">
      {items.map((c) => (
        <li key={c.id} className="flex items-center justify-between gap-3 py-2">
          <div className="min-w-0">
            <Link href={`/cycles/${c.id}`} className="mono font-medium text-steam-700 hover:underline">
              {c.cycleNumber}
            </Link>
            <p className="truncate text-xs text-ink-muted">
              {c.sterilizerName} · {formatDateTime(c.startedAt, timeZone)}
            </p>
          </div>
          <div className="flex shrink-0 gap-1.5">
            <VerdictBadge verdict={c.verdict} />
            <StatusBadge status={c.status} />
          </div>
        </li>
      ))}
    </ul>
  );
}

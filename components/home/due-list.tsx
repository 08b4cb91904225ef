import { Badge } from "@/components/ui/badge";
import { EmptyState } from "@/components/ui/panel";
import { formatDate, PERIODIC_TEST_LABELS } from "@/lib/format";

export function TestsDueList({ items, timeZone }: { items: Array<{ sterilizerName: string; kind: string; dueAt: string; overdue: boolean }>; timeZone: string }) {
  if (items.length === 0) return <EmptyState title="No periodic test is due today or tomorrow." />;
  return (
    <ul className="divide-y divide-ink-line/60">
      {items.map((t) => (
        <li key={`${t.sterilizerName}:${t.kind}`} className="flex items-center justify-between gap-3 py-2 text-sm">
          <div>
            <p className="font-medium">{PERIODIC_TEST_LABELS[t.kind] ?? t.kind}</p>
            <p className="text-xs text-ink-muted">{t.sterilizerName}</p>
          </div>
          {t.overdue ? <Badge tone="fail">Overdue since {formatDate(t.dueAt, timeZone)}</Badge> : <Badge tone="caution">Due {formatDate(t.dueAt, timeZone)}</Badge>}
        </li>
      ))}
    </ul>
  );
}

export function CalibrationsDueList({ items }: { items: Array<{ name: string; serialNumber: string; dueOn: string | null; overdue: boolean }> }) {
  if (items.length === 0) return <EmptyState title="No calibration falls due in the next 30 days." />;
  return (
    <ul className="divide-y divide-ink-line/60">
      {items.map((c) => (
        <li key={c.serialNumber} className="flex items-center justify-between gap-3 py-2 text-sm">
          <div>
            <p className="font-medium">{c.name}</p>
            <p className="mono text-ink-muted">{c.serialNumber}</p>
          </div>
          {c.overdue ? <Badge tone="fail">Overdue {formatDate(c.dueOn)}</Badge> : <Badge tone="caution">Due {formatDate(c.dueOn)}</Badge>}
        </li>
      ))}
    </ul>
  );
}

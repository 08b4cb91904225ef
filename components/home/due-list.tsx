import { Badge } from "@/components/ui/badge";
import { EmptyState } from "@/components/ui/panel";
import { formatDate } from "@/lib/format";
import { testKindLabel } from "@/lib/domain";

const STATE_BADGE: Record<string, { tone: "fail" | "caution"; words: (due: string) => string }> = {
  never: { tone: "fail", words: () => "Never done" },
  failed: { tone: "fail", words: () => "Repeat needed: last attempt failed" },
  overdue: { tone: "fail", words: (due) => `Overdue since ${due}` },
  "due-today": { tone: "caution", words: () => "Due today" },
  "due-soon": { tone: "caution", words: (due) => `Due ${due}` },
};

export function TestsDueList({ items }: { items: Array<{ sterilizerName: string; kind: string; state: string; dueOn: string | null }> }) {
  if (items.length === 0) return <EmptyState title="No periodic test needs doing now." />;
  return (
    <ul className="divide-y divide-ink-line/60">
      {items.map((t) => {
        const badge = STATE_BADGE[t.state] ?? { tone: "caution" as const, words: (due: string) => `Due ${due}` };
        return (
          <li key={`${t.sterilizerName}:${t.kind}`} className="flex items-center justify-between gap-3 py-2 text-sm">
            <div>
              <p className="font-medium">{testKindLabel(t.kind)}</p>
              <p className="text-xs text-ink-muted">{t.sterilizerName}</p>
            </div>
            <Badge tone={badge.tone}>{badge.words(formatDate(t.dueOn))}</Badge>
          </li>
        );
      })}
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

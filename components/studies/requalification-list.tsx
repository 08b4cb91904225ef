import Link from "next/link";
import { Badge, type BadgeTone } from "@/components/ui/badge";
import { EmptyState } from "@/components/ui/panel";
import { TableFrame } from "@/components/ui/table-frame";
import { loadTypeLabel } from "@/lib/domain";
import { REQUALIFICATION_STATE_LABELS, type RequalificationState } from "@/lib/domain/requalification";
import { formatDate } from "@/lib/format";
import { RequiredBeforeUseToggle } from "./requalification-toggle";

export type RequalificationRow = {
  id: string;
  name: string;
  loadType: string | null;
  sterilizerId: string;
  sterilizerName: string;
  dueOn: string | null;
  state: RequalificationState;
  requiredBeforeUse: boolean;
  blockedNotice: string | null;
  study: { id: string; studyNumber: string } | null;
};

const TONE: Record<RequalificationState, BadgeTone> = { never: "caution", overdue: "fail", "due-soon": "caution", ok: "pass" };

export function RequalificationBadge({ state, dueOn }: { state: RequalificationState; dueOn: string | null }) {
  const words =
    state === "overdue" ? `Overdue since ${formatDate(dueOn)}` : state === "due-soon" ? `Due ${formatDate(dueOn)}` : state === "ok" ? `Due ${formatDate(dueOn)}` : REQUALIFICATION_STATE_LABELS.never;
  return <Badge tone={TONE[state]}>{words}</Badge>;
}

/** The home page's list: patterns overdue, never qualified or falling due soon, across the site's sterilizers. */
export function RequalificationDueList({ items }: { items: RequalificationRow[] }) {
  const due = items.filter((p) => p.state !== "ok");
  if (due.length === 0) return <EmptyState title={items.length === 0 ? "No loading pattern is registered yet." : "Every loading pattern is qualified and none falls due in the next 30 days."} />;
  return (
    <ul className="divide-y divide-ink-line/60" data-testid="requalification-due">
      {due.map((p) => (
        <li key={p.id} className="flex items-center justify-between gap-3 py-2 text-sm">
          <div className="min-w-0">
            <p className="break-words font-medium">{p.name}</p>
            <p className="text-xs text-ink-muted">
              {p.sterilizerName} · {loadTypeLabel(p.loadType)}
            </p>
            {p.blockedNotice && <p className="text-xs font-medium text-fail-700">{p.blockedNotice}</p>}
          </div>
          <RequalificationBadge state={p.state} dueOn={p.dueOn} />
        </li>
      ))}
    </ul>
  );
}

/** The sterilizer page's table: every pattern of this sterilizer, its last approved study, and (engineers) the toggle. */
export function RequalificationTable({ items, mayDecide }: { items: RequalificationRow[]; mayDecide: boolean }) {
  if (items.length === 0) return <EmptyState title="No loading pattern for this sterilizer yet.">A qualification study defines one.</EmptyState>;
  return (
    <div className="space-y-4">
      <TableFrame label="Loading patterns and requalification">
        <table className="data-table">
          <thead>
            <tr>
              <th>Loading pattern</th>
              <th>Load type</th>
              <th>Last approved study</th>
              <th>Requalification</th>
              <th>Before use</th>
            </tr>
          </thead>
          <tbody>
            {items.map((p) => (
              <tr key={p.id} data-pattern={p.name}>
                <td className="font-medium">{p.name}</td>
                <td className="text-sm">{loadTypeLabel(p.loadType)}</td>
                <td className="text-sm">
                  {p.study ? (
                    <Link href={`/studies/${p.study.id}`} className="mono text-steam-700 hover:underline">
                      {p.study.studyNumber}
                    </Link>
                  ) : (
                    "—"
                  )}
                </td>
                <td>
                  <RequalificationBadge state={p.state} dueOn={p.dueOn} />
                  {p.blockedNotice && <p className="mt-1 text-xs font-medium text-fail-700">{p.blockedNotice}</p>}
                </td>
                <td className="text-sm">{p.requiredBeforeUse ? "Required" : "—"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </TableFrame>
      {mayDecide && (
        <div className="space-y-3">
          {items.map((p) => (
            <RequiredBeforeUseToggle key={p.id} patternId={p.id} patternName={p.name} requiredBeforeUse={p.requiredBeforeUse} />
          ))}
        </div>
      )}
      <p className="text-xs text-ink-muted">
        An approved study sets the next requalification date (approval date plus the study&apos;s interval, on the site&apos;s calendar). A pattern marked required before use may not be run once its
        requalification is overdue, or before it was ever qualified; the sterilizer stays in use for other loads.
      </p>
    </div>
  );
}

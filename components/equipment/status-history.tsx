import { EmptyState } from "@/components/ui/panel";
import { ROLE_LABELS, type Role, type SterilizerStatus } from "@/lib/domain";
import { formatDateTime } from "@/lib/format";
import { SterilizerStatusBadge } from "./sterilizer-status";

type StatusEvent = {
  id: string;
  status: SterilizerStatus;
  reason: string;
  at: string;
  since: string;
  kind: "automatic" | "manual";
  cause: string;
  printedName: string | null;
  role: Role | null;
  passwordReauthenticated: boolean;
};

/** Each change of the sterilizer's status, newest first: who decided (signed) or what the rule found. */
export function StatusHistory({ events, timeZone }: { events: StatusEvent[]; timeZone: string }) {
  if (events.length === 0) return <EmptyState title="No change of status recorded yet." />;
  return (
    <ol className="divide-y divide-ink-line/60 text-sm" data-testid="status-history">
      {events.map((e) => (
        <li key={e.id} className="space-y-1 py-2">
          <p className="flex flex-wrap items-center gap-2">
            <SterilizerStatusBadge status={e.status} />
            <span className="text-xs text-ink-muted">{formatDateTime(e.at, timeZone)}</span>
          </p>
          <p>{e.reason}</p>
          <p className="text-xs text-ink-muted">
            {e.kind === "manual"
              ? `Signed by ${e.printedName ?? "an engineer"}${e.role ? ` (${ROLE_LABELS[e.role]})` : ""}${e.passwordReauthenticated ? ", password re-entered" : ""}.`
              : `Found by the status rule: ${e.cause}${e.printedName ? ` (${e.printedName})` : ""}; since ${formatDateTime(e.since, timeZone)}.`}
          </p>
        </li>
      ))}
    </ol>
  );
}

import { Badge } from "@/components/ui/badge";
import { formatDateTime } from "@/lib/format";
import { STERILIZER_STATUS_LABELS, type SterilizerStatus } from "@/lib/domain";

/** In use / out of use in words and a symbol, never colour alone. */
export function SterilizerStatusBadge({ status }: { status: SterilizerStatus }) {
  return status === "in-use" ? <Badge tone="pass">✓ {STERILIZER_STATUS_LABELS["in-use"]}</Badge> : <Badge tone="fail">✕ {STERILIZER_STATUS_LABELS["out-of-use"]}</Badge>;
}

/** The badge with its reason and since when, for tables and the status board. */
export function SterilizerStatusLine({ status, reason, since, timeZone }: { status: SterilizerStatus; reason: string | null; since: string | null; timeZone: string }) {
  return (
    <div className="space-y-1" data-testid="sterilizer-status">
      <p className="flex flex-wrap items-center gap-2">
        <SterilizerStatusBadge status={status} />
        {since && <span className="text-xs text-ink-muted">since {formatDateTime(since, timeZone)}</span>}
      </p>
      {reason && <p className={`text-xs ${status === "out-of-use" ? "text-fail-700" : "text-ink-muted"}`}>{reason}</p>}
    </div>
  );
}

/** On intake: the chosen sterilizer is out of use, but a test cycle may still be recorded to re-qualify it. */
export function OutOfUseNotice({ name, reason, since, timeZone }: { name: string; reason: string; since: string; timeZone: string }) {
  return (
    <p role="status" className="mt-2 rounded-md border border-caution-500/40 bg-caution-50 px-3 py-2 text-xs text-caution-700" data-testid="out-of-use-notice">
      <span aria-hidden>▲ </span>
      {name} is out of use since {formatDateTime(since, timeZone)}: {reason} A test cycle may still be recorded to re-qualify it.
    </p>
  );
}

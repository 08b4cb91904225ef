import { Badge, type BadgeTone } from "@/components/ui/badge";
import { PERIODIC_RECORD_STATUS_LABELS, type PeriodicRecordStatus } from "@/lib/domain";

const TONES: Record<PeriodicRecordStatus, BadgeTone> = { submitted: "steam", approved: "pass", "failure-confirmed": "fail", returned: "caution" };

/** A periodic-test record's review state; only approved and failure-confirmed records count for the schedule. */
export function PeriodicStatusBadge({ status }: { status: PeriodicRecordStatus }) {
  return <Badge tone={TONES[status]}>{PERIODIC_RECORD_STATUS_LABELS[status]}</Badge>;
}

import Link from "next/link";
import { formatDateTime } from "@/lib/format";
import { CYCLE_STATUS_LABELS, type CycleStatus } from "@/lib/domain";
import type { AttachableCycle, SensorMapProposal, StudyDetail } from "@/lib/studies/contracts";
import { AttachRunForm } from "./attach-run";

/**
 * "Attach a run": first the signed cycle (a plain GET form, so the page works out its proposed sensor map), then the
 * map to confirm.
 */
export function AttachRunPanel({
  detail,
  cycles,
  chosen,
  proposal,
  problem,
  timeZone,
}: {
  detail: StudyDetail;
  cycles: AttachableCycle[];
  chosen: AttachableCycle | null;
  proposal: SensorMapProposal | null;
  problem: string | null;
  timeZone: string;
}) {
  return (
    <div className="mt-4 space-y-3 border-t border-ink-line pt-4" id="attach">
      <h3 className="text-sm font-semibold">Attach a run</h3>
      {cycles.length === 0 ? (
        <p className="text-sm text-ink-muted">
          No signed cycle of {detail.sterilizer.name} with {detail.profile.name} is waiting to be attached. A cycle counts once an engineer has signed it (approved or failure confirmed).
        </p>
      ) : (
        <form method="get" action={`/studies/${detail.id}#attach`} className="flex flex-wrap items-end gap-3" aria-label="Choose the cycle to attach">
          <div className="min-w-0">
            <label className="field-label" htmlFor="attach-cycle">
              Signed cycle
            </label>
            <select id="attach-cycle" name="attach" defaultValue={chosen?.id ?? ""} className="field-input">
              <option value="">Choose…</option>
              {cycles.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.cycleNumber} · {formatDateTime(c.startedAt, timeZone)} · {CYCLE_STATUS_LABELS[c.status as CycleStatus] ?? c.status}
                </option>
              ))}
            </select>
          </div>
          <button className="btn-secondary">Show its sensor map</button>
          {chosen && (
            <Link href={`/studies/${detail.id}#runs`} className="text-sm text-steam-700 underline">
              Cancel
            </Link>
          )}
        </form>
      )}
      {problem && (
        <p role="alert" className="rounded-md bg-fail-50 px-3 py-2 text-sm text-fail-700">
          ✕ {problem}
        </p>
      )}
      {chosen && proposal && <AttachRunForm key={chosen.id} studyId={detail.id} cycleId={chosen.id} cycleNumber={chosen.cycleNumber} proposal={proposal} positions={detail.loadingPattern.positions} />}
    </div>
  );
}

import { Badge } from "@/components/ui/badge";
import { formatDateTime } from "@/lib/format";
import { INDICATOR_SHEET_RESULT_LABELS, type IndicatorSheetResult } from "@/lib/domain";
import { CycleSheetForm } from "./cycle-sheet-form";
import { IndicatorPhotos, type IndicatorPhotoView } from "./indicator-photos";

type Reading = {
  id: string;
  result: IndicatorSheetResult;
  passed: boolean;
  indicatorLot: string | null;
  reason: string | null;
  recordedByName: string;
  recordedAt: string;
  photo: IndicatorPhotoView | null;
};

/** A Bowie-Dick cycle's verdict: its indicator sheet (reading, lot, photo), earlier readings kept below, and the form while the cycle can still change. */
export function CycleSheetPanel({ cycleId, readings, mayRecord, timeZone }: { cycleId: string; readings: Reading[]; mayRecord: boolean; timeZone: string }) {
  const [current, ...earlier] = readings;
  return (
    <div className="space-y-4" data-testid="indicator-sheet">
      {current ? (
        <div className="space-y-2">
          <p className="flex flex-wrap items-center gap-2 text-sm">
            {current.passed ? <Badge tone="pass">✓ Pass</Badge> : <Badge tone="fail">✕ Fail</Badge>}
            <span className="font-medium">{INDICATOR_SHEET_RESULT_LABELS[current.result]}</span>
            <span className="text-ink-muted">
              · lot {current.indicatorLot ?? "not recorded"} · read by {current.recordedByName}, {formatDateTime(current.recordedAt, timeZone)}
            </span>
          </p>
          <IndicatorPhotos photos={current.photo ? [current.photo] : []} timeZone={timeZone} />
        </div>
      ) : (
        <p className="rounded-md border border-caution-500/40 bg-caution-50 px-3 py-2 text-sm text-caution-700">
          No indicator sheet recorded yet. A Bowie-Dick test is judged by its sheet: without its result and photo the cycle has no verdict and cannot be signed.
        </p>
      )}
      <p className="text-xs text-ink-muted">The logged file&apos;s plateau analysis below is information only; it does not decide a Bowie-Dick test.</p>
      {earlier.length > 0 && (
        <details>
          <summary className="cursor-pointer text-sm text-steam-700">Earlier readings ({earlier.length})</summary>
          <ul className="mt-2 space-y-1 text-sm">
            {earlier.map((r) => (
              <li key={r.id}>
                {formatDateTime(r.recordedAt, timeZone)}: {INDICATOR_SHEET_RESULT_LABELS[r.result]}, lot {r.indicatorLot ?? "—"}, by {r.recordedByName}
                {r.photo && <span className="mono block break-all text-xs text-ink-faint">photo SHA-256 {r.photo.sha256}</span>}
              </li>
            ))}
          </ul>
        </details>
      )}
      {current?.reason && <p className="text-xs text-ink-muted">Reason for the latest reading: {current.reason}</p>}
      {mayRecord && <CycleSheetForm cycleId={cycleId} replacing={!!current} />}
    </div>
  );
}

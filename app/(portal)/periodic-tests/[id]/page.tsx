import type { Metadata } from "next";
import Link from "next/link";
import { orNotFound, requirePageActor } from "@/lib/auth/page-guard";
import { getPeriodicTestRecord } from "@/lib/services/periodic-test-review";
import { Panel } from "@/components/ui/panel";
import { ResultBadge } from "@/components/equipment/state-badges";
import { PeriodicStatusBadge } from "@/components/periodic-tests/status-badge";
import { PeriodicSignForm } from "@/components/periodic-tests/sign-form";
import { IndicatorPhotos } from "@/components/bowie-dick/indicator-photos";
import { keyFigure, measurementRows } from "@/components/periodic-tests/summary";
import { formatDateTime } from "@/lib/format";
import { PERIODIC_SIGNATURE_MEANING_LABELS, testKindLabel } from "@/lib/domain";

export const metadata: Metadata = { title: "Periodic-test record" };

const STATUS_TEXT = {
  submitted: "Waiting for an engineer's signature. It does not count for the schedule or the sterilizer's status until it is signed.",
  approved: "Approved: the test passed and counts as evidence for the schedule.",
  "failure-confirmed": "Failure confirmed: the test failed and closes as a signed failure; the sterilizer needs a passing repeat test.",
  returned: "Returned for a data or entry problem: it does not count. Record the test again.",
} as const;

export default async function PeriodicTestRecordPage({ params }: { params: Promise<{ id: string }> }) {
  const actor = await requirePageActor("equipment:read");
  const { id } = await params;
  const record = await orNotFound(getPeriodicTestRecord({ actor, id }));
  const tz = record.timeZone;
  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-2 text-sm text-ink-muted">
        <Link href="/periodic-tests" className="text-steam-700 underline underline-offset-2">
          Periodic tests
        </Link>
        <span aria-hidden="true"> / </span>
        <span>{testKindLabel(record.kind)}</span>
      </nav>
      <header className="mb-6" data-testid="periodic-record-header">
        <div className="flex flex-wrap items-center gap-2">
          <h1>{testKindLabel(record.kind)}</h1>
          <ResultBadge result={record.result} />
          <PeriodicStatusBadge status={record.status} />
        </div>
        <p className="mt-1 text-sm text-ink-soft">
          <Link href={`/sterilizers/${record.sterilizer.id}`} className="font-medium text-steam-700 underline underline-offset-2">
            {record.sterilizer.name}
          </Link>{" "}
          <span className="text-ink-muted">(serial {record.sterilizer.serialNumber})</span> · done {formatDateTime(record.performedAt, tz)} · recorded by {record.performedBy.name} on{" "}
          {formatDateTime(record.createdAt, tz)}
        </p>
      </header>

      <div className="grid gap-gutter xl:grid-cols-[minmax(0,1fr)_22rem]">
        <div className="min-w-0 space-y-gutter">
          <Panel title="What was measured">
            <p className="mb-2 text-sm font-medium">{keyFigure(record.kind, record.measurements)}</p>
            <dl className="grid grid-cols-1 sm:grid-cols-[14rem_minmax(0,1fr)] gap-x-3 gap-y-1 text-sm">
              {measurementRows(record.measurements).map(([k, v], i) => (
                <div key={`${k}-${i}`} className="contents">
                  <dt className="text-ink-muted">{k}</dt>
                  <dd>{v}</dd>
                </div>
              ))}
              {record.notes && (
                <div className="contents">
                  <dt className="text-ink-muted">Notes</dt>
                  <dd>{record.notes}</dd>
                </div>
              )}
            </dl>
          </Panel>

          {(record.kind === "bowie-dick" || record.photos.length > 0) && (
            <Panel title="Photo of the indicator sheet">
              <IndicatorPhotos photos={record.photos} timeZone={tz} />
            </Panel>
          )}

          <Panel title={`Signatures (${record.signatures.length})`}>
            {record.signatures.length === 0 ? (
              <p className="text-sm text-ink-muted">
                {record.status === "submitted" ? "Not signed yet." : "No signature: recorded before periodic-test records were signed, and carried over as approved."}
              </p>
            ) : (
              <ol className="space-y-3 text-sm" data-testid="periodic-signatures">
                {record.signatures.map((s) => (
                  <li key={s.id} className="rounded-md border border-ink-line px-3 py-2">
                    <p>
                      <strong>{s.printedName}</strong> ({s.role}) · {formatDateTime(s.signedAt, tz)} · {s.signedAt.slice(0, 19)}Z
                    </p>
                    <p>{PERIODIC_SIGNATURE_MEANING_LABELS[s.meaning]}</p>
                    {s.reason && <p className="text-ink-soft">Reason: {s.reason}</p>}
                    <p className={`text-xs ${s.valid ? "text-pass-700" : "text-fail-700"}`}>
                      {s.valid ? "✓ The record still matches what was signed." : "✕ The record no longer matches what was signed."}
                    </p>
                    <p className="mono mt-0.5 break-all text-xs text-ink-faint">{s.recordHash}</p>
                  </li>
                ))}
              </ol>
            )}
          </Panel>
        </div>

        <aside className="min-w-0 space-y-gutter" aria-label="Review">
          <Panel title="Review">
            <p className="mb-3 text-sm text-ink-soft">{STATUS_TEXT[record.status]}</p>
            {record.maySign &&
              record.status === "submitted" &&
              (record.signBlocked ? <p className="text-sm text-caution-700">{record.signBlocked}</p> : <PeriodicSignForm recordId={record.id} result={record.result} signerName={actor.name} />)}
          </Panel>
        </aside>
      </div>
    </>
  );
}

import Link from "next/link";
import { orNotFound, requirePageActor } from "@/lib/auth/page-guard";
import { getInstrumentPage } from "@/lib/services/instruments";
import { EmptyState, PageHeader, Panel } from "@/components/ui/panel";
import { Badge, VerdictBadge } from "@/components/ui/badge";
import { CalibrationBadge } from "@/components/equipment/state-badges";
import { CertificateForm, ClearMappingForm } from "@/components/equipment/instrument-forms";
import { formatDate, formatDateTime } from "@/lib/format";
import { INSTRUMENT_KIND_LABELS as KIND_LABELS, plural } from "@/lib/domain";
import { TableFrame } from "@/components/ui/table-frame";

export const metadata = { title: "Instrument" };

export default async function InstrumentPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const actor = await requirePageActor("equipment:read");
  const { instrument: i, certificates, latest, calibration, recentCycles, today, timeZone, mayManage: manage } = await orNotFound(getInstrumentPage({ actor, id }));
  return (
    <>
      <PageHeader
        title={i.name}
        subtitle={
          <>
            <span className="mono">{i.serialNumber}</span> · {KIND_LABELS[i.kind]}
            {i.channelCount ? ` · ${plural(i.channelCount, "channel")}` : ""}
          </>
        }
        actions={
          <Link href="/instruments" className="btn-secondary">
            All instruments
          </Link>
        }
      />
      <div className={`grid gap-gutter ${manage ? "xl:grid-cols-[minmax(0,1fr)_24rem]" : ""}`}>
        <div className="min-w-0 space-y-gutter">
          <Panel title="Calibration" action={<CalibrationBadge state={calibration.state} daysLeft={calibration.daysLeft} dueOn={latest?.dueOn} />}>
            {certificates.length === 0 ? (
              <EmptyState title="No calibration certificate recorded.">Cycles measured with this instrument cannot be shown as traceable until one is recorded.</EmptyState>
            ) : (
              <TableFrame label="Calibration certificates">
                <table className="data-table" data-testid="certificates-table">
                  <thead>
                    <tr>
                      <th>Certificate</th>
                      <th>Issued by</th>
                      <th>Calibrated</th>
                      <th>Due</th>
                      <th>Uncertainty</th>
                      <th>Notes</th>
                    </tr>
                  </thead>
                  <tbody>
                    {certificates.map((c) => (
                      <tr key={c.id}>
                        <td className="mono">
                          {c.certificateNumber}
                          {latest?.id === c.id && (
                            <>
                              {" "}
                              <Badge tone="steam">In force</Badge>
                            </>
                          )}
                        </td>
                        <td className="text-sm">{c.issuedBy}</td>
                        <td className="whitespace-nowrap text-sm">{formatDate(c.calibratedOn)}</td>
                        <td className="whitespace-nowrap text-sm">{formatDate(c.dueOn)}</td>
                        <td className="text-sm">{c.uncertaintyK !== null ? `± ${c.uncertaintyK} K` : "—"}</td>
                        <td className="text-xs text-ink-muted">{c.notes ?? ""}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </TableFrame>
            )}
          </Panel>
          <Panel title="Saved channel mapping">
            {i.hasSavedMapping ? (
              <>
                <p className="text-sm">
                  <Badge tone="steam">Saved</Badge> A confirmed mapping is applied automatically to this instrument&apos;s next logger files.
                </p>
                <details className="mt-2 text-sm">
                  <summary className="cursor-pointer text-steam-700">Show the mapping</summary>
                  <pre className="mono mt-2 max-h-64 overflow-auto rounded-md bg-paper-sunk p-3">{JSON.stringify(i.savedMapping, null, 2)}</pre>
                </details>
                {manage && (
                  <div className="mt-4 border-t border-ink-line pt-4">
                    <ClearMappingForm instrumentId={i.id} />
                  </div>
                )}
              </>
            ) : (
              <p className="text-sm text-ink-muted">No mapping saved. When a user confirms a mapping at cycle intake, they can save it for this instrument.</p>
            )}
          </Panel>
          <Panel title="Recent cycles measured with it">
            {recentCycles.length === 0 ? (
              <EmptyState title="No cycle recorded with this instrument." />
            ) : (
              <ul className="divide-y divide-ink-line/60">
                {recentCycles.map((c) => (
                  <li key={c.id} className="flex items-center justify-between gap-3 py-2 text-sm">
                    <div>
                      <Link href={`/cycles/${c.id}`} className="mono font-medium text-steam-700 hover:underline">
                        {c.cycleNumber}
                      </Link>
                      <p className="text-xs text-ink-muted">
                        {c.sterilizerName} · {formatDateTime(c.startedAt, timeZone)}
                      </p>
                    </div>
                    <VerdictBadge verdict={c.verdict} />
                  </li>
                ))}
              </ul>
            )}
          </Panel>
        </div>
        {manage && (
          <Panel title="Record a calibration certificate">
            <CertificateForm instrumentId={i.id} today={today} />
          </Panel>
        )}
      </div>
    </>
  );
}

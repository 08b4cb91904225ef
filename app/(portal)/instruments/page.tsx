import Link from "next/link";
import { requirePageActor } from "@/lib/auth/page-guard";
import { getInstrumentsPage } from "@/lib/services/instruments";
import { EmptyState, PageHeader, Panel } from "@/components/ui/panel";
import { Badge } from "@/components/ui/badge";
import { CalibrationBadge } from "@/components/equipment/state-badges";
import { InstrumentForm } from "@/components/equipment/instrument-forms";
import { formatDate } from "@/lib/format";
import { INSTRUMENT_KIND_LABELS as KIND_LABELS, plural, agree } from "@/lib/domain";
import { TableFrame } from "@/components/ui/table-frame";

export const metadata = { title: "Instruments" };

export default async function InstrumentsPage() {
  const actor = await requirePageActor("equipment:read");
  const { rows, attention, mayManage: manage } = await getInstrumentsPage({ actor });
  return (
    <>
      <PageHeader
        title="Instruments and calibration"
        subtitle="Independent loggers and sensors used for test cycles, with the calibration certificate in force. A test measured with an uncalibrated instrument is not evidence."
      />
      <div className={`grid gap-gutter ${manage ? "xl:grid-cols-[minmax(0,1fr)_22rem]" : ""}`}>
        <Panel title={`${plural(rows.length, "instrument")}${attention ? ` · ${attention} ${agree(attention, "needs", "need")} attention` : ""}`}>
          {rows.length === 0 ? (
            <EmptyState title="No instrument registered yet." />
          ) : (
            <TableFrame label="Instruments">
              <table className="data-table" data-testid="instruments-table">
                <thead>
                  <tr>
                    <th>Instrument</th>
                    <th>Kind</th>
                    <th>Certificate in force</th>
                    <th>Due</th>
                    <th>Calibration</th>
                    <th>Saved mapping</th>
                  </tr>
                </thead>
                <tbody>
                  {rows.map((i) => (
                    <tr key={i.id} className={i.active ? "" : "opacity-60"}>
                      <td>
                        <Link href={`/instruments/${i.id}`} className="font-medium text-steam-700 hover:underline">
                          {i.name}
                        </Link>
                        <p className="mono text-ink-muted">{i.serialNumber}</p>
                      </td>
                      <td className="text-sm">
                        {KIND_LABELS[i.kind]}
                        {i.channelCount ? ` · ${i.channelCount} ch` : ""}
                      </td>
                      <td className="text-sm">
                        {i.latestCertificate ? (
                          <>
                            <span className="mono">{i.latestCertificate.certificateNumber}</span>
                            <p className="text-xs text-ink-muted">{i.latestCertificate.issuedBy}</p>
                          </>
                        ) : (
                          "—"
                        )}
                      </td>
                      <td className="whitespace-nowrap text-sm">{formatDate(i.latestCertificate?.dueOn)}</td>
                      <td>
                        <CalibrationBadge state={i.calibration.state} daysLeft={i.calibration.daysLeft} dueOn={i.latestCertificate?.dueOn} />
                      </td>
                      <td>{i.hasSavedMapping ? <Badge tone="steam">Saved</Badge> : <span className="text-sm text-ink-muted">None</span>}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </TableFrame>
          )}
          <p className="mt-3 text-xs text-ink-muted">
            ✓ valid · ▲ due within 30 days · ✕ overdue or no certificate. Test instruments are checked at least yearly against traceable references (SHTM 2010 Part 3, common practice).
          </p>
        </Panel>
        {manage && (
          <Panel title="Add an instrument">
            <InstrumentForm />
          </Panel>
        )}
      </div>
    </>
  );
}

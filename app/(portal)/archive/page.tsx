import Link from "next/link";
import { Pager } from "@/components/ui/pager";
import { requirePageActor } from "@/lib/auth/page-guard";
import { getArchivePage } from "@/lib/services/archive";
import { EmptyState, PageHeader, Panel } from "@/components/ui/panel";
import { VerdictBadge } from "@/components/ui/badge";
import { VerifyReport } from "@/components/archive/verify-report";
import { formatBytes, formatDateTime } from "@/lib/format";
import { TableFrame } from "@/components/ui/table-frame";
import { plural } from "@/lib/domain";

export const metadata = { title: "Signed archive" };

export default async function ArchivePage({ searchParams }: { searchParams: Promise<{ q?: string; from?: string; to?: string; page?: string }> }) {
  const actor = await requirePageActor();
  const s = await searchParams;
  const { q, from, to } = s;
  const page = Math.max(Math.floor(Number(s.page ?? 1)) || 1, 1);
  const { rows, total, pageSize, timeZone: tz, mayList: canList, studyReports } = await getArchivePage({ actor, q, from, to, page });
  const pages = Math.max(Math.ceil(total / pageSize), 1);
  const link = (p: number) => `/archive?${new URLSearchParams({ ...Object.fromEntries(Object.entries({ q, from, to }).filter(([, v]) => v) as [string, string][]), page: String(p) })}`;
  return (
    <>
      <PageHeader title="Signed archive" subtitle="Approved reports as they were archived at signing; later software changes never re-render them." />
      <div className="grid gap-gutter xl:grid-cols-[minmax(0,1fr)_24rem]">
        {canList ? (
          <div className="min-w-0 space-y-gutter">
            <Panel title={plural(total, "archived report")}>
              <form className="mb-4 flex flex-wrap items-end gap-2" role="search">
                <div>
                  <label htmlFor="q" className="field-label">
                    Search
                  </label>
                  <input id="q" name="q" defaultValue={q} placeholder="Report, cycle, sterilizer, signer" className="field-input" />
                </div>
                <div>
                  <label htmlFor="from" className="field-label">
                    Archived from
                  </label>
                  <input id="from" name="from" type="date" defaultValue={from} className="field-input" />
                </div>
                <div>
                  <label htmlFor="to" className="field-label">
                    to
                  </label>
                  <input id="to" name="to" type="date" defaultValue={to} className="field-input" />
                </div>
                <button className="btn-secondary">Filter</button>
              </form>
              {rows.length === 0 ? (
                <EmptyState title="No archived report matches.">Reports are archived when an engineer approves a cycle.</EmptyState>
              ) : (
                <TableFrame label="Archived reports">
                  <table className="data-table" data-testid="archive-table">
                    <thead>
                      <tr>
                        <th>Report</th>
                        <th>Cycle</th>
                        <th>Sterilizer</th>
                        <th>Verdict</th>
                        <th>Approved by</th>
                        <th>Archived</th>
                        <th>File</th>
                      </tr>
                    </thead>
                    <tbody>
                      {rows.map((r) => (
                        <tr key={r.id}>
                          <td className="mono">{r.reportNumber}</td>
                          <td>
                            <Link className="mono text-steam-700 underline" href={`/cycles/${r.cycleId}`}>
                              {r.cycleNumber}
                            </Link>
                          </td>
                          <td>{r.sterilizerName}</td>
                          <td>
                            <VerdictBadge verdict={r.verdict} />
                          </td>
                          <td>{r.signerName ?? "—"}</td>
                          <td className="text-xs">{formatDateTime(r.createdAt, tz)}</td>
                          <td>
                            <a className="text-steam-700 underline" href={`/api/reports/${r.id}`}>
                              Download
                            </a>
                            <span className="block text-2xs text-ink-muted">
                              {formatBytes(r.sizeBytes)} ·{" "}
                              <span className="mono" title={r.sha256}>
                                {r.sha256.slice(0, 12)}…
                              </span>
                            </span>
                          </td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </TableFrame>
              )}
              <Pager page={page} pages={pages} href={link} />
            </Panel>
            <Panel title={`Study reports (${studyReports.length})`}>
              {studyReports.length === 0 ? (
                <EmptyState title="No study report is archived yet.">A qualification study{"'"}s report is archived when quality assurance approves the study.</EmptyState>
              ) : (
                <TableFrame label="Archived study reports">
                  <table className="data-table" data-testid="study-archive-table">
                    <thead>
                      <tr>
                        <th>Report</th>
                        <th>Study</th>
                        <th>Sterilizer</th>
                        <th>Approved by (QA)</th>
                        <th>Archived</th>
                        <th>File</th>
                      </tr>
                    </thead>
                    <tbody>
                      {studyReports.map((r) => (
                        <tr key={r.id}>
                          <td className="mono">{r.reportNumber}</td>
                          <td>
                            <Link className="mono text-steam-700 underline" href={`/studies/${r.studyId}`}>
                              {r.studyNumber}
                            </Link>
                            <span className="block text-2xs text-ink-muted">{r.title}</span>
                          </td>
                          <td>{r.sterilizerName}</td>
                          <td>{r.signerName ?? "—"}</td>
                          <td className="text-xs">{formatDateTime(r.createdAt, tz)}</td>
                          <td>
                            <a className="text-steam-700 underline" href={`/api/studies/${r.studyId}/report`}>
                              Download
                            </a>
                            <span className="block text-2xs text-ink-muted">
                              {formatBytes(r.sizeBytes)} ·{" "}
                              <span className="mono" title={r.sha256}>
                                {r.sha256.slice(0, 12)}…
                              </span>
                            </span>
                          </td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </TableFrame>
              )}
            </Panel>
          </div>
        ) : (
          <Panel title="Archive">
            <p className="text-sm text-ink-muted">Your role can check a report against the archive but not browse it.</p>
          </Panel>
        )}
        <div id="verify" className="min-w-0">
          <Panel title="Check a report">
            <VerifyReport />
          </Panel>
        </div>
      </div>
    </>
  );
}

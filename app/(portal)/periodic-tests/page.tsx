import Link from "next/link";
import { Pager } from "@/components/ui/pager";
import { requirePageActor } from "@/lib/auth/page-guard";
import { getPeriodicTestsPage } from "@/lib/services/periodic-tests";
import { periodicTestFiltersSchema } from "@/lib/validations/periodic-tests";
import { EmptyState, PageHeader, Panel } from "@/components/ui/panel";
import { intervalWords, ResultBadge, ScheduleBadge } from "@/components/equipment/state-badges";
import { keyFigure, measurementRows } from "@/components/periodic-tests/summary";
import { formatDate, formatDateTime } from "@/lib/format";
import { isRecordable, PERIODIC_RECORD_STATUS_LABELS, PERIODIC_RECORD_STATUSES, PERIODIC_TEST_KINDS, testKindLabel, plural } from "@/lib/domain";
import { PeriodicStatusBadge } from "@/components/periodic-tests/status-badge";
import { TableFrame } from "@/components/ui/table-frame";

export const metadata = { title: "Periodic tests" };

type Search = Record<string, string | string[] | undefined>;

export default async function PeriodicTestsPage({ searchParams }: { searchParams: Promise<Search> }) {
  const actor = await requirePageActor("equipment:read");
  const raw = await searchParams;
  const first = (k: string) => (Array.isArray(raw[k]) ? raw[k]![0] : (raw[k] as string | undefined)) || undefined;
  const filter = periodicTestFiltersSchema.parse({
    sterilizer: first("sterilizer"),
    kind: first("kind"),
    result: first("result"),
    status: first("status"),
    from: first("from"),
    to: first("to"),
    page: first("page"),
  });
  const { overview, history, choices, mayRecord } = await getPeriodicTestsPage({ actor, filter });
  const { rows, timeZone } = overview;
  const actionNeeded = rows.filter((r) => r.needsAction).length;
  const pages = Math.max(1, Math.ceil(history.total / history.pageSize));
  const pageHref = (page: number) => {
    const q = new URLSearchParams();
    for (const [k, v] of Object.entries(filter)) if (v !== undefined && k !== "page") q.set(k, String(v));
    q.set("page", String(page));
    return `/periodic-tests?${q.toString()}#history`;
  };
  const bySterilizer = new Map<string, typeof rows>();
  for (const r of [...rows].sort((a, b) => a.sterilizerName.localeCompare(b.sterilizerName))) {
    if (!bySterilizer.has(r.sterilizerId)) bySterilizer.set(r.sterilizerId, []);
    bySterilizer.get(r.sterilizerId)!.push(r);
  }
  return (
    <>
      <PageHeader
        title="Periodic tests"
        subtitle="What each sterilizer's written scheme asks for, when it was last passed, and every recorded result."
        actions={
          mayRecord ? (
            <Link href="/periodic-tests/new" className="btn-primary">
              Record a test
            </Link>
          ) : undefined
        }
      />
      <div className="space-y-gutter">
        <Panel title={`Schedule${actionNeeded ? ` · ${actionNeeded} need${actionNeeded === 1 ? "s" : ""} action` : ""}`}>
          {rows.length === 0 ? (
            <EmptyState title="No sterilizer has a test schedule yet.">An engineer sets the schedule on each sterilizer&apos;s page.</EmptyState>
          ) : (
            <TableFrame label="Test schedule">
              <table className="data-table" data-testid="schedule-table">
                <thead>
                  <tr>
                    <th>Sterilizer</th>
                    <th>Test</th>
                    <th>Interval</th>
                    <th>Last pass</th>
                    <th>Next due</th>
                    <th>State</th>
                    <th>
                      <span className="sr-only">Record</span>
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {[...bySterilizer.values()].flatMap((group) =>
                    group.map((r, i) => (
                      <tr key={`${r.sterilizerId}:${r.kind}`} className={r.sterilizerActive ? "" : "opacity-60"}>
                        <td className="font-medium">
                          {i === 0 && (
                            <Link href={`/sterilizers/${r.sterilizerId}`} className="text-steam-700 hover:underline">
                              {r.sterilizerName}
                            </Link>
                          )}
                        </td>
                        <td>{testKindLabel(r.kind)}</td>
                        <td className="text-sm">{intervalWords(r.intervalDays)}</td>
                        <td className="whitespace-nowrap text-sm">{r.status.lastPassOn ? formatDate(r.status.lastPassOn) : "—"}</td>
                        <td className="whitespace-nowrap text-sm">{r.status.dueOn ? formatDate(r.status.dueOn) : "Now"}</td>
                        <td>
                          <ScheduleBadge status={r.status} />
                          {r.awaitingSignOff > 0 && <p className="mt-1 text-xs text-ink-muted">{plural(r.awaitingSignOff, "passing cycle")} awaiting sign-off</p>}
                          {r.recordsAwaitingSignOff > 0 && (
                            <p className="mt-1 text-xs text-ink-muted">
                              <Link href={`/periodic-tests?sterilizer=${r.sterilizerId}&kind=${r.kind}&status=submitted#history`} className="underline">
                                {plural(r.recordsAwaitingSignOff, "record")} awaiting signature
                              </Link>
                            </p>
                          )}
                        </td>
                        <td>
                          {mayRecord && r.sterilizerActive && isRecordable(r.kind) ? (
                            <Link href={`/periodic-tests/new?kind=${r.kind}&sterilizer=${r.sterilizerId}`} className="text-sm text-steam-700 underline">
                              Record
                            </Link>
                          ) : mayRecord && r.kind.startsWith("thermometric") ? (
                            <Link href="/cycles/new" className="text-sm text-steam-700 underline">
                              Upload cycle
                            </Link>
                          ) : null}
                        </td>
                      </tr>
                    )),
                  )}
                </tbody>
              </table>
            </TableFrame>
          )}
          <p className="mt-2 text-xs text-ink-muted">
            Dates in {timeZone}. The next test is due one interval after the last pass; a failure after it needs a repeat before the sterilizer is used. Thermometric tests are logged cycles and count
            once approved; a recorded test counts once an engineer has signed it (approved or failure confirmed).
          </p>
        </Panel>

        <Panel title={`History · ${plural(history.total, "record")}`}>
          <form method="get" action="/periodic-tests#history" className="mb-4 grid gap-3 sm:grid-cols-3 lg:grid-cols-7 lg:items-end" id="history" aria-label="Filter the history">
            <div>
              <label className="field-label" htmlFor="f-sterilizer">
                Sterilizer
              </label>
              <select id="f-sterilizer" name="sterilizer" defaultValue={filter.sterilizer ?? ""} className="field-input">
                <option value="">All</option>
                {choices.sterilizers.map((s) => (
                  <option key={s.id} value={s.id}>
                    {s.name}
                  </option>
                ))}
              </select>
            </div>
            <div>
              <label className="field-label" htmlFor="f-kind">
                Test
              </label>
              <select id="f-kind" name="kind" defaultValue={filter.kind ?? ""} className="field-input">
                <option value="">All</option>
                {PERIODIC_TEST_KINDS.map((k) => (
                  <option key={k} value={k}>
                    {testKindLabel(k)}
                  </option>
                ))}
              </select>
            </div>
            <div>
              <label className="field-label" htmlFor="f-result">
                Result
              </label>
              <select id="f-result" name="result" defaultValue={filter.result ?? ""} className="field-input">
                <option value="">Any</option>
                <option value="pass">Pass</option>
                <option value="fail">Fail</option>
              </select>
            </div>
            <div>
              <label className="field-label" htmlFor="f-status">
                Review
              </label>
              <select id="f-status" name="status" defaultValue={filter.status ?? ""} className="field-input">
                <option value="">Any</option>
                {PERIODIC_RECORD_STATUSES.map((st) => (
                  <option key={st} value={st}>
                    {PERIODIC_RECORD_STATUS_LABELS[st]}
                  </option>
                ))}
              </select>
            </div>
            <div>
              <label className="field-label" htmlFor="f-from">
                From
              </label>
              <input id="f-from" name="from" type="date" defaultValue={filter.from ?? ""} className="field-input" />
            </div>
            <div>
              <label className="field-label" htmlFor="f-to">
                To
              </label>
              <input id="f-to" name="to" type="date" defaultValue={filter.to ?? ""} className="field-input" />
            </div>
            <div className="flex gap-2">
              <button className="btn-secondary">Filter</button>
              <Link href="/periodic-tests#history" className="btn-secondary">
                Clear
              </Link>
            </div>
          </form>
          {history.items.length === 0 ? (
            <EmptyState title="No recorded test matches these filters." />
          ) : (
            <TableFrame label="Test history">
              <table className="data-table" data-testid="history-table">
                <thead>
                  <tr>
                    <th>Done at</th>
                    <th>Sterilizer</th>
                    <th>Test</th>
                    <th>Result</th>
                    <th>Review</th>
                    <th>Measured</th>
                    <th>By</th>
                  </tr>
                </thead>
                <tbody>
                  {history.items.map((t) => (
                    <tr key={t.id}>
                      <td className="whitespace-nowrap text-sm">
                        <Link href={`/periodic-tests/${t.id}`} className="text-steam-700 hover:underline">
                          {formatDateTime(t.performedAt, timeZone)}
                        </Link>
                      </td>
                      <td className="text-sm">{t.sterilizerName}</td>
                      <td className="text-sm">{testKindLabel(t.kind)}</td>
                      <td>
                        <ResultBadge result={t.result} />
                      </td>
                      <td>
                        <PeriodicStatusBadge status={t.status} />
                      </td>
                      <td className="text-sm">
                        {keyFigure(t.kind, t.measurements)}
                        <details className="mt-1">
                          <summary className="cursor-pointer text-xs text-steam-700">Readings and notes</summary>
                          <dl className="mt-1 grid grid-cols-1 sm:grid-cols-[12rem_minmax(0,1fr)] gap-x-2 text-xs">
                            {measurementRows(t.measurements).map(([k, v], i) => (
                              <div key={`${k}-${i}`} className="contents">
                                <dt className="text-ink-muted">{k}</dt>
                                <dd>{v}</dd>
                              </div>
                            ))}
                            {t.notes && (
                              <div className="contents">
                                <dt className="text-ink-muted">Notes</dt>
                                <dd>{t.notes}</dd>
                              </div>
                            )}
                          </dl>
                        </details>
                      </td>
                      <td className="text-sm">{t.performedByName}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </TableFrame>
          )}
          <Pager page={history.page} pages={pages} href={pageHref} />
        </Panel>
      </div>
    </>
  );
}

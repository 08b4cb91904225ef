import Link from "next/link";
import { orNotFound, requirePageActor } from "@/lib/auth/page-guard";
import { getSterilizerPage } from "@/lib/services/equipment";
import { EmptyState, PageHeader, Panel } from "@/components/ui/panel";
import { RecordTrailLink } from "@/components/audit/record-trail-link";
import { Badge, StatusBadge, VerdictBadge } from "@/components/ui/badge";
import { SterilizerForm } from "@/components/equipment/sterilizer-form";
import { ScheduleEditor } from "@/components/equipment/schedule-editor";
import { TrendChart } from "@/components/equipment/trend-chart";
import { intervalWords, ScheduleBadge } from "@/components/equipment/state-badges";
import { SterilizerStatusBadge, SterilizerStatusLine } from "@/components/equipment/sterilizer-status";
import { StatusDecisionForm } from "@/components/equipment/status-form";
import { StatusHistory } from "@/components/equipment/status-history";
import { formatDate, formatDateTime } from "@/lib/format";
import { formatDuration, PERIODIC_TEST_KINDS, testKindLabel, plural, formatVolume } from "@/lib/domain";
import { TableFrame } from "@/components/ui/table-frame";
import { RequalificationTable } from "@/components/studies/requalification-list";

export const metadata = { title: "Sterilizer" };

const CHECK_WORDS: Record<string, string> = {
  "plateau-reached": "plateau not reached",
  "equilibration-time": "equilibration too slow",
  "holding-time": "holding time too short",
  band: "outside the band",
  spread: "spread too wide",
  saturation: "not saturated steam",
};

export default async function SterilizerPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const actor = await requirePageActor("equipment:read");
  const {
    sterilizer: s,
    sizeClass,
    profile,
    recentCycles,
    trends,
    schedule,
    statusHistory,
    timeZone,
    trendDays,
    profiles,
    mayManage: manage,
    mayRecord: record,
    patterns,
    mayDecideRequalification,
  } = await orNotFound(getSterilizerPage({ actor, id }));
  const passPct = trends.passRate === null ? null : Math.round(trends.passRate * 100);
  return (
    <>
      <PageHeader
        title={s.name}
        subtitle={
          <>
            <span className="mono">{s.serialNumber}</span> · {formatVolume(s.chamberVolumeL)} · {sizeClass.label}
            {s.active && (
              <>
                {" "}
                · <SterilizerStatusBadge status={s.status} />
              </>
            )}
            {!s.active && (
              <>
                {" "}
                · <Badge>Retired</Badge>
              </>
            )}
          </>
        }
        actions={
          <>
            <Link href="/sterilizers" className="btn-secondary">
              All sterilizers
            </Link>
            <RecordTrailLink role={actor.role} recordId={s.id} />
            {record && s.active && (
              <Link href={`/periodic-tests/new?sterilizer=${s.id}`} className="btn-primary">
                Record a periodic test
              </Link>
            )}
          </>
        }
      />
      <div className="grid gap-gutter xl:grid-cols-[minmax(0,1fr)_24rem]">
        <div className="min-w-0 space-y-gutter">
          <Panel title={`Trends over the last ${trendDays} days`}>
            <div className="mb-4 flex flex-wrap items-end gap-6">
              <div>
                <p className="text-2xl font-semibold tabular-nums" data-testid="pass-rate">
                  {passPct === null ? "—" : `${passPct} %`}
                </p>
                <p className="text-sm text-ink-muted">
                  pass rate: {trends.passed} of {plural(trends.analysed, "analysed cycle")} passed
                </p>
              </div>
              {Object.keys(trends.failuresByCheck).length > 0 && (
                <div className="text-sm">
                  <p className="text-xs font-semibold uppercase tracking-wide text-ink-muted">Failed checks</p>
                  <ul className="mt-1 flex flex-wrap gap-1.5">
                    {Object.entries(trends.failuresByCheck).map(([check, n]) => (
                      <li key={check}>
                        <Badge tone="fail">
                          ✕ {CHECK_WORDS[check] ?? check}: {n}
                        </Badge>
                      </li>
                    ))}
                  </ul>
                </div>
              )}
            </div>
            {trends.analysed === 0 ? (
              <EmptyState title="No analysed cycle in this period.">Trends appear once cycles of this sterilizer have been analysed.</EmptyState>
            ) : (
              <div className="grid gap-6 md:grid-cols-2">
                {trends.figures.map((f) => (
                  <TrendChart key={f.id} figure={f} timeZone={timeZone} />
                ))}
              </div>
            )}
            <p className="mt-3 text-xs text-ink-muted">Each point is the current analysis of one cycle, against the limits of the profile it was analysed with. Select a point to open its record.</p>
          </Panel>

          <Panel title="Periodic tests">
            {schedule.length === 0 ? (
              <EmptyState title="No test schedule set for this sterilizer.">{manage ? "Add the tests below." : "An engineer sets the schedule."}</EmptyState>
            ) : (
              <TableFrame label="Periodic test schedule">
                <table className="data-table">
                  <thead>
                    <tr>
                      <th>Test</th>
                      <th>Interval</th>
                      <th>Before use</th>
                      <th>Last pass</th>
                      <th>Next due</th>
                      <th>State</th>
                    </tr>
                  </thead>
                  <tbody>
                    {schedule.map((r) => (
                      <tr key={r.kind}>
                        <td className="font-medium">{testKindLabel(r.kind)}</td>
                        <td>{intervalWords(r.intervalDays)}</td>
                        <td className="text-sm">{r.requiredBeforeUse ? "Required" : "—"}</td>
                        <td>{r.status.lastPassOn ? formatDate(r.status.lastPassOn) : "—"}</td>
                        <td>{r.status.dueOn ? formatDate(r.status.dueOn) : "Now"}</td>
                        <td>
                          <ScheduleBadge status={r.status} />
                          {r.awaitingSignOff > 0 && <p className="mt-1 text-xs text-ink-muted">{plural(r.awaitingSignOff, "passing cycle")} awaiting sign-off</p>}
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </TableFrame>
            )}
            <p className="mt-2 text-xs text-ink-muted">
              A test is done when it passes; the next one falls due one interval after that date. Thermometric tests count once their cycle is approved. A test required before use puts the sterilizer
              out of use from the day it falls due until a passing test is approved.
            </p>
          </Panel>

          <Panel title="Loading patterns and requalification">
            <RequalificationTable items={patterns} mayDecide={mayDecideRequalification && s.active} />
          </Panel>

          <Panel
            title="Recent cycles"
            action={
              <Link className="text-sm text-steam-700" href={`/cycles?sterilizer=${s.id}`}>
                All cycles of this sterilizer
              </Link>
            }
          >
            {recentCycles.length === 0 ? (
              <EmptyState title="No cycle recorded yet." />
            ) : (
              <TableFrame label="Recent cycles">
                <table className="data-table">
                  <thead>
                    <tr>
                      <th>Cycle</th>
                      <th>Started</th>
                      <th>Profile</th>
                      <th>Verdict</th>
                      <th>Status</th>
                    </tr>
                  </thead>
                  <tbody>
                    {recentCycles.map((c) => (
                      <tr key={c.id}>
                        <td>
                          <Link href={`/cycles/${c.id}`} className="mono font-medium text-steam-700 hover:underline">
                            {c.cycleNumber}
                          </Link>
                        </td>
                        <td className="text-sm">{formatDateTime(c.startedAt, timeZone)}</td>
                        <td className="text-sm">{c.profileName}</td>
                        <td>
                          <VerdictBadge verdict={c.verdict} />
                        </td>
                        <td>
                          <StatusBadge status={c.status} />
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </TableFrame>
            )}
          </Panel>
        </div>

        <div className="space-y-gutter">
          <Panel title="Status">
            {s.active ? (
              <>
                <SterilizerStatusLine status={s.status} reason={s.statusReason} since={s.statusSince} timeZone={timeZone} />
                {patterns.map((p) =>
                  p.blockedNotice ? (
                    <p key={p.id} className="mt-1 text-sm font-medium text-fail-700" data-testid="load-notice">
                      ✕ {p.blockedNotice}
                    </p>
                  ) : null,
                )}
              </>
            ) : (
              <p className="text-sm text-ink-muted">Retired: not judged any more.</p>
            )}
            {manage && s.active && (
              <div className="mt-4 border-t border-ink-line pt-4">
                <StatusDecisionForm sterilizerId={s.id} status={s.status} />
              </div>
            )}
            <h3 className="mb-1 mt-4 text-xs font-semibold uppercase tracking-wide text-ink-muted">History</h3>
            <StatusHistory events={statusHistory} timeZone={timeZone} />
          </Panel>
          <Panel title="Identity">
            <dl className="grid grid-cols-[8rem_minmax(0,1fr)] gap-x-3 gap-y-1.5 text-sm">
              <dt className="text-ink-muted">Serial number</dt>
              <dd className="mono">{s.serialNumber}</dd>
              <dt className="text-ink-muted">Model</dt>
              <dd>{s.model ?? "—"}</dd>
              <dt className="text-ink-muted">Location</dt>
              <dd>{s.location ?? "—"}</dd>
              <dt className="text-ink-muted">Chamber</dt>
              <dd>{formatVolume(s.chamberVolumeL)}</dd>
              <dt className="text-ink-muted">Size class</dt>
              <dd>{sizeClass.label}</dd>
              <dt className="text-ink-muted">Equilibration</dt>
              <dd>{sizeClass.note}</dd>
              <dt className="text-ink-muted">Air detector</dt>
              <dd>{s.airDetectorFitted ? "Fitted" : "Not fitted"}</dd>
              <dt className="text-ink-muted">Default profile</dt>
              <dd>
                {profile ? (
                  <>
                    <Link href={`/profiles/${profile.id}`} className="text-steam-700 hover:underline">
                      {profile.name}
                    </Link>
                    <p className="text-xs text-ink-muted">
                      {profile.sterilizationTempC}–{profile.sterilizationTempC + profile.bandK} °C · hold ≥ {formatDuration(profile.holdingTimeS)} · equilibration ≤ {profile.maxEquilibrationS} s
                    </p>
                    {sizeClass.maxEquilibrationS !== null && profile.maxEquilibrationS > sizeClass.maxEquilibrationS && (
                      <p className="mt-1 text-xs text-caution-700">
                        ▲ The profile allows {profile.maxEquilibrationS} s, more than the {sizeClass.maxEquilibrationS} s EN 285 sets for this chamber size.
                      </p>
                    )}
                  </>
                ) : (
                  "None set"
                )}
              </dd>
            </dl>
          </Panel>
          {manage && (
            <>
              <Panel title="Edit sterilizer">
                <SterilizerForm profiles={profiles} sterilizer={s} />
              </Panel>
              <Panel title="Test schedule">
                <ScheduleEditor sterilizerId={s.id} rows={schedule.map((r) => ({ kind: r.kind, intervalDays: r.intervalDays, requiredBeforeUse: r.requiredBeforeUse }))} kinds={PERIODIC_TEST_KINDS} />
              </Panel>
            </>
          )}
        </div>
      </div>
    </>
  );
}

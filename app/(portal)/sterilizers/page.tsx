import Link from "next/link";
import { requirePageActor } from "@/lib/auth/page-guard";
import { getSterilizersPage } from "@/lib/services/equipment";
import { EmptyState, PageHeader, Panel } from "@/components/ui/panel";
import { Badge, VerdictBadge } from "@/components/ui/badge";
import { SterilizerForm } from "@/components/equipment/sterilizer-form";
import { SterilizerStatusLine } from "@/components/equipment/sterilizer-status";
import { formatDateTime } from "@/lib/format";
import { testKindLabel, plural, formatVolume } from "@/lib/domain";
import { TableFrame } from "@/components/ui/table-frame";

export const metadata = { title: "Sterilizers" };

export default async function SterilizersPage() {
  const actor = await requirePageActor("equipment:read");
  const { rows, profiles, timeZone, mayManage: manage } = await getSterilizersPage({ actor });
  return (
    <>
      <PageHeader
        title="Sterilizers"
        subtitle="Each chamber with its status, size class, default acceptance profile, latest cycle and the periodic tests that need doing."
        actions={
          <>
            <Link href="/profiles" className="btn-secondary">
              Acceptance profiles
            </Link>
            <Link href="/periodic-tests" className="btn-secondary">
              Periodic tests
            </Link>
          </>
        }
      />
      <div className={`grid gap-gutter ${manage ? "xl:grid-cols-[minmax(0,1fr)_22rem]" : ""}`}>
        <Panel title={plural(rows.length, "sterilizer")}>
          {rows.length === 0 ? (
            <EmptyState title="No sterilizer is registered for this site yet.">{manage ? "Add the first one with the form beside this list." : "An engineer adds sterilizers."}</EmptyState>
          ) : (
            <TableFrame label="Sterilizers">
              <table className="data-table" data-testid="sterilizers-table">
                <thead>
                  <tr>
                    <th>Sterilizer</th>
                    <th>Status</th>
                    <th>Chamber</th>
                    <th>Default profile</th>
                    <th>Latest cycle</th>
                    <th>Tests needing action</th>
                  </tr>
                </thead>
                <tbody>
                  {rows.map((s) => (
                    <tr key={s.id} className={s.active ? "" : "opacity-60"}>
                      <td>
                        <Link href={`/sterilizers/${s.id}`} className="font-medium text-steam-700 hover:underline">
                          {s.name}
                        </Link>
                        <p className="mono text-ink-muted">{s.serialNumber}</p>
                        {!s.active && <Badge>Retired</Badge>}
                      </td>
                      <td className="min-w-[14rem] max-w-[22rem]">
                        {s.active ? (
                          <SterilizerStatusLine status={s.status} reason={s.statusReason} since={s.statusSince} timeZone={timeZone} />
                        ) : (
                          <span className="text-sm text-ink-muted">Retired</span>
                        )}
                      </td>
                      <td>
                        <p className="tabular-nums">{formatVolume(s.chamberVolumeL)}</p>
                        <p className="text-xs text-ink-muted">
                          {s.sizeClass.standard}
                          {s.sizeClass.maxEquilibrationS !== null && <> · equilibration ≤ {s.sizeClass.maxEquilibrationS} s</>}
                        </p>
                      </td>
                      <td className="text-sm">
                        {s.defaultProfile ? (
                          <Link href={`/profiles/${s.defaultProfile.id}`} className="hover:underline">
                            {s.defaultProfile.name}
                          </Link>
                        ) : (
                          <span className="text-ink-muted">None set</span>
                        )}
                      </td>
                      <td>
                        {s.lastCycle ? (
                          <div className="space-y-1">
                            <Link href={`/cycles/${s.lastCycle.id}`} className="mono whitespace-nowrap font-medium text-steam-700 hover:underline">
                              {s.lastCycle.cycleNumber}
                            </Link>
                            <p className="text-xs text-ink-muted">{formatDateTime(s.lastCycle.startedAt ?? s.lastCycle.createdAt, timeZone)}</p>
                            <VerdictBadge verdict={s.lastCycle.verdict} />
                          </div>
                        ) : (
                          <span className="text-sm text-ink-muted">No cycle yet</span>
                        )}
                      </td>
                      <td>
                        {s.scheduledTests === 0 ? (
                          <span className="text-sm text-ink-muted">No schedule set</span>
                        ) : s.testsNeedingAction.length === 0 ? (
                          <Badge tone="pass">✓ All up to date</Badge>
                        ) : (
                          <ul className="space-y-1 text-sm">
                            {s.testsNeedingAction.map((t) => {
                              const today = t.status.state === "due-today";
                              const word = { overdue: "overdue", "due-today": "due today", failed: "failed, repeat", never: "never passed" }[t.status.state as string] ?? "";
                              return (
                                <li key={t.kind} className={today ? "text-caution-700" : "text-fail-700"}>
                                  <span aria-hidden>{today ? "▲ " : "✕ "}</span>
                                  {testKindLabel(t.kind)}: <strong className="font-semibold">{word}</strong>
                                </li>
                              );
                            })}
                          </ul>
                        )}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </TableFrame>
          )}
        </Panel>
        {manage && (
          <Panel title="Add a sterilizer">
            <SterilizerForm profiles={profiles} />
          </Panel>
        )}
      </div>
    </>
  );
}

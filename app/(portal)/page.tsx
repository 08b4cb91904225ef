import Link from "next/link";
import { requirePageActor } from "@/lib/auth/page-guard";
import { ROLE_DUTIES, ROLE_LABELS } from "@/lib/domain";
import { getHomeDashboard } from "@/lib/services/dashboard";
import { PageHeader, Panel } from "@/components/ui/panel";
import { CycleList } from "@/components/home/cycle-list";
import { CalibrationsDueList, TestsDueList } from "@/components/home/due-list";
import { StatusBoard } from "@/components/dashboard/status-board";
import { RequalificationDueList } from "@/components/studies/requalification-list";

export const metadata = { title: "Overview" };

export default async function HomePage() {
  const user = await requirePageActor();
  const home = await getHomeDashboard({ actor: user });
  const { timeZone } = home;
  const greeting = `${ROLE_LABELS[user.role]} — ${home.siteName ?? "no site"}`;
  const board = (
    <Panel
      title="Sterilizer status"
      action={
        home.kind !== "admin" && (
          <Link className="text-sm text-steam-700" href="/sterilizers">
            All sterilizers
          </Link>
        )
      }
    >
      <StatusBoard items={home.board} timeZone={timeZone} linked={home.kind !== "admin"} />
    </Panel>
  );

  if (home.kind === "admin") {
    const { overview } = home;
    return (
      <>
        <PageHeader title={`Welcome, ${user.name}`} subtitle={greeting} />
        <div className="grid gap-gutter md:grid-cols-3">
          <Stat label="User accounts" value={overview.users} href="/admin/users" />
          <Stat label="Disabled accounts" value={overview.disabled} href="/admin/users" />
          <Stat label="Failed sign-ins, last 7 days" value={overview.failedSignIns} href="/audit?action=auth.sign-in-failed" />
        </div>
        <div className="mt-gutter">{board}</div>
        <p className="mt-6 text-sm text-ink-muted">{ROLE_DUTIES.admin}</p>
      </>
    );
  }

  if (home.kind === "auditor") {
    return (
      <>
        <PageHeader title={`Welcome, ${user.name}`} subtitle={greeting} />
        <div className="mb-gutter">{board}</div>
        <div className="grid gap-gutter lg:grid-cols-2">
          <Panel
            title="Recently approved records"
            action={
              <Link className="text-sm text-steam-700" href="/archive">
                Open the archive
              </Link>
            }
          >
            <CycleList items={home.approved} empty="No record has been approved yet." timeZone={timeZone} />
          </Panel>
          <Panel title="Loading pattern requalification">
            <RequalificationDueList items={home.patterns} />
          </Panel>
          <Panel title="Evidence checks">
            <ul className="space-y-2 text-sm">
              <li>
                <Link className="text-steam-700 underline" href="/audit">
                  Audit ledger and its hash chain
                </Link>
              </li>
              <li>
                <Link className="text-steam-700 underline" href="/archive#verify">
                  Check a report PDF against the archive
                </Link>
              </li>
            </ul>
            <p className="mt-3 text-xs text-ink-muted">{ROLE_DUTIES.auditor}</p>
          </Panel>
        </div>
      </>
    );
  }

  const { review, mine, failures, testsDue, calibrations } = home;
  return (
    <>
      <PageHeader
        title={`Welcome, ${user.name}`}
        subtitle={greeting}
        actions={
          <Link href="/cycles/new" className="btn-primary">
            Upload a test cycle
          </Link>
        }
      />
      <div className="mb-gutter">{board}</div>
      <div className="grid gap-gutter lg:grid-cols-2">
        {review && (
          <Panel
            title={`Awaiting your review (${review.total})`}
            action={
              <Link className="text-sm text-steam-700" href="/review">
                Review queue
              </Link>
            }
          >
            <CycleList items={review.items} empty="Nothing waits for review." timeZone={timeZone} />
          </Panel>
        )}
        <Panel title="Your drafts and returned cycles">
          <CycleList items={mine} empty="You have no open drafts. Upload a logger file to start." timeZone={timeZone} />
        </Panel>
        <Panel title="Failures in the last 14 days">
          <CycleList items={failures} empty="No failing cycle in the last 14 days." timeZone={timeZone} />
        </Panel>
        <Panel title="Periodic tests due">
          <TestsDueList items={testsDue.map((r) => ({ sterilizerName: r.sterilizerName, kind: r.kind, state: r.status.state, dueOn: r.status.dueOn }))} />
        </Panel>
        <Panel title="Calibrations due">
          <CalibrationsDueList items={calibrations} />
        </Panel>
        <Panel title="Loading pattern requalification">
          <RequalificationDueList items={home.patterns} />
        </Panel>
      </div>
    </>
  );
}

function Stat({ label, value, href }: { label: string; value: number; href: string }) {
  return (
    <Link href={href} className="panel block px-panel py-4 hover:border-steam-500">
      <p className="text-2xl font-semibold tabular-nums">{value}</p>
      <p className="text-sm text-ink-muted">{label}</p>
    </Link>
  );
}

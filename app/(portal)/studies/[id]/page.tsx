import type { Metadata } from "next";
import Link from "next/link";
import { Panel } from "@/components/ui/panel";
import { SafetyCaution } from "@/components/cycles/record/safety-caution";
import { AttachRunPanel } from "@/components/studies/attach-panel";
import { CrossRunTable } from "@/components/studies/cross-run-table";
import { StudyDeviationsPanel } from "@/components/studies/deviation-panel";
import { StudyHeatMap } from "@/components/studies/heat-map";
import { StudyIndicatorsPanel } from "@/components/studies/indicator-panel";
import { DraftForm } from "@/components/studies/draft-form";
import { studyNextStep } from "@/components/studies/next-step";
import { PatternView, ProtocolView } from "@/components/studies/protocol-view";
import { RunsTable } from "@/components/studies/runs-table";
import { StudySignForm } from "@/components/studies/sign-form";
import { StudySignatures } from "@/components/studies/signatures";
import { StudyStatusBadge } from "@/components/studies/status-badge";
import { orNotFound, requirePageActor } from "@/lib/auth/page-guard";
import { STUDY_KIND_LABELS } from "@/lib/domain";
import { formatDateTime } from "@/lib/format";
import { getStudyDetail, listAttachableCycles, proposeSensorMap } from "@/lib/services/studies";
import { AppError } from "@/lib/errors";
import type { Actor } from "@/lib/domain";
import { siteTimeZone } from "@/lib/services/study-planning";

export const metadata: Metadata = { title: "Qualification study" };

type Search = Record<string, string | string[] | undefined>;

export default async function StudyPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<Search> }) {
  const actor = await requirePageActor("study:read");
  const { id } = await params;
  const raw = await searchParams;
  const attachCycleId = typeof raw.attach === "string" ? raw.attach : undefined;
  const [detail, timeZone] = await Promise.all([orNotFound(getStudyDetail({ actor, id })), siteTimeZone({ actor })]);
  const attach = detail.allowed.attach ? await attachChoices(actor, id, attachCycleId) : null;
  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-2 text-sm text-ink-muted">
        <Link href="/studies" className="text-steam-700 underline underline-offset-2">
          Studies
        </Link>
        <span aria-hidden="true"> / </span>
        <span>{detail.studyNumber}</span>
      </nav>
      <header className="mb-4" data-testid="study-header">
        <div className="flex flex-wrap items-center gap-2">
          <h1>
            {detail.studyNumber} · {detail.title}
          </h1>
          <StudyStatusBadge status={detail.status} />
        </div>
        <p className="mt-1 text-sm text-ink-soft">
          {STUDY_KIND_LABELS[detail.kind]} ·{" "}
          <Link href={`/sterilizers/${detail.sterilizer.id}`} className="font-medium text-steam-700 underline underline-offset-2">
            {detail.sterilizer.name}
          </Link>{" "}
          · {detail.profile.name} · planned by {detail.author.name} on {formatDateTime(detail.createdAt, timeZone)}
        </p>
        <p className="mt-2 rounded-md border border-steam-500/30 bg-steam-50 px-3 py-2 text-sm" data-testid="study-next-step">
          {studyNextStep(detail)}
        </p>
      </header>

      <div className="grid gap-gutter xl:grid-cols-[minmax(0,1fr)_22rem]">
        <div className="min-w-0 space-y-gutter">
          <Panel title="Protocol and acceptance criteria">
            <ProtocolView detail={detail} />
            {detail.allowed.edit && (
              <details className="mt-4 border-t border-ink-line pt-3">
                <summary className="cursor-pointer text-sm font-medium text-steam-700">Edit the draft</summary>
                <div className="mt-3">
                  <DraftForm detail={detail} />
                </div>
              </details>
            )}
          </Panel>

          <Panel title="Loading pattern and probe positions">
            <PatternView detail={detail} />
          </Panel>

          <section id="runs" className="scroll-mt-4">
            <Panel title={`Runs · ${detail.summary.consecutive.passing} of ${detail.summary.consecutive.required} consecutive passing`}>
              <RunsTable detail={detail} timeZone={timeZone} />
              {attach && <AttachRunPanel detail={detail} {...attach} timeZone={timeZone} />}
            </Panel>
          </section>

          <Panel title="Across runs">
            <CrossRunTable detail={detail} />
          </Panel>

          <Panel title="Heat map of positions and runs">
            <StudyHeatMap summary={detail.summary} criteria={detail.criteria} />
          </Panel>

          <StudyIndicatorsPanel detail={detail} timeZone={timeZone} />
          <StudyDeviationsPanel detail={detail} timeZone={timeZone} />

          <Panel title="Study report">
            <ReportLinks detail={detail} timeZone={timeZone} />
          </Panel>
          <SafetyCaution />
        </div>

        <aside className="min-w-0 space-y-gutter" aria-label="Signatures">
          <Panel title={`Signatures (${detail.signatures.length})`}>
            <StudySignatures signatures={detail.signatures} timeZone={timeZone} />
          </Panel>
          <Panel title="Sign">
            {detail.allowed.sign.length > 0 ? (
              <StudySignForm studyId={detail.id} meanings={detail.allowed.sign} signerName={actor.name} />
            ) : (
              <p className="text-sm text-ink-muted">
                {detail.status === "approved" || detail.status === "failed" ? "The study is closed: nothing more to sign." : "Nothing for you to sign at this step."}
              </p>
            )}
          </Panel>
        </aside>
      </div>
    </>
  );
}

/** The signed cycles that can be attached, and the proposed sensor map of the one chosen (or why there is none). */
async function attachChoices(actor: Actor, id: string, cycleId: string | undefined) {
  const cycles = await listAttachableCycles({ actor, id });
  const chosen = cycles.find((c) => c.id === cycleId) ?? null;
  if (!chosen) return { cycles, chosen, proposal: null, problem: cycleId ? "That cycle cannot be attached to this study: choose one from the list." : null };
  try {
    return { cycles, chosen, proposal: await proposeSensorMap({ actor, id, cycleId: chosen.id }), problem: null };
  } catch (error) {
    if (error instanceof AppError) return { cycles, chosen, proposal: null, problem: error.message };
    throw error;
  }
}

function ReportLinks({ detail, timeZone }: { detail: { id: string; report: { reportNumber: string; sha256: string; createdAt: string } | null }; timeZone: string }) {
  if (detail.report)
    return (
      <div className="space-y-1 text-sm" data-testid="study-report">
        <p>
          <a href={`/api/studies/${detail.id}/report`} className="font-medium text-steam-700 underline underline-offset-2">
            Download the archived report {detail.report.reportNumber} (PDF)
          </a>
        </p>
        <p className="text-xs text-ink-muted">Archived {formatDateTime(detail.report.createdAt, timeZone)}. Check a copy byte for byte in the signed archive.</p>
        <p className="mono break-all text-xs text-ink-faint">SHA-256 {detail.report.sha256}</p>
      </div>
    );
  return (
    <p className="text-sm" data-testid="study-report">
      <a href={`/api/studies/${detail.id}/report`} className="text-steam-700 underline underline-offset-2">
        Download a draft report (PDF)
      </a>{" "}
      <span className="text-ink-muted">— marked as a draft; the signed report is archived when quality assurance approves the study.</span>
    </p>
  );
}

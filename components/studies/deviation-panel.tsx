import { Badge } from "@/components/ui/badge";
import { formatDateTime } from "@/lib/format";
import { DEVIATION_SOURCE_LABELS } from "@/lib/domain";
import type { StudyDeviationView, StudyDetail } from "@/lib/studies/contracts";
import { EvidenceSection } from "./indicator-panel";
import { CloseDeviationForm, DeviationEditForm, RaiseDeviationForm } from "./deviation-forms";

/** The slice of StudyDetail this panel reads. */
export type DeviationPanelDetail = Pick<StudyDetail, "id" | "runs" | "deviations"> & { allowed: Pick<StudyDetail["allowed"], "record" | "closeDeviation"> };

export const DEVIATIONS_HEADING_ID = "study-deviations";

/** Deviations of a study (issue 14 §5): open ones first with their investigation, closed ones kept below; the gate on approval said plainly. */
export function StudyDeviationsPanel({ detail, timeZone = "UTC" }: { detail: DeviationPanelDetail; timeZone?: string }) {
  const open = detail.deviations.filter((d) => d.status === "open");
  const closed = detail.deviations.filter((d) => d.status !== "open");
  const runNumber = new Map(detail.runs.map((r) => [r.id, r.runNumber]));
  const card = (d: StudyDeviationView) => (
    <DeviationCard key={d.id} deviation={d} studyId={detail.id} runNumber={d.runId ? runNumber.get(d.runId) : undefined} allowed={detail.allowed} timeZone={timeZone} />
  );
  return (
    <EvidenceSection headingId={DEVIATIONS_HEADING_ID} title="Deviations" testId="study-deviations">
      {open.length > 0 ? (
        <p role="status" className="rounded-md border border-fail-500/40 bg-fail-50 px-3 py-2 text-sm font-medium text-fail-700">
          ✕ {open.length === 1 ? "1 deviation is open" : `${open.length} deviations are open`}. A study with an open deviation cannot be approved: each needs its impact and root cause written and an
          engineer to close it with a reason.
        </p>
      ) : (
        <p className="text-sm text-ink-muted">
          No deviation is open. A study with an open deviation cannot be approved; a failed run, a positive indicator or a missed criterion opens one automatically.
        </p>
      )}
      {open.length > 0 && <ul className="space-y-3">{open.map(card)}</ul>}
      {closed.length > 0 && (
        <details>
          <summary className="cursor-pointer text-sm text-steam-700">Closed deviations ({closed.length})</summary>
          <ul className="mt-2 space-y-3">{closed.map(card)}</ul>
        </details>
      )}
      {detail.allowed.record && <RaiseDeviationForm studyId={detail.id} runs={detail.runs} />}
    </EvidenceSection>
  );
}

function DeviationCard({
  deviation: d,
  studyId,
  runNumber,
  allowed,
  timeZone,
}: {
  deviation: StudyDeviationView;
  studyId: string;
  runNumber: number | undefined;
  allowed: DeviationPanelDetail["allowed"];
  timeZone: string;
}) {
  const isOpen = d.status === "open";
  return (
    <li className="rounded-md border border-ink-line p-3" data-testid="deviation" data-status={d.status}>
      <p className="flex flex-wrap items-center gap-2 text-sm">
        {isOpen ? <Badge tone="fail">✕ Open</Badge> : <Badge tone="pass">✓ Closed</Badge>}
        <span className="font-medium">{DEVIATION_SOURCE_LABELS[d.source]}</span>
        <span className="text-ink-muted">
          · {runNumber === undefined ? "the study as a whole" : `run ${runNumber}`} · opened by {d.openedBy?.name ?? "Papin"}, {formatDateTime(d.openedAt, timeZone)}
        </span>
      </p>
      <p className="mt-1 text-sm">{d.what}</p>
      {isOpen && allowed.record ? (
        <DeviationEditForm studyId={studyId} deviation={d} />
      ) : (
        <dl className="mt-2 grid gap-x-4 gap-y-1 text-sm sm:grid-cols-[auto_1fr]">
          <dt className="text-ink-muted">Impact</dt>
          <dd>{d.impact || "Not assessed yet"}</dd>
          <dt className="text-ink-muted">Root cause</dt>
          <dd>{d.rootCause || "Not found yet"}</dd>
          <dt className="text-ink-muted">CAPA reference</dt>
          <dd>{d.capaReference || "—"}</dd>
        </dl>
      )}
      {!isOpen && (
        <p className="mt-2 text-sm text-ink-muted">
          Closed by {d.closedBy?.name ?? "—"}, {formatDateTime(d.closedAt, timeZone)}: {d.closeReason}
        </p>
      )}
      {isOpen && allowed.closeDeviation && <CloseDeviationForm studyId={studyId} deviation={d} />}
    </li>
  );
}

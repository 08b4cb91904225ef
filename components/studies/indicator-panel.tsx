import type { ReactNode } from "react";
import type { StudyDetail } from "@/lib/studies/contracts";
import { indicatorGrid } from "@/lib/domain/study-evidence";
import { IndicatorGrid } from "./indicator-grid";
import { IndicatorHistory } from "./indicator-history";
import { IndicatorForm } from "./indicator-form";

/** The slice of StudyDetail this panel reads. */
export type IndicatorPanelDetail = Pick<StudyDetail, "id" | "runs" | "indicators"> & {
  loadingPattern: Pick<StudyDetail["loadingPattern"], "positions">;
  criteria: Pick<StudyDetail["criteria"], "indicatorsRequired">;
  allowed: Pick<StudyDetail["allowed"], "record">;
};

/** The heading's id, so the study page can link here. */
export const INDICATORS_HEADING_ID = "study-indicators";

/** Indicators of a study (issue 14 §4): runs × positions with the reading that counts, corrections kept, the form for those who record. */
export function StudyIndicatorsPanel({ detail, timeZone = "UTC" }: { detail: IndicatorPanelDetail; timeZone?: string }) {
  const cells = indicatorGrid(detail.indicators);
  const positions = detail.loadingPattern.positions;
  return (
    <EvidenceSection headingId={INDICATORS_HEADING_ID} title="Biological and chemical indicators" testId="study-indicators">
      <p className="text-sm text-ink-muted">
        A positive indicator (growth, or a chemical indicator not changed as specified) fails its run.{" "}
        {detail.criteria.indicatorsRequired
          ? "This protocol requires a biological indicator read at every load position: a run stays pending until each one is read."
          : "This protocol does not require indicators; those recorded still count."}
      </p>
      {detail.runs.length === 0 ? (
        <p className="rounded-md border border-dashed border-ink-line px-3 py-3 text-sm text-ink-muted">No run attached yet: indicators are recorded per run and position.</p>
      ) : (
        <IndicatorGrid runs={detail.runs} positions={positions} cells={cells} indicatorsRequired={detail.criteria.indicatorsRequired} />
      )}
      <IndicatorHistory runs={detail.runs} positions={positions} cells={cells} timeZone={timeZone} />
      {detail.allowed.record && detail.runs.length > 0 && (
        <IndicatorForm studyId={detail.id} runs={detail.runs} positions={positions} recorded={detail.indicators.map(({ runId, positionId, kind }) => ({ runId, positionId, kind }))} />
      )}
    </EvidenceSection>
  );
}

/** A panel whose heading carries an id, so a page can link to it ("#study-indicators"). */
export function EvidenceSection({ headingId, title, testId, children }: { headingId: string; title: string; testId: string; children: ReactNode }) {
  return (
    <section className="panel" aria-labelledby={headingId} data-testid={testId}>
      <header className="border-b border-ink-line px-panel py-3">
        <h2 id={headingId} className="scroll-mt-20 text-base font-semibold">
          {title}
        </h2>
      </header>
      <div className="space-y-4 px-panel py-4">{children}</div>
    </section>
  );
}

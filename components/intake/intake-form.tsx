"use client";

import { useId } from "react";
import { ColumnsPanel } from "./columns-panel";
import { DetailsPanel } from "./details-panel";
import { FilePanel } from "./file-panel";
import { needsStartTime, type IntakeInstrument, type IntakeProfile, type IntakeSterilizer } from "./intake-request";
import { ProgressLine } from "./progress-line";
import { useIntake } from "./use-intake";
import { IntakeSheetPanel } from "@/components/bowie-dick/intake-sheet";

type Props = {
  sterilizers: IntakeSterilizer[];
  profiles: IntakeProfile[];
  instruments: IntakeInstrument[];
  limitMb: number;
  /** the site's IANA time zone: a start time typed here is read in it */
  timeZone: string;
};

/** Cycle intake: drop the logger file, confirm its columns, give the cycle's details, analyse. */
export function IntakeForm({ sterilizers, profiles, instruments, limitMb, timeZone }: Props) {
  const ids = useId();
  const intake = useIntake({ sterilizers, instruments });
  const { busy, logger, details } = intake;
  const { message: summaryMessage, ref: summaryRef } = intake.summary;
  const inspect = logger.inspect;

  return (
    <form onSubmit={intake.analyse} noValidate className="space-y-gutter" aria-label="New test cycle" data-ready={intake.ready ? "true" : "false"}>
      {summaryMessage && (
        <div ref={summaryRef} tabIndex={-1} role="alert" className="rounded-md border border-fail-500/40 bg-fail-50 px-4 py-3 text-sm text-fail-700" data-testid="intake-error">
          {summaryMessage}
        </div>
      )}
      <FilePanel logger={logger} limitMb={limitMb} busy={Boolean(busy)} onFiles={intake.addFiles} onRemove={intake.removeFile} />
      {busy?.label === "Reading the file" && <ProgressLine busy={busy} />}
      {inspect && <ColumnsPanel logger={logger} inspect={inspect} idPrefix={ids} />}
      <DetailsPanel
        idPrefix={ids}
        step={inspect ? 3 : 2}
        details={details}
        sterilizers={sterilizers}
        profiles={profiles}
        instruments={instruments}
        busy={Boolean(busy)}
        onInstrumentChange={intake.chooseInstrument}
        askStartTime={needsStartTime(inspect)}
        timeZone={timeZone}
      />
      {details.fields.testKind === "bowie-dick" && <IntakeSheetPanel step={inspect ? 4 : 3} errors={intake.sheetErrors} busy={Boolean(busy)} />}
      {busy && busy.label !== "Reading the file" && <ProgressLine busy={busy} />}
      <div className="flex flex-wrap items-center gap-3">
        <button type="submit" className="btn-primary px-5" disabled={Boolean(busy)}>
          {busy?.label === "Analysing" || busy?.label === "Opening the record" ? "Analysing…" : "Analyse"}
        </button>
        <p className="text-xs text-ink-muted">The cycle is saved as a draft with its analysis. You submit it for review from its record.</p>
      </div>
    </form>
  );
}

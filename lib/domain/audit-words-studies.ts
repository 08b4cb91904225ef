/**
 * The ledger's words for qualification studies (issue 14): one sentence per action, as describeAuditEvent reads them.
 * Kept beside audit-words.ts so that file stays readable; it spreads these into AUDIT_ACTIONS.
 */
import { INDICATOR_KIND_LABELS, INDICATOR_RESULT_LABELS, type IndicatorKind, type IndicatorResult } from "./studies";

type Facts = { record: string; old: Record<string, unknown>; new: Record<string, unknown> };
type Kind = { label: string; what: (f: Facts) => string };

const str = (v: unknown): string | null => (typeof v === "string" && v ? v : null);
const num = (v: unknown): number | null => (typeof v === "number" && Number.isFinite(v) ? v : null);
const study = (f: Facts) => `study ${str(f.new.studyNumber) ?? f.record}`;

const signed = (label: string, verb: (f: Facts) => string): Kind => ({ label, what: verb });

function indicator(verb: string): Kind["what"] {
  return (f) => {
    const kind = str(f.new.kind) as IndicatorKind | null;
    const result = str(f.new.result) as IndicatorResult | null;
    const what = kind && Object.hasOwn(INDICATOR_KIND_LABELS, kind) ? INDICATOR_KIND_LABELS[kind].toLowerCase() : "indicator";
    const read = result && Object.hasOwn(INDICATOR_RESULT_LABELS, result) ? `: ${INDICATOR_RESULT_LABELS[result].toLowerCase()}` : "";
    const where = [str(f.new.positionId) && `at ${str(f.new.positionId)}`, num(f.new.runNumber) !== null && `of run ${num(f.new.runNumber)}`].filter(Boolean).join(" ");
    return `${verb} a ${what}${where ? ` ${where}` : ""} of study ${f.record}${read}`;
  };
}

/** `changed` spells out one or two changed fields (audit-words.ts). */
export function studyAuditActions(changed: (f: Facts) => string): Record<string, Kind> {
  return {
    "study.create": { label: "Planned a study", what: (f) => `planned the qualification ${study(f)}${str(f.new.title) ? ` (${str(f.new.title)})` : ""}` },
    "study.edit": { label: "Changed a draft study", what: (f) => `changed the draft protocol of study ${f.record}${changed(f)}` },
    "study.sign.protocol-approved": signed("Approved a study protocol", (f) => `approved the protocol of study ${f.record}`),
    "study.sign.submitted-for-review": signed("Submitted a study for review", (f) => `submitted study ${f.record} for review`),
    "study.sign.reviewed": signed("Reviewed a study", (f) => `signed study ${f.record} as reviewed`),
    "study.sign.qa-approved": signed(
      "Approved a study (QA)",
      (f) => `approved study ${f.record} for quality assurance${str(f.new.reportNumber) ? `, archiving report ${str(f.new.reportNumber)}` : ""}`,
    ),
    "study.sign.returned": signed("Returned a study", (f) => `returned study ${f.record} to its author`),
    "study.sign.failed": signed("Closed a study as failed", (f) => `closed study ${f.record} as failed`),
    "study-run.attach": {
      label: "Attached a study run",
      what: (f) =>
        `attached cycle ${str(f.new.cycleNumber) ?? "(not on file)"} as run ${num(f.new.runNumber) ?? "?"} of study ${f.record}${str(f.new.judgement) ? ` (judged ${str(f.new.judgement)})` : ""}`,
    },
    "study-indicator.record": { label: "Recorded a study indicator", what: indicator("recorded") },
    "study-indicator.correct": { label: "Corrected a study indicator", what: indicator("corrected") },
    "study-deviation.open": { label: "Opened a study deviation", what: (f) => `opened a deviation on study ${f.record}${str(f.new.what) ? `: ${str(f.new.what)}` : ""}` },
    "study-deviation.edit": { label: "Investigated a study deviation", what: (f) => `updated the investigation of a deviation of study ${f.record}${changed(f)}` },
    "study-deviation.close": { label: "Closed a study deviation", what: (f) => `closed a deviation of study ${f.record}` },
    "loading-pattern.create": { label: "Added a loading pattern", what: (f) => `added the loading pattern ${str(f.new.name) ?? f.record}` },
    "loading-pattern.requalification-due": {
      label: "Requalification date set",
      what: (f) =>
        `set the requalification of loading pattern ${f.record} due on ${str(f.new.requalificationDueOn) ?? "(no date)"}${str(f.new.studyNumber) ? ` (study ${str(f.new.studyNumber)} approved)` : ""}`,
    },
    "loading-pattern.required-before-use": {
      label: "Requalification before use decided",
      what: (f) => (f.new.requiredBeforeUse === true ? `required loading pattern ${f.record} to be requalified before use` : `lifted the before-use requirement of loading pattern ${f.record}`),
    },
  };
}

import type { StudyDetail } from "@/lib/studies/contracts";
import { plural } from "@/lib/domain";

/** What the study waits for, in one sentence, from its state and its figures (the services enforce the same rules). */
export function studyNextStep(detail: StudyDetail): string {
  const { consecutive } = detail.summary;
  const open = detail.deviations.filter((d) => d.status === "open").length;
  const pending = detail.summary.runs.filter((r) => r.judgement === "pending").length;
  const openText = open > 0 ? ` ${plural(open, "deviation")} open: an engineer closes ${open === 1 ? "it" : "them"} with impact and root cause first.` : "";
  switch (detail.status) {
    case "draft":
      return "Draft: the author completes the protocol, criteria and loading pattern; then an engineer who is not the author approves the protocol with a signature.";
    case "protocol-approved":
      return `Protocol approved and frozen. Next: attach the first signed cycle of ${detail.sterilizer.name} run with ${detail.profile.name} as run 1.`;
    case "running": {
      if (!consecutive.complete) {
        const more = consecutive.required - consecutive.passing;
        return `Runs in progress: ${consecutive.passing} of ${consecutive.required} consecutive passing runs. Attach ${plural(more, "more passing run")}${pending ? `; record the indicators of ${plural(pending, "pending run")}` : ""}.${openText}`;
      }
      if (pending > 0) return `The series is complete, but ${plural(pending, "run")} still wait${pending === 1 ? "s" : ""} for indicator readings.${openText}`;
      return `The series is complete (${consecutive.passing} of ${consecutive.required} consecutive passing runs).${openText}${open ? "" : " Next: the author submits the study for review."}`;
    }
    case "ready-for-review": {
      const reviewed = lastSubmission(detail).some((s) => s.meaning === "reviewed");
      return reviewed
        ? `Reviewed. Next: quality assurance approval by a third engineer, neither the author nor the reviewer.${openText}`
        : `Submitted for review. Next: an engineer who is not the author reviews it (or returns it with a reason).${openText}`;
    }
    case "approved":
      return detail.loadingPattern.requalificationDueOn
        ? `Approved. The loading pattern ${detail.loadingPattern.name} is due for requalification on ${detail.loadingPattern.requalificationDueOn}.`
        : "Approved.";
    case "failed":
      return "Failed and closed: nothing changes any more. Plan a new study once the cause is dealt with.";
  }
}

/** The signatures since the last submission for review (a return starts the review over). */
export function lastSubmission(detail: StudyDetail) {
  const sorted = [...detail.signatures].sort((a, b) => a.signedAt.localeCompare(b.signedAt));
  const from = sorted.map((s) => s.meaning).lastIndexOf("submitted-for-review");
  return from < 0 ? [] : sorted.slice(from);
}

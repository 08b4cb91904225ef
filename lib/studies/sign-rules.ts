/**
 * Who may sign a qualification study with which meaning, and when (issue 14; lib/domain/studies.ts states the rules).
 * Pure: the service refuses with these sentences, and the page offers only what passes.
 */
import type { Role } from "@/lib/domain";
import type { StudySignatureMeaning, StudyStatus } from "@/lib/domain/studies";

export type SignRuleInput = {
  actor: { id: string; role: Role };
  status: StudyStatus;
  authorId: string;
  /** in signing order */
  signatures: Array<{ meaning: StudySignatureMeaning; userId: string }>;
  seriesComplete: boolean;
  pendingRuns: number;
  openDeviations: number;
  runsRequired: number;
};

export type Refusal = { status: 400 | 403 | 409; message: string };

/** The signatures since the author last submitted the study: the reviewers of this round. */
export function currentRound(signatures: SignRuleInput["signatures"]) {
  const start = signatures.map((s) => s.meaning).lastIndexOf("submitted-for-review");
  return start < 0 ? [] : signatures.slice(start + 1);
}

function completeness(input: SignRuleInput, action: string): Refusal | null {
  if (!input.seriesComplete) return { status: 409, message: `The study cannot be ${action} yet: the last ${input.runsRequired} runs attached must all pass.` };
  if (input.pendingRuns > 0)
    return { status: 409, message: `The study cannot be ${action} yet: ${input.pendingRuns === 1 ? "a run is" : `${input.pendingRuns} runs are`} still pending indicator readings.` };
  if (input.openDeviations > 0)
    return {
      status: 409,
      message: `The study cannot be ${action} while ${input.openDeviations === 1 ? "a deviation is" : `${input.openDeviations} deviations are`} open; close ${input.openDeviations === 1 ? "it" : "them"} with a reason first.`,
    };
  return null;
}

/** Why this actor may not sign with this meaning now, or null when the signature may be applied (password aside). */
export function studySignatureRefusal(input: SignRuleInput, meaning: StudySignatureMeaning, reason: string | null): Refusal | null {
  const { actor, status } = input;
  if (actor.role !== "engineer") return { status: 403, message: "Only engineers sign qualification studies; quality assurance is a second, independent engineer." };
  const isAuthor = actor.id === input.authorId;
  const notAuthor = (what: string): Refusal | null => (isAuthor ? { status: 403, message: `Segregation of duties: you wrote this study, so another engineer must ${what}.` } : null);
  const needStatus = (wanted: StudyStatus[], what: string): Refusal | null => (wanted.includes(status) ? null : { status: 409, message: `This study is ${status.replace(/-/g, " ")}; ${what}.` });
  switch (meaning) {
    case "protocol-approved":
      return needStatus(["draft"], "only a draft protocol can be approved") ?? notAuthor("approve its protocol");
    case "submitted-for-review":
      if (!isAuthor) return { status: 403, message: "Only the study's author submits it for review." };
      return needStatus(["running"], "only a study with runs in progress can be submitted for review") ?? completeness(input, "submitted for review");
    case "reviewed": {
      const blocked = needStatus(["ready-for-review"], "only a study submitted for review can be reviewed") ?? notAuthor("review it");
      if (blocked) return blocked;
      if (currentRound(input.signatures).some((s) => s.meaning === "reviewed")) return { status: 409, message: "This study was already reviewed in this round; quality assurance approves it next." };
      return null;
    }
    case "qa-approved": {
      const blocked = needStatus(["ready-for-review"], "only a study submitted for review can be approved") ?? notAuthor("approve it for quality assurance");
      if (blocked) return blocked;
      const reviewers = currentRound(input.signatures).filter((s) => s.meaning === "reviewed");
      if (reviewers.length === 0) return { status: 409, message: "The study must be reviewed by an engineer other than the author before quality assurance approves it." };
      if (reviewers.some((s) => s.userId === actor.id)) return { status: 403, message: "Segregation of duties: you reviewed this study, so a third engineer must approve it for quality assurance." };
      return completeness(input, "approved");
    }
    case "returned":
      if (!reason) return { status: 400, message: "Give the reason for returning the study, so the author knows what to do." };
      return needStatus(["ready-for-review"], "only a study submitted for review can be returned") ?? notAuthor("return it");
    case "failed":
      if (!reason) return { status: 400, message: "Give the reason the study failed." };
      return needStatus(["running", "ready-for-review"], "only a study with runs can be closed as failed") ?? notAuthor("close it as failed");
  }
}

export const NEXT_STUDY_STATUS: Record<StudySignatureMeaning, StudyStatus> = {
  "protocol-approved": "protocol-approved",
  "submitted-for-review": "ready-for-review",
  reviewed: "ready-for-review",
  "qa-approved": "approved",
  returned: "running",
  failed: "failed",
};

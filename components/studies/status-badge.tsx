import { Badge, type BadgeTone } from "@/components/ui/badge";
import { STUDY_STATUS_LABELS, type StudyStatus } from "@/lib/domain";
import type { RunJudgement } from "@/lib/analysis/study-types";

const STATUS_TONES: Record<StudyStatus, BadgeTone> = {
  draft: "neutral",
  "protocol-approved": "steam",
  running: "steam",
  "ready-for-review": "brass",
  approved: "pass",
  failed: "fail",
};

export function StudyStatusBadge({ status }: { status: StudyStatus }) {
  return <Badge tone={STATUS_TONES[status]}>{STUDY_STATUS_LABELS[status]}</Badge>;
}

/** A run's judgement, marked ✓/✕/… so it never rests on colour alone. */
export function RunJudgementBadge({ judgement }: { judgement: RunJudgement }) {
  if (judgement === "pass") return <Badge tone="pass">✓ Pass</Badge>;
  if (judgement === "fail") return <Badge tone="fail">✕ Fail</Badge>;
  return <Badge tone="caution">… Pending</Badge>;
}

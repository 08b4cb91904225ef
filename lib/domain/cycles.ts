export const CYCLE_STATUSES = ["draft", "submitted", "approved", "rejected"] as const;
export type CycleStatus = (typeof CYCLE_STATUSES)[number];

export const CYCLE_STATUS_LABELS: Record<CycleStatus, string> = {
  draft: "Draft",
  submitted: "Awaiting review",
  approved: "Approved",
  rejected: "Returned",
};

/** An analysis' verdict, a cycle's verdict and a periodic test's result all take these two words. */
export const VERDICTS = ["pass", "fail"] as const;
export type Verdict = (typeof VERDICTS)[number];

export const SIGNATURE_MEANINGS = ["reviewed", "approved", "rejected"] as const;
export type SignatureMeaning = (typeof SIGNATURE_MEANINGS)[number];

export const SIGNATURE_MEANING_LABELS: Record<SignatureMeaning, string> = {
  reviewed: "Reviewed",
  approved: "Approved",
  rejected: "Rejected",
};

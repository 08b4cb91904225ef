/** Whether a sterilizer may be used for loads: a cached state recomputed from its tests, schedule and engineers' decisions. */
export const STERILIZER_STATUSES = ["in-use", "out-of-use"] as const;
export type SterilizerStatus = (typeof STERILIZER_STATUSES)[number];

export const STERILIZER_STATUS_LABELS: Record<SterilizerStatus, string> = {
  "in-use": "In use",
  "out-of-use": "Out of use",
};

/** How a status event came about: found by the rule (a test, the calendar), or an engineer's signed decision. */
export const STATUS_EVENT_KINDS = ["automatic", "manual"] as const;
export type StatusEventKind = (typeof STATUS_EVENT_KINDS)[number];

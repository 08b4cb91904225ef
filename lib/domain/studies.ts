/**
 * Qualification studies: several consecutive runs of one loading pattern with probes at mapped positions, judged
 * together (issue 14). The ids are stored; the labels are words for people.
 */

/** heat-distribution: an empty or lightly loaded chamber; heat-penetration: a defined load (common practice). */
export const STUDY_KINDS = ["heat-distribution", "heat-penetration"] as const;
export type StudyKind = (typeof STUDY_KINDS)[number];
export const STUDY_KIND_LABELS: Record<StudyKind, string> = {
  "heat-distribution": "Heat distribution (empty or lightly loaded chamber)",
  "heat-penetration": "Heat penetration (defined load)",
};

/** draft → protocol-approved (signed) → running (first run attached) → ready-for-review (author signed) → approved | failed. */
export const STUDY_STATUSES = ["draft", "protocol-approved", "running", "ready-for-review", "approved", "failed"] as const;
export type StudyStatus = (typeof STUDY_STATUSES)[number];
export const STUDY_STATUS_LABELS: Record<StudyStatus, string> = {
  draft: "Draft protocol",
  "protocol-approved": "Protocol approved",
  running: "Runs in progress",
  "ready-for-review": "Ready for review",
  approved: "Approved",
  failed: "Failed",
};
/** Closed studies change no more; a new study is the answer. */
export const isClosedStudyStatus = (status: StudyStatus): boolean => status === "approved" || status === "failed";

/**
 * What a study signature means. Rules (enforced in lib/services): protocol-approved by an engineer who is not the
 * author; submitted-for-review by the author (an engineer); reviewed by an engineer who is not the author; qa-approved by
 * a third engineer, neither author nor reviewer (Papin's decision: QA is a second, independent engineer, because
 * auditors change nothing); failed and returned by an engineer who is not the author, with a reason.
 */
export const STUDY_SIGNATURE_MEANINGS = ["protocol-approved", "submitted-for-review", "reviewed", "qa-approved", "failed", "returned"] as const;
export type StudySignatureMeaning = (typeof STUDY_SIGNATURE_MEANINGS)[number];
export const STUDY_SIGNATURE_MEANING_LABELS: Record<StudySignatureMeaning, string> = {
  "protocol-approved": "Protocol approved",
  "submitted-for-review": "Submitted for review (author)",
  reviewed: "Reviewed",
  "qa-approved": "Approved for quality assurance",
  failed: "Study failed",
  returned: "Returned to the author",
};

/** One place of the loading pattern where a probe (and its indicators) sits: "P3, tray 2 centre, wrapped set". */
export type PatternPosition = {
  /** short, stable within the pattern: "P1" … */
  id: string;
  label: string;
  /** the chamber position the trade names (lib/domain/sensor-positions.ts), when one fits */
  sensorPosition?: string;
  note?: string;
};
export type PatternItem = { name: string; quantity: number; note?: string };

export const PATTERN_POSITIONS_MAX = 40;
export const PATTERN_ITEMS_MAX = 60;

export const INDICATOR_KINDS = ["biological", "chemical"] as const;
export type IndicatorKind = (typeof INDICATOR_KINDS)[number];
export const INDICATOR_KIND_LABELS: Record<IndicatorKind, string> = { biological: "Biological indicator", chemical: "Chemical indicator" };

/** growth / no-growth for a biological indicator; pass / fail for a chemical one. growth and fail are positive. */
export const INDICATOR_RESULTS = ["no-growth", "growth", "pass", "fail"] as const;
export type IndicatorResult = (typeof INDICATOR_RESULTS)[number];
export const INDICATOR_RESULT_LABELS: Record<IndicatorResult, string> = {
  "no-growth": "No growth (negative)",
  growth: "Growth (positive)",
  pass: "Changed as specified",
  fail: "Not changed as specified",
};
export const RESULTS_OF_KIND: Record<IndicatorKind, readonly IndicatorResult[]> = { biological: ["no-growth", "growth"], chemical: ["pass", "fail"] };
export const isPositiveIndicator = (result: IndicatorResult): boolean => result === "growth" || result === "fail";

export const DEVIATION_SOURCES = ["failed-run", "positive-indicator", "criterion-missed", "raised"] as const;
export type DeviationSource = (typeof DEVIATION_SOURCES)[number];
export const DEVIATION_SOURCE_LABELS: Record<DeviationSource, string> = {
  "failed-run": "A run failed",
  "positive-indicator": "A positive indicator",
  "criterion-missed": "A study criterion missed",
  raised: "Raised by a person",
};
export const DEVIATION_STATUSES = ["open", "closed"] as const;
export type DeviationStatus = (typeof DEVIATION_STATUSES)[number];

export const DEFAULT_RUNS_REQUIRED = 3;
export const DEFAULT_REQUALIFICATION_MONTHS = 12;

/**
 * The study's default minimum F0 at every load position when the protocol sets none: the lethality the profile's own
 * minimum hold delivers at Ts, holdingTime × 10^((Ts − Tref)/z) (DOMAIN.md §3; e.g. 134 °C for 180 s → 58.4 min).
 * Papin's choice, stated on the protocol: a load position that received less than the chamber's required hold fails.
 */
export function profileMinimumF0(profile: { sterilizationTempC: number; holdingTimeS: number; f0ReferenceC: number; f0ZK: number }): number {
  return (profile.holdingTimeS / 60) * Math.pow(10, (profile.sterilizationTempC - profile.f0ReferenceC) / profile.f0ZK);
}

/**
 * A cycle's review state. `approved` (a pass accepted as evidence) and `failure-confirmed` (a failed test closed as a
 * signed failure) are the confirmed outcomes and lock the record; `returned` goes back to the technician to correct.
 */
export const CYCLE_STATUSES = ["draft", "submitted", "approved", "failure-confirmed", "returned"] as const;
export type CycleStatus = (typeof CYCLE_STATUSES)[number];

export const CYCLE_STATUS_LABELS: Record<CycleStatus, string> = {
  draft: "Draft",
  submitted: "Awaiting review",
  approved: "Approved",
  "failure-confirmed": "Failure confirmed",
  returned: "Returned",
};

/** What each state means, printed after its name where there is room (the PDF report). */
export const CYCLE_STATUS_EXPLANATIONS: Record<CycleStatus, string | null> = {
  draft: "not yet submitted for review",
  submitted: "waiting for an engineer's review",
  approved: null,
  "failure-confirmed": "closed as a signed failure",
  returned: "to be corrected and submitted again",
};

/**
 * A cycle state's name, the same in the list, the CSV export, the e-mails and the PDF. `rejected`, the word of records
 * returned before outcomes had their GMP meaning (migration 0011), reads as Returned, which is what it meant; a state
 * this version does not know is spelt out from its name.
 */
export function cycleStatusLabel(status: string): string {
  if (status === "rejected") return CYCLE_STATUS_LABELS.returned;
  if (Object.hasOwn(CYCLE_STATUS_LABELS, status)) return CYCLE_STATUS_LABELS[status as CycleStatus];
  const words = status.replace(/[-_]+/g, " ").trim();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** Signed outcomes: the record is locked and its report archived; a correction is a new, linked record. */
export const LOCKED_CYCLE_STATUSES = ["approved", "failure-confirmed"] as const satisfies readonly CycleStatus[];
/** Where the technician may correct the cycle (new file, mapping, details) and submit it. */
export const EDITABLE_CYCLE_STATUSES = ["draft", "returned"] as const satisfies readonly CycleStatus[];

export const isLockedCycleStatus = (status: string): boolean => (LOCKED_CYCLE_STATUSES as readonly string[]).includes(status);
export const isEditableCycleStatus = (status: string): boolean => (EDITABLE_CYCLE_STATUSES as readonly string[]).includes(status);

/** An analysis' verdict, a cycle's verdict and a periodic test's result all take these two words. */
export const VERDICTS = ["pass", "fail"] as const;
export type Verdict = (typeof VERDICTS)[number];

/** What a new signature may mean. */
export const SIGNING_MEANINGS = ["reviewed", "approved", "failure-confirmed", "returned"] as const;
export type SigningMeaning = (typeof SIGNING_MEANINGS)[number];

/** Every meaning a stored signature can carry: `rejected` is the word of records signed before outcomes had their GMP meaning (it meant returned). */
export const SIGNATURE_MEANINGS = [...SIGNING_MEANINGS, "rejected"] as const;
export type SignatureMeaning = (typeof SIGNATURE_MEANINGS)[number];

export const SIGNATURE_MEANING_LABELS: Record<SignatureMeaning, string> = {
  reviewed: "Reviewed",
  approved: "Approved",
  "failure-confirmed": "Failure confirmed",
  returned: "Returned for correction",
  rejected: "Returned for correction (signed as rejected)",
};

/** Test kinds whose evidence is a measurement by an instrument: approval needs the instrument named and calibrated on the test's date. */
export const INSTRUMENT_EVIDENCE_KINDS = ["thermometric-small-load", "thermometric-full-load", "air-leakage"] as const;
export const needsCalibratedInstrument = (testKind: string): boolean => (INSTRUMENT_EVIDENCE_KINDS as readonly string[]).includes(testKind);

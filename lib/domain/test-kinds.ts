/** What a registered cycle was run for. */
export const TEST_KINDS = ["thermometric-small-load", "thermometric-full-load", "bowie-dick", "air-leakage", "steam-quality", "routine-load"] as const;
export type TestKind = (typeof TEST_KINDS)[number];

/** The tests a sterilizer's schedule asks for, and that are recorded as periodic tests. */
export const PERIODIC_TEST_KINDS = [
  "air-leakage",
  "bowie-dick",
  "hollow-load",
  "steam-non-condensable-gas",
  "steam-superheat",
  "steam-dryness",
  "thermometric-small-load",
  "thermometric-full-load",
] as const;
export type PeriodicTestKind = (typeof PERIODIC_TEST_KINDS)[number];

/** Periodic tests entered by hand; the thermometric ones are evidenced by an analysed cycle. */
export const RECORDABLE_KINDS = ["air-leakage", "bowie-dick", "hollow-load", "steam-non-condensable-gas", "steam-superheat", "steam-dryness"] as const;
export type RecordableKind = (typeof RECORDABLE_KINDS)[number];
export const isRecordable = (kind: string): kind is RecordableKind => (RECORDABLE_KINDS as readonly string[]).includes(kind);

const KIND_LABELS: Record<TestKind | PeriodicTestKind, string> = {
  "thermometric-small-load": "Thermometric test, small load",
  "thermometric-full-load": "Thermometric test, full load",
  "bowie-dick": "Bowie-Dick test",
  "hollow-load": "Hollow load test (helix)",
  "air-leakage": "Air leakage test",
  "steam-quality": "Steam quality test",
  "steam-non-condensable-gas": "Steam quality: non-condensable gases",
  "steam-superheat": "Steam quality: superheat",
  "steam-dryness": "Steam quality: dryness",
  "routine-load": "Routine load",
};

/** The words for a cycle's or a periodic test's kind; a kind this version does not know is spelt out from its name. */
export function testKindLabel(kind: string): string {
  if (Object.hasOwn(KIND_LABELS, kind)) return KIND_LABELS[kind as TestKind | PeriodicTestKind];
  const words = kind.replace(/[-_]+/g, " ").trim();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/**
 * A periodic-test record's review state: it counts for the schedule and the sterilizer's status only once signed as
 * approved (a pass) or failure-confirmed (a fail). Records made before reviews existed were migrated as approved.
 */
export const PERIODIC_RECORD_STATUSES = ["submitted", "approved", "failure-confirmed", "returned"] as const;
export type PeriodicRecordStatus = (typeof PERIODIC_RECORD_STATUSES)[number];

export const PERIODIC_RECORD_STATUS_LABELS: Record<PeriodicRecordStatus, string> = {
  submitted: "Awaiting review",
  approved: "Approved",
  "failure-confirmed": "Failure confirmed",
  returned: "Returned",
};

/** What an engineer's signature on a periodic-test record means; the record's status follows it. */
export const PERIODIC_SIGNATURE_MEANINGS = ["approved", "failure-confirmed", "returned"] as const;
export type PeriodicSignatureMeaning = (typeof PERIODIC_SIGNATURE_MEANINGS)[number];

export const PERIODIC_SIGNATURE_MEANING_LABELS: Record<PeriodicSignatureMeaning, string> = {
  approved: "Approved: the test passed and is accepted as evidence",
  "failure-confirmed": "Failure confirmed: the test failed and closes as a signed failure",
  returned: "Returned: a data or entry problem; the test is recorded again",
};

/**
 * The steam-penetration tests judged by a chemical indicator and its photo: the Bowie-Dick test of a porous-load
 * sterilizer (EN 285) and the hollow load test of a type B small sterilizer (EN 13060, a helix process challenge device).
 */
export const INDICATOR_TEST_KINDS = ["bowie-dick", "hollow-load"] as const;
export type IndicatorTestKind = (typeof INDICATOR_TEST_KINDS)[number];
export const isIndicatorTest = (kind: string): kind is IndicatorTestKind => (INDICATOR_TEST_KINDS as readonly string[]).includes(kind);

/** The reading of a steam-penetration (Bowie-Dick) indicator sheet: only a uniform colour change passes (DOMAIN.md §2.7). */
export const INDICATOR_SHEET_RESULTS = ["uniform", "non-uniform"] as const;
export type IndicatorSheetResult = (typeof INDICATOR_SHEET_RESULTS)[number];

export const INDICATOR_SHEET_RESULT_LABELS: Record<IndicatorSheetResult, string> = {
  uniform: "Uniform colour change",
  "non-uniform": "Not uniform (paler or uneven area)",
};

/** Where an attachment (a photo of an indicator sheet) belongs. */
export const ATTACHMENT_OWNER_KINDS = ["cycle", "periodic-test", "loading-pattern"] as const;
export type AttachmentOwnerKind = (typeof ATTACHMENT_OWNER_KINDS)[number];

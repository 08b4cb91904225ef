import type { CycleDetail, SeriesResponse } from "@/lib/cycles/contracts";
import type { BowieDickReportSheet } from "./bowie-dick-section";
import type { LedgerHead } from "@/lib/integrity/anchors";

/** Everything a cycle report prints. Rendering is a pure function of this object. */
export type ReportModel = {
  detail: CycleDetail;
  series: SeriesResponse;
  reportNumber: string;
  /** ISO 8601; also the PDF's creation and modification date, so the same model gives the same bytes */
  generatedAt: string;
  /** how a reader checks the copy, e.g. "Drop this PDF on Signed archive → Check a report in Papin, or POST it to /api/reports/verify" */
  verifyHint: string;
  /** true until the cycle is approved: every page then carries "DRAFT — NOT APPROVED" */
  draft: boolean;
  /** a Bowie-Dick cycle's indicator sheet (null: none recorded yet); undefined for every other kind */
  bowieDick?: BowieDickReportSheet;
  /** the audit ledger's head when an archived report is rendered at sign-off (printed in its verification section) */
  ledgerHead?: LedgerHead | null;
};

/** Points per trace in the report's charts: far more than A4 at print resolution can separate. */
/**
 * The look of the cycle report. Kept drafts (report_drafts) are keyed on it with the analysis engine's version: raise it
 * when a change to lib/reports alters what a draft prints, so drafts rendered by older code are rendered again.
 */
export const REPORT_LAYOUT_VERSION = "cycle-report 1";

export const REPORT_CHART_POINTS = 1200;
/** Samples on the phase diagram's path. */
export const REPORT_PHASE_POINTS = 700;

import "server-only";
import { renderStudyReport, type StudyReportDetail, type StudyReportOptions } from "@/lib/reports/study";

/**
 * A study's report as PDF bytes. Pure of the database: the QA approval renders the copy it archives before its
 * transaction (with the QA signature and status "approved" already in the detail), as cycle sign-off does.
 */
export async function renderStudyReportPdf(detail: StudyReportDetail, options: StudyReportOptions): Promise<Uint8Array> {
  return new Uint8Array(await renderStudyReport(detail, options));
}

/** The archived report's number: one per study (design of issue 14). */
export const studyReportNumber = (studyNumber: string) => `${studyNumber}-R`;

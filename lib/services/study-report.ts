import "server-only";
import { findStudyReportBySha256 } from "@/db/queries/study-reports";
import { recordAuditEvent } from "@/db/queries/audit";
import { renderStudyReport, type StudyReportDetail, type StudyReportOptions } from "@/lib/reports/study";
import type { Actor } from "./access";
import { recordIntegrityFailure, reportIntegrityProblem, type StoredReport } from "./report-integrity";

/**
 * A study's report as PDF bytes. Pure of the database: the QA approval renders the copy it archives before its
 * transaction (with the QA signature and status "approved" already in the detail), as cycle sign-off does.
 */
export async function renderStudyReportPdf(detail: StudyReportDetail, options: StudyReportOptions): Promise<Uint8Array> {
  return new Uint8Array(await renderStudyReport(detail, options));
}

/** The archived report's number: one per study (design of issue 14). */
export const studyReportNumber = (studyNumber: string) => `${studyNumber}-R`;

/**
 * What the ledger event that archives a study report must carry in its new value, beside the status and signature: the
 * report checker finds that event by `report` and compares `reportSha256` with the bytes.
 */
export const studyReportLedgerFields = (report: { id: string; reportNumber: string; sha256: string }) => ({ report: report.id, reportNumber: report.reportNumber, reportSha256: report.sha256 });

const studyReport = (row: { id: string; studyId: string; reportNumber: string }, sha256: string, bytes: Uint8Array): StoredReport => ({
  id: row.id,
  reportNumber: row.reportNumber,
  sha256,
  bytes,
  entityType: "study",
  entityId: row.studyId,
});

/**
 * The report checker's study path (lib/services/reports.ts verifyReportBytes asks it when no cycle report matches): the
 * hash finds the candidate on the actor's site, the bytes and the ledger event that archived it confirm it. Null when no
 * study report has this hash, so the checker goes on to audit extracts.
 */
export async function verifyStudyReportBytes({ actor, bytes, sha256 }: { actor: Actor; bytes: Uint8Array; sha256: string }) {
  const row = await findStudyReportBySha256({ actor, sha256 });
  if (!row) return null;
  const sameBytes = Buffer.compare(Buffer.from(row.stored), Buffer.from(bytes)) === 0;
  const stored = studyReport(row, sha256, bytes);
  // An archive row altered behind the ledger's back (bytes and hash together) matches nothing.
  const problem = sameBytes ? await reportIntegrityProblem(stored) : null;
  const match = sameBytes && !problem;
  await recordAuditEvent({
    actorId: actor.id,
    actorEmail: actor.email,
    siteId: actor.siteId,
    action: "report.verify",
    entityType: "study",
    entityId: row.studyId,
    newValue: { sha256, match, studyId: row.studyId, report: row.reportNumber },
  });
  if (problem) {
    await recordIntegrityFailure(actor, stored, actor.siteId, problem);
    return { match: false as const, sha256, problem };
  }
  if (!match) return { match: false as const, sha256 };
  return { match: true as const, kind: "study-report" as const, sha256, studyId: row.studyId, studyNumber: row.studyNumber, reportNumber: row.reportNumber, archivedAt: row.createdAt };
}

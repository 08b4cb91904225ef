import "server-only";
import { findStudyReportBySha256, getStudyReportOfStudy } from "@/db/queries/study-reports";
import { recordAuditEvent } from "@/db/queries/audit";
import { AppError } from "@/lib/errors";
import { renderStudyReport, type StudyReportDetail, type StudyReportOptions } from "@/lib/reports/study";
import { assertAllowed, type Actor } from "./access";
import { assertReportIntact, recordIntegrityFailure, reportIntegrityProblem, type StoredReport } from "./report-integrity";
import { auditActor, getSiteContext } from "./site";
import { getStudyDetail, studyOfSite } from "./studies-detail";

/**
 * A study's report as PDF bytes. Pure of the database: the QA approval renders the copy it archives before its
 * transaction (with the QA signature and status "approved" already in the detail), as cycle sign-off does.
 */
export async function renderStudyReportPdf(detail: StudyReportDetail, options: StudyReportOptions): Promise<Uint8Array> {
  return new Uint8Array(await renderStudyReport(detail, options));
}

/** The archived report's number: one per study (design of issue 14). */
export const studyReportNumber = (studyNumber: string) => `${studyNumber}-R`;

const studyReport = (row: { id: string; studyId: string; reportNumber: string }, sha256: string, bytes: Uint8Array): StoredReport => ({
  id: row.id,
  reportNumber: row.reportNumber,
  sha256,
  bytes,
  entityType: "study",
  entityId: row.studyId,
});

/**
 * The PDF of a study: the bytes archived at QA approval (never rendered again, and refused when they fail their integrity
 * check), otherwise a draft marked NOT APPROVED on every page; the draft's export is audited.
 */
export async function getStudyReport({ actor, id }: { actor: Actor; id: string }) {
  assertAllowed(actor, "study:read", "open qualification study reports");
  const study = await studyOfSite(actor, id);
  const archived = await getStudyReportOfStudy({ actor, studyId: study.id });
  if (archived) {
    const bytes = new Uint8Array(archived.bytes);
    await assertReportIntact(actor, studyReport(archived, archived.sha256, bytes), study.siteId);
    return { bytes, fileName: `${archived.reportNumber}.pdf`, archived: true, reportNumber: archived.reportNumber };
  }
  // An approved study always has its archived copy; a fresh render would not be the signed one (fail closed).
  if (study.status === "approved") throw new AppError(409, "This approved study has no archived report, so none is served; tell your auditor.");
  const detail = await getStudyDetail({ actor, id: study.id });
  const { site, timeZone } = await getSiteContext({ actor });
  const reportNumber = `DRAFT-${detail.studyNumber}`;
  const bytes = await renderStudyReportPdf(detail, { reportNumber, generatedAt: new Date().toISOString(), draft: true, site: { name: site?.name ?? "", timeZone } });
  await recordAuditEvent({ ...auditActor(actor), action: "study.report-draft", entityType: "study", entityId: study.id, newValue: { report: reportNumber, status: detail.status } });
  return { bytes, fileName: `${reportNumber}.pdf`, archived: false, reportNumber };
}

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
  await recordAuditEvent({ ...auditActor(actor), action: "study.report-verify", entityType: "study", entityId: row.studyId, newValue: { sha256, match, report: row.reportNumber } });
  if (problem) {
    await recordIntegrityFailure(actor, stored, actor.siteId, problem);
    return { match: false as const, sha256, problem };
  }
  if (!match) return { match: false as const, sha256 };
  return { match: true as const, kind: "study-report" as const, sha256, studyId: row.studyId, studyNumber: row.studyNumber, reportNumber: row.reportNumber, archivedAt: row.createdAt };
}

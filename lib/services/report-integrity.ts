import "server-only";
import { listAuditEventsForEntity, recordAuditEvent } from "@/db/queries/audit";
import { auditEventHash } from "@/db/ledger";
import { AppError } from "@/lib/errors";
import { sha256Hex } from "@/lib/integrity";
import type { Actor } from "./access";

/** An archived report's bytes and the record whose ledger events archived them (a cycle, or a qualification study). */
export type StoredReport = { id: string; reportNumber: string; sha256: string; bytes: Uint8Array; entityType: "cycle" | "study"; entityId: string };

/** What the ledger event that archived the report recorded about it, if the value names it. */
function archivedReportOf(newValue: string | null): { report?: unknown; reportNumber?: unknown; reportSha256?: unknown } | null {
  if (!newValue) return null;
  try {
    const value = JSON.parse(newValue);
    return value && typeof value === "object" ? value : null;
  } catch {
    return null;
  }
}

/**
 * Why an archived report's bytes cannot be trusted, or null: they must hash to the stored SHA-256
 * and to the one the (unaltered) ledger event that archived them recorded.
 */
export async function reportIntegrityProblem(report: StoredReport): Promise<string | null> {
  const actual = sha256Hex(report.bytes);
  if (actual !== report.sha256) return `The stored bytes of report ${report.reportNumber} no longer match the SHA-256 archived with them.`;
  const events = await listAuditEventsForEntity({ entityType: report.entityType, entityId: report.entityId });
  // A cycle's archiving event names the report's id; a study's QA approval names its (unique) report number.
  const event = events.find((e) => {
    const archived = archivedReportOf(e.newValue);
    return archived?.report === report.id || (report.entityType === "study" && archived?.reportNumber === report.reportNumber && archived?.reportSha256 !== undefined);
  });
  if (!event) return `The audit ledger holds no event that archived report ${report.reportNumber}, so its bytes cannot be checked against the ledger.`;
  const { seq, hash, ...fields } = event;
  if (auditEventHash(fields) !== hash) return `The ledger event that archived report ${report.reportNumber} (event ${seq}) was changed after it was written.`;
  if (archivedReportOf(event.newValue)?.reportSha256 !== actual) return `Report ${report.reportNumber} does not match the SHA-256 the audit ledger recorded when it was archived (event ${seq}).`;
  return null;
}

export async function recordIntegrityFailure(actor: Actor, report: StoredReport, siteId: string | null, problem: string) {
  await recordAuditEvent({
    actorId: actor.id,
    actorEmail: actor.email,
    siteId,
    action: report.entityType === "study" ? "study.report-integrity-failed" : "report.integrity-failed",
    entityType: report.entityType,
    entityId: report.entityId,
    newValue: { report: report.id, reportNumber: report.reportNumber, storedSha256: report.sha256, bytesSha256: sha256Hex(report.bytes), problem },
  });
}

/** Refuses (409, audited) an archived report whose bytes fail the integrity check; never serves it. */
export async function assertReportIntact(actor: Actor, report: StoredReport, siteId: string | null) {
  const problem = await reportIntegrityProblem(report);
  if (!problem) return;
  await recordIntegrityFailure(actor, report, siteId, problem);
  throw new AppError(409, `${problem} The report is not served; tell your auditor, who can compare it with the ledger and a backup.`);
}

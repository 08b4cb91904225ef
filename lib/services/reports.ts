import "server-only";
import { getCycleRow } from "@/db/queries/cycles";
import { findReportBySha256, getArchivedReportRow, getReportOfCycle } from "@/db/queries/reviews";
import { recordAuditEvent } from "@/db/queries/audit";
import { AppError } from "@/lib/errors";
import { isLockedCycleStatus } from "@/lib/domain";
import { sha256Hex } from "@/lib/integrity";
import { renderCycleReport } from "@/lib/reports";
import type { CycleDetail } from "@/lib/cycles/contracts";
import { assertAllowed, type Actor } from "./access";
import { getCycleDetail } from "./cycles";
import { getCycleSeries } from "./cycle-series";

const REPORT_VERIFY_HINT =
  "To check this report, sign in to Papin and drop the PDF on Signed archive → Check a report, or POST it to /api/reports/verify. A byte-for-byte match names the archived record.";

export function reportNumberFor(detail: CycleDetail, at: string) {
  const stamp = at.slice(0, 19).replace(/[-:T]/g, "");
  return `PR-${detail.sterilizer.serialNumber}-${stamp}-${detail.id.slice(0, 6).toUpperCase()}`;
}

export async function renderReport(actor: Actor, detail: CycleDetail, reportNumber: string, generatedAt: string, draft: boolean) {
  const series = await getCycleSeries({ actor, id: detail.id, points: 1200 });
  if (!series) throw new AppError(409, "This cycle has no chart data to print.");
  return renderCycleReport({ detail, series, reportNumber, generatedAt, verifyHint: REPORT_VERIFY_HINT, draft });
}

/**
 * The PDF of a cycle: the archived bytes once approved (never re-rendered, so later code changes
 * cannot alter them), otherwise a fresh draft marked as not approved.
 */
export async function getCycleReport({ actor, id }: { actor: Actor; id: string }) {
  assertAllowed(actor, "report:read", "open reports");
  const cycle = await getCycleRow({ actor, id });
  if (!cycle) throw new AppError(404, "That cycle was not found.");
  const archived = await getReportOfCycle({ cycleId: id });
  if (archived && isLockedCycleStatus(cycle.status)) {
    return { bytes: new Uint8Array(archived.bytes), fileName: `${archived.reportNumber}.pdf`, archived: true, reportNumber: archived.reportNumber };
  }
  const detail = await getCycleDetail({ actor, id });
  if (!detail) throw new AppError(404, "That cycle was not found.");
  const generatedAt = new Date().toISOString();
  const reportNumber = `DRAFT-${detail.cycleNumber}`;
  const bytes = await renderReport(actor, detail, reportNumber, generatedAt, true);
  await recordAuditEvent({ actorId: actor.id, actorEmail: actor.email, siteId: cycle.siteId, action: "report.export-draft", entityType: "cycle", entityId: id });
  return { bytes: new Uint8Array(bytes), fileName: `${reportNumber}.pdf`, archived: false, reportNumber };
}

/** Byte-for-byte comparison against the site's archive: the hash finds the candidate, the bytes confirm it. */
export async function verifyReportBytes({ actor, bytes }: { actor: Actor; bytes: Uint8Array }) {
  assertAllowed(actor, "report:verify", "check reports");
  const sha256 = sha256Hex(bytes);
  const row = await findReportBySha256({ actor, sha256 });
  const match = !!row && Buffer.compare(Buffer.from(row.stored), Buffer.from(bytes)) === 0;
  const cycleId = match ? row!.cycleId : null;
  await recordAuditEvent({ actorId: actor.id, actorEmail: actor.email, siteId: actor.siteId, action: "report.verify", entityType: "report", entityId: cycleId, newValue: { sha256, match, cycleId } });
  if (!match) return { match: false as const, sha256 };
  return { match: true as const, sha256, cycleId: row!.cycleId, reportNumber: row!.reportNumber, cycleNumber: row!.cycleNumber, archivedAt: row!.createdAt };
}

/** An archived report's bytes for download, audited; 404 off the actor's site. */
export async function downloadArchivedReport({ actor, id }: { actor: Actor; id: string }) {
  assertAllowed(actor, "archive:read", "download archived reports");
  const row = await getArchivedReportRow({ actor, id });
  if (!row) throw new AppError(404, "That archived report was not found.");
  await recordAuditEvent({
    actorId: actor.id,
    actorEmail: actor.email,
    siteId: actor.siteId,
    action: "report.download",
    entityType: "cycle",
    entityId: row.cycleId,
    newValue: { report: row.reportNumber },
  });
  return { bytes: new Uint8Array(row.bytes), fileName: `${row.reportNumber}.pdf` };
}

import "server-only";
import { getCycleRow } from "@/db/queries/cycles";
import { findReportBySha256, getArchivedReportRow, getReportOfCycle } from "@/db/queries/reviews";
import { getLedgerHead, recordAuditEvent } from "@/db/queries/audit";
import { AppError } from "@/lib/errors";
import { isLockedCycleStatus } from "@/lib/domain";
import { canonicalJson, sha256Hex } from "@/lib/integrity";
import { processLru } from "@/lib/lru";
import { renderCycleReport } from "@/lib/reports";
import type { CycleDetail } from "@/lib/cycles/contracts";
import { assertAllowed, type Actor } from "./access";
import { getCycleDetail } from "./cycles";
import { getCycleSeries } from "./cycle-series";
import { getIndicatorSheetForReport } from "./bowie-dick";
import { findAuditExtract } from "./audit-export";
import { assertReportIntact, recordIntegrityFailure, reportIntegrityProblem, type StoredReport } from "./report-integrity";
import { verifyStudyReportBytes } from "./study-report";

const REPORT_VERIFY_HINT =
  "To check this report, sign in to Papin and drop the PDF on Signed archive → Check a report, or POST it to /api/reports/verify. A byte-for-byte match names the archived record.";

export function reportNumberFor(detail: CycleDetail, at: string) {
  const stamp = at.slice(0, 19).replace(/[-:T]/g, "");
  return `PR-${detail.sterilizer.serialNumber}-${stamp}-${detail.id.slice(0, 6).toUpperCase()}`;
}

/** Renders a cycle's report; the copy to archive (not a draft) prints the ledger's head at that moment. */
export async function renderReport(actor: Actor, detail: CycleDetail, reportNumber: string, generatedAt: string, draft: boolean) {
  const series = await getCycleSeries({ actor, id: detail.id, points: 1200 });
  if (!series) throw new AppError(409, "This cycle has no chart data to print.");
  const bowieDick = await getIndicatorSheetForReport({ cycleId: detail.id, testKind: detail.testKind });
  const ledgerHead = draft ? null : await getLedgerHead();
  return renderCycleReport({ detail, series, reportNumber, generatedAt, verifyHint: REPORT_VERIFY_HINT, draft, bowieDick, ledgerHead });
}

// A draft is rendered again only when what it prints changed: the key hashes the record as the
// reader sees it (status, analysis and its input hash, signatures, corrections) and the indicator
// sheet. A repeat shows the time of the render it repeats. Promises are kept, so concurrent
// requests for one draft share a single render.
const draftCache = processLru<Promise<Buffer>>("draft-reports", 8);

async function cachedDraft(actor: Actor, detail: CycleDetail, reportNumber: string): Promise<Buffer> {
  const sheet = await getIndicatorSheetForReport({ cycleId: detail.id, testKind: detail.testKind });
  const printedSheet = sheet?.photo ? { ...sheet, photo: { ...sheet.photo, bytes: null } } : sheet;
  const key = sha256Hex(canonicalJson({ detail, sheet: printedSheet ?? null, reportNumber }));
  const cached = draftCache.get(key);
  if (cached) return cached;
  const rendering = renderReport(actor, detail, reportNumber, new Date().toISOString(), true);
  draftCache.set(key, rendering);
  rendering.catch(() => draftCache.delete(key));
  return rendering;
}

const cycleReport = (row: { id: string; cycleId: string; reportNumber: string; sha256: string }, bytes: Uint8Array): StoredReport => ({
  id: row.id,
  reportNumber: row.reportNumber,
  sha256: row.sha256,
  bytes,
  entityType: "cycle",
  entityId: row.cycleId,
});

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
    const bytes = new Uint8Array(archived.bytes);
    await assertReportIntact(actor, cycleReport(archived, bytes), cycle.siteId);
    return { bytes, fileName: `${archived.reportNumber}.pdf`, archived: true, reportNumber: archived.reportNumber };
  }
  const detail = await getCycleDetail({ actor, id });
  if (!detail) throw new AppError(404, "That cycle was not found.");
  const reportNumber = `DRAFT-${detail.cycleNumber}`;
  const bytes = await cachedDraft(actor, detail, reportNumber);
  await recordAuditEvent({ actorId: actor.id, actorEmail: actor.email, siteId: cycle.siteId, action: "report.export-draft", entityType: "cycle", entityId: id });
  return { bytes: new Uint8Array(bytes), fileName: `${reportNumber}.pdf`, archived: false, reportNumber };
}

/** Byte-for-byte comparison against the site's archive: the hash finds the candidate, the bytes confirm it. */
export async function verifyReportBytes({ actor, bytes }: { actor: Actor; bytes: Uint8Array }) {
  assertAllowed(actor, "report:verify", "check reports");
  const sha256 = sha256Hex(bytes);
  const row = await findReportBySha256({ actor, sha256 });
  const sameBytes = !!row && Buffer.compare(Buffer.from(row.stored), Buffer.from(bytes)) === 0;
  // An archive row altered behind the ledger's back (bytes and hash together) matches nothing.
  const stored = sameBytes ? cycleReport({ ...row!, sha256 }, bytes) : null;
  const problem = stored ? await reportIntegrityProblem(stored) : null;
  const match = sameBytes && !problem;
  const cycleId = match ? row!.cycleId : null;
  // Not an archived cycle report: it may be a study's report, or an audit-trail extract whose SHA-256 the ledger recorded at export.
  const study = row ? null : await verifyStudyReportBytes({ actor, bytes, sha256 });
  if (study) return study;
  const extract = row ? null : await findAuditExtract({ actor, sha256 });
  if (extract) {
    await recordAuditEvent({
      actorId: actor.id,
      actorEmail: actor.email,
      siteId: actor.siteId,
      action: "report.verify",
      entityType: "report",
      entityId: null,
      newValue: { sha256, match: true, auditExtract: extract.seq },
    });
    return { match: true as const, kind: "audit-extract" as const, sha256, ...extract };
  }
  await recordAuditEvent({ actorId: actor.id, actorEmail: actor.email, siteId: actor.siteId, action: "report.verify", entityType: "report", entityId: cycleId, newValue: { sha256, match, cycleId } });
  if (stored && problem) {
    await recordIntegrityFailure(actor, stored, actor.siteId, problem);
    return { match: false as const, sha256, problem };
  }
  if (!match) return { match: false as const, sha256 };
  return { match: true as const, sha256, cycleId: row!.cycleId, reportNumber: row!.reportNumber, cycleNumber: row!.cycleNumber, archivedAt: row!.createdAt };
}

/** An archived report's bytes for download, audited; 404 off the actor's site. */
export async function downloadArchivedReport({ actor, id }: { actor: Actor; id: string }) {
  assertAllowed(actor, "archive:read", "download archived reports");
  const row = await getArchivedReportRow({ actor, id });
  if (!row) throw new AppError(404, "That archived report was not found.");
  const bytes = new Uint8Array(row.bytes);
  await assertReportIntact(actor, cycleReport(row, bytes), actor.siteId);
  await recordAuditEvent({
    actorId: actor.id,
    actorEmail: actor.email,
    siteId: actor.siteId,
    action: "report.download",
    entityType: "cycle",
    entityId: row.cycleId,
    newValue: { report: row.reportNumber },
  });
  return { bytes, fileName: `${row.reportNumber}.pdf` };
}

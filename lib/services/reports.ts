import "server-only";
import { getCycleRow } from "@/db/queries/cycles";
import { findReportBySha256, getArchivedReportRow, getReportOfCycle } from "@/db/queries/reviews";
import { getLedgerHead, recordAuditEvent } from "@/db/queries/audit";
import { AppError } from "@/lib/errors";
import { isLockedCycleStatus } from "@/lib/domain";
import { canonicalJson, sha256Hex } from "@/lib/integrity";
import { processLru } from "@/lib/lru";
import { REPORT_LAYOUT_VERSION, renderCycleReport } from "@/lib/reports";
import { ENGINE_VERSION } from "@/lib/analysis";
import { can } from "@/lib/auth/permissions";
import { getReportDraft, saveReportDraft } from "@/db/queries/report-drafts";
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
// reader sees it (status, analysis and its input hash, signatures, corrections), the indicator
// sheet, and the versions of the report layout and the analysis engine. A repeat shows the time of
// the render it repeats. The latest draft of each cycle is kept in the database (report_drafts), so
// a restarted server serves it without rendering; promises are kept in the process, so concurrent
// requests for one draft share a single render.
const draftCache = processLru<Promise<Buffer>>("draft-reports", 8);

async function draftKey(detail: CycleDetail, reportNumber: string): Promise<string> {
  const sheet = await getIndicatorSheetForReport({ cycleId: detail.id, testKind: detail.testKind });
  const printedSheet = sheet?.photo ? { ...sheet, photo: { ...sheet.photo, bytes: null } } : sheet;
  return sha256Hex(canonicalJson({ detail, sheet: printedSheet ?? null, reportNumber, layout: REPORT_LAYOUT_VERSION, engine: ENGINE_VERSION }));
}

/** The kept draft when it prints this key and its bytes are still the ones rendered; null otherwise (then it is rendered again). */
async function keptDraft(cycleId: string, key: string): Promise<Buffer | null> {
  const kept = await getReportDraft({ cycleId });
  if (!kept || kept.inputSha256 !== key) return null;
  const bytes = Buffer.from(kept.bytes);
  return sha256Hex(bytes) === kept.sha256 ? bytes : null;
}

async function renderAndKeep(actor: Actor, detail: CycleDetail, reportNumber: string, key: string): Promise<Buffer> {
  const renderedAt = new Date().toISOString();
  const bytes = await renderReport(actor, detail, reportNumber, renderedAt, true);
  // A draft that could not be kept is still served; the next request renders it again.
  await saveReportDraft({ cycleId: detail.id, inputSha256: key, sha256: sha256Hex(bytes), bytes, renderedAt }).catch((error: unknown) =>
    console.warn(`[papin] the draft report of cycle ${detail.id} could not be kept: ${error instanceof Error ? error.message : String(error)}`),
  );
  return bytes;
}

async function cachedDraft(actor: Actor, detail: CycleDetail, reportNumber: string): Promise<Buffer> {
  const key = await draftKey(detail, reportNumber);
  const cached = draftCache.get(key);
  if (cached) return cached;
  const drafting = keptDraft(detail.id, key).then((kept) => kept ?? renderAndKeep(actor, detail, reportNumber, key));
  draftCache.set(key, drafting);
  drafting.catch(() => draftCache.delete(key));
  return drafting;
}

const draftNumberOf = (detail: CycleDetail) => `DRAFT-${detail.cycleNumber}`;

/**
 * Renders and keeps the draft report of a cycle that is not locked, so that the first reader gets it without waiting
 * (called after a cycle is analysed). Nothing is read by anyone, so nothing is audited; a cycle that is gone, locked
 * or outside what the actor may read is left alone.
 */
export async function prepareDraftReport({ actor, id }: { actor: Actor; id: string }): Promise<void> {
  if (!can(actor.role, "report:read")) return;
  const cycle = await getCycleRow({ actor, id });
  if (!cycle || isLockedCycleStatus(cycle.status)) return;
  const detail = await getCycleDetail({ actor, id });
  if (!detail) return;
  await cachedDraft(actor, detail, draftNumberOf(detail));
}

// Drafts to prepare, one render at a time and newest first (the cycle just uploaded is the one about to be read),
// starting once uploads have paused for a moment so that a burst of uploads is not slowed by rendering.
const PREPARE_AFTER_QUIET_MS = 300;
type Waiting = { actor: Actor; done: Array<() => void> };
// One queue per server process, shared by every bundle that imports this module (as processLru is).
type DraftQueue = { waiting: Map<string, Waiting>; preparing: boolean; quietTimer?: ReturnType<typeof setTimeout> };
const holder = globalThis as unknown as { __papinDraftQueue?: DraftQueue };
const queue: DraftQueue = (holder.__papinDraftQueue ??= { waiting: new Map<string, Waiting>(), preparing: false });

async function prepareWaitingDrafts() {
  queue.preparing = true;
  try {
    while (queue.waiting.size > 0) {
      const id = [...queue.waiting.keys()].at(-1)!;
      const { actor, done } = queue.waiting.get(id)!;
      queue.waiting.delete(id);
      await prepareDraftReport({ actor, id }).catch((error: unknown) =>
        console.warn(`[papin] the draft report of cycle ${id} could not be prepared: ${error instanceof Error ? error.message : String(error)}`),
      );
      done.forEach((resolve) => resolve());
    }
  } finally {
    queue.preparing = false;
  }
}

/**
 * Queues the cycle's draft report to be prepared in this process (prepareDraftReport); the promise settles, never
 * rejecting, once it is kept or could not be made. The server waits for it on a graceful stop.
 */
export function prepareDraftReportSoon({ actor, id }: { actor: Actor; id: string }): Promise<void> {
  return new Promise((resolve) => {
    const entry = queue.waiting.get(id);
    queue.waiting.delete(id);
    queue.waiting.set(id, { actor, done: [...(entry?.done ?? []), resolve] });
    clearTimeout(queue.quietTimer);
    queue.quietTimer = setTimeout(() => {
      if (!queue.preparing) void prepareWaitingDrafts();
    }, PREPARE_AFTER_QUIET_MS);
  });
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
  const reportNumber = draftNumberOf(detail);
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

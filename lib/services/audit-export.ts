import "server-only";
import { findAuditExtractEvent, getLedgerHead, listAuditTrailBatch, recordAuditEvent, type AuditEventFilter } from "@/db/queries/audit";
import { auditEventHash } from "@/db/ledger";
import type { AuditEvent } from "@/db/schema";
import { csvRow } from "@/lib/csv-export";
import { AppError } from "@/lib/errors";
import { ROLE_LABELS } from "@/lib/domain";
import { auditSiteText, auditUtcText, type AuditLine } from "@/lib/domain/audit-words";
import { sha256Hex } from "@/lib/integrity";
import { renderAuditExtract } from "@/lib/reports/audit-extract";
import type { Actor } from "./access";
import { countTrail, describeEvents, resolveTrailFilter, type AuditTrailQuery, type ResolvedTrailFilter } from "./audit-trail";
import { auditActor, getSiteContext } from "./site";

/** The CSV streams, so it may be long; the PDF is laid out page by page in memory, so it is kept shorter. */
export const AUDIT_CSV_LIMIT = 50_000;
export const AUDIT_PDF_LIMIT = 2_000;
const BATCH = 1_000;

export const AUDIT_CSV_HEADER = ["sequence", "UTC time", "site time", "person", "role", "action", "record", "reason", "old", "new", "event hash"] as const;

const AUDIT_EXTRACT_HINT =
  "This file's SHA-256 was written to the audit ledger when it was exported (action “Exported the audit trail”). To check it, sign in to Papin and drop the PDF on Signed archive → Check a report, or POST it to /api/reports/verify: only a byte-for-byte copy matches.";

async function limitedTrail(actor: Actor, query: AuditTrailQuery, limit: number, format: string) {
  const resolved = await resolveTrailFilter(actor, query);
  // Exactly the events up to the head read now, even while the ledger grows during the export.
  const head = await getLedgerHead();
  const filter: AuditEventFilter = { ...resolved.filter, maxSeq: head.lastSeq };
  const events = await countTrail({ ...resolved, filter });
  if (events > limit) {
    throw new AppError(
      422,
      `The filter matches ${events.toLocaleString("en-GB")} events; a ${format} export holds at most ${limit.toLocaleString("en-GB")}. Narrow the filter (dates, person, action or record) and export again.`,
    );
  }
  return { resolved: { ...resolved, filter } as ResolvedTrailFilter, head, events };
}

/** Every matching event, newest first, batch by batch (each batch described with one names query). */
async function* trailBatches(resolved: ResolvedTrailFilter): AsyncGenerator<Array<{ event: AuditEvent; line: AuditLine }>> {
  let beforeSeq: number | null = null;
  for (;;) {
    const events = await listAuditTrailBatch({ siteId: resolved.siteId, filter: resolved.filter, beforeSeq, limit: BATCH });
    if (events.length === 0) return;
    const lines = await describeEvents({ siteId: resolved.siteId, timeZone: resolved.timeZone, events });
    yield events.map((event, i) => ({ event, line: lines[i] }));
    if (events.length < BATCH) return;
    beforeSeq = events[events.length - 1].seq;
  }
}

const changeList = (line: AuditLine, side: "old" | "new") =>
  line.changes
    .filter((c) => c[side] !== null)
    .map((c) => `${c.field}: ${c[side]}`)
    .join("; ");

export function auditCsvCells(event: Pick<AuditEvent, "seq" | "hash">, line: AuditLine) {
  return [event.seq, line.when.utc, line.when.site, line.who, line.role ?? "", line.what, line.record?.label ?? "", line.reason ?? "", changeList(line, "old"), changeList(line, "new"), event.hash];
}

const stampOf = (iso: string) => iso.slice(0, 19).replace(/[-:]/g, "").replace("T", "-");
const filterText = (words: string[]) => (words.length ? words.join(", ") : "none");

/**
 * The filtered trail as CSV, streamed batch by batch. The export is written to the ledger first
 * (who, the filter, how many events), so a refused or broken download still leaves its trace.
 */
export async function exportAuditCsv({ actor, query, limit = AUDIT_CSV_LIMIT }: { actor: Actor; query: AuditTrailQuery; limit?: number }) {
  const { resolved, head, events } = await limitedTrail(actor, query, limit, "CSV");
  const exportedAt = new Date().toISOString();
  const fileName = `papin-audit-trail-${stampOf(exportedAt)}.csv`;
  await recordAuditEvent({
    ...auditActor(actor),
    action: "audit.export",
    entityType: "site",
    entityId: resolved.siteId,
    newValue: { format: "csv", events, filter: filterText(resolved.words), fileName, lastSeq: head.lastSeq },
  });
  const encoder = new TextEncoder();
  const batches = trailBatches(resolved);
  const stream = new ReadableStream<Uint8Array>({
    start(controller) {
      controller.enqueue(encoder.encode(`\uFEFF${csvRow([...AUDIT_CSV_HEADER])}\r\n`));
    },
    async pull(controller) {
      const next = await batches.next();
      if (next.done) return controller.close();
      controller.enqueue(encoder.encode(next.value.map(({ event, line }) => `${csvRow(auditCsvCells(event, line))}\r\n`).join("")));
    },
    async cancel() {
      await batches.return(undefined);
    },
  });
  return { stream, fileName, events };
}

/**
 * The filtered trail as a PDF extract that prints who exported it, when, the filter, the count,
 * the ledger's head and each event's hash. Its SHA-256 goes into the ledger, so the report checker
 * can later tell the file is the one Papin produced.
 */
export async function exportAuditPdf({ actor, query, limit = AUDIT_PDF_LIMIT }: { actor: Actor; query: AuditTrailQuery; limit?: number }) {
  const { resolved, head, events } = await limitedTrail(actor, query, limit, "PDF");
  const rows = [];
  for await (const batch of trailBatches(resolved)) rows.push(...batch.map(({ event, line }) => ({ ...line, hash: event.hash })));
  const { site } = await getSiteContext({ actor });
  const iso = new Date().toISOString();
  const bytes = await renderAuditExtract({
    siteName: site?.name ?? "your site",
    timeZone: resolved.timeZone,
    exportedBy: { name: actor.name, role: ROLE_LABELS[actor.role], email: actor.email },
    exportedAt: { iso, site: auditSiteText(iso, resolved.timeZone), utc: auditUtcText(iso) },
    filterWords: resolved.words,
    head,
    rows,
    verifyHint: AUDIT_EXTRACT_HINT,
  });
  const sha256 = sha256Hex(bytes);
  const fileName = `papin-audit-extract-${stampOf(iso)}.pdf`;
  await recordAuditEvent({
    ...auditActor(actor),
    action: "audit.export",
    entityType: "site",
    entityId: resolved.siteId,
    newValue: { format: "pdf", events, filter: filterText(resolved.words), fileName, sha256, ledgerHead: head },
  });
  return { bytes: new Uint8Array(bytes), fileName, sha256, events };
}

/**
 * An audit-trail extract of the actor's site with these bytes' SHA-256, as the ledger recorded it
 * at export; null when there is none or its ledger event was changed after it was written.
 */
export async function findAuditExtract({ actor, sha256 }: { actor: Actor; sha256: string }) {
  if (!actor.siteId) return null;
  const event = await findAuditExtractEvent({ siteId: actor.siteId, sha256 });
  if (!event) return null;
  const { seq, hash, ...fields } = event;
  if (auditEventHash(fields) !== hash) return null;
  const value = JSON.parse(event.newValue ?? "{}") as { events?: number; fileName?: string };
  return { seq, exportedAt: event.at, exportedBy: event.actorEmail, events: value.events ?? null, fileName: value.fileName ?? null };
}

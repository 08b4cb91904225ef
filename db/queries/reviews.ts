import "server-only";
import { and, count, desc, eq, gte, inArray, isNotNull, lte, ne, or, sql } from "drizzle-orm";
import { getDb, type Executor } from "@/db";
import { containsText } from "./search";
import { analyses, auditEvents, cycles, loggerFiles, reports, signatures, sterilizers, users, type CycleStatus, type NewSignature } from "@/db/schema";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";
import { deleteReportDraft } from "./report-drafts";
import type { Actor } from "./users";

type Hook = (tx: Executor) => Promise<void>;

/** The ledger actions that change a cycle's inputs (registering it, a new analysis, an edit of its details). */
export const CYCLE_INPUT_ACTIONS = ["cycle.create", "cycle.reanalyse", "cycle.edit"];

/** How someone put something into a cycle: each of these bars them from approving it or confirming its failure. */
export type ContributionKind = "registered" | "uploaded" | "analysed" | "edited";

/**
 * Everyone who gave the cycle an input, and how: who registered it, uploaded any of its files, made any of its
 * analyses (a new file, a re-mapping, changed details or profile) or changed it according to the audit ledger.
 */
export async function listContributions({ cycleId, tx }: { cycleId: string; tx?: Executor }): Promise<Array<{ userId: string; kind: ContributionKind }>> {
  const db = tx ?? getDb();
  const as = (kind: ContributionKind) => sql<ContributionKind>`${kind}`.as("kind");
  const rows = await db
    .select({ userId: sql<string>`${cycles.createdBy}`.as("user_id"), kind: as("registered") })
    .from(cycles)
    .where(eq(cycles.id, cycleId))
    .union(
      db
        .select({ userId: sql<string>`${loggerFiles.uploadedBy}`.as("user_id"), kind: as("uploaded") })
        .from(loggerFiles)
        .where(eq(loggerFiles.cycleId, cycleId)),
    )
    .union(
      db
        .select({ userId: sql<string>`${analyses.createdBy}`.as("user_id"), kind: as("analysed") })
        .from(analyses)
        .where(and(eq(analyses.cycleId, cycleId), isNotNull(analyses.createdBy))),
    )
    .union(
      db
        .select({ userId: sql<string>`${auditEvents.actorId}`.as("user_id"), kind: as("edited") })
        .from(auditEvents)
        .where(and(eq(auditEvents.entityType, "cycle"), eq(auditEvents.entityId, cycleId), inArray(auditEvents.action, CYCLE_INPUT_ACTIONS), isNotNull(auditEvents.actorId))),
    );
  return rows;
}

/**
 * Moves the cycle to "submitted" only if it is still in the status the caller saw, with its audit
 * event and whatever `inside` adds (mail), in one transaction. False when the status had moved.
 */
export async function markCycleSubmitted({
  cycleId,
  fromStatus,
  submittedBy,
  at,
  audit,
  inside,
}: {
  cycleId: string;
  fromStatus: CycleStatus;
  submittedBy: string;
  at: string;
  audit: AuditInput;
  inside?: Hook;
}): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    const updated = await tx
      .update(cycles)
      .set({ status: "submitted", submittedBy, submittedAt: at, updatedAt: at })
      .where(and(eq(cycles.id, cycleId), eq(cycles.status, fromStatus)))
      .returning({ id: cycles.id });
    if (updated.length === 0) return false;
    await appendAuditEvent(tx, audit);
    await inside?.(tx);
    return true;
  });
}

export type SignatureWrite = {
  signature: NewSignature & { id: string };
  nextStatus: CycleStatus;
  at: string;
  report?: { reportNumber: string; sha256: string; bytes: Buffer };
  audit: (reportId: string | null) => AuditInput;
  /** runs first inside the transaction: throw to refuse (e.g. the record changed) */
  before?: Hook;
  /** runs last inside the transaction (e.g. queueing mail) */
  inside?: Hook;
};

/**
 * Applies a signature to a submitted cycle in one transaction: the status, the signature, the
 * signer's cleared failure count, the archived report and the audit event. False when the cycle
 * was no longer submitted (someone else signed first).
 */
export async function applySignature(input: SignatureWrite): Promise<{ reportId: string | null } | false> {
  const { signature } = input;
  return getDb().transaction(async (tx) => {
    await input.before?.(tx);
    const updated = await tx
      .update(cycles)
      .set({ status: input.nextStatus, updatedAt: input.at })
      .where(and(eq(cycles.id, signature.cycleId), eq(cycles.status, "submitted")))
      .returning({ id: cycles.id });
    if (updated.length === 0) return false;
    await tx.insert(signatures).values(signature);
    await tx.update(users).set({ failedSigningAttempts: 0, signingLockedUntil: null }).where(eq(users.id, signature.userId));
    let reportId: string | null = null;
    if (input.report) {
      const [report] = await tx
        .insert(reports)
        .values({
          cycleId: signature.cycleId,
          signatureId: signature.id,
          reportNumber: input.report.reportNumber,
          sha256: input.report.sha256,
          sizeBytes: input.report.bytes.byteLength,
          bytes: input.report.bytes,
        })
        .returning({ id: reports.id });
      reportId = report.id;
      // The archived report replaces any draft kept for the cycle.
      await deleteReportDraft(tx, { cycleId: signature.cycleId });
    }
    await appendAuditEvent(tx, input.audit(reportId));
    await input.inside?.(tx);
    return { reportId };
  });
}

/** The archived report of a cycle, if one was stored. */
export async function getReportOfCycle({ cycleId }: { cycleId: string }) {
  const [row] = await getDb().select().from(reports).where(eq(reports.cycleId, cycleId)).limit(1);
  return row;
}

/** The archived report of the actor's site with these SHA-256 hex digits, with its stored bytes. */
export async function findReportBySha256({ actor, sha256 }: { actor: Actor; sha256: string }) {
  const [row] = await getDb()
    .select({ id: reports.id, cycleId: reports.cycleId, reportNumber: reports.reportNumber, stored: reports.bytes, createdAt: reports.createdAt, cycleNumber: cycles.cycleNumber })
    .from(reports)
    .innerJoin(cycles, eq(reports.cycleId, cycles.id))
    .where(and(eq(reports.sha256, sha256), eq(cycles.siteId, actor.siteId ?? "")))
    .limit(1);
  return row;
}

export type ArchiveFilter = { q?: string; from?: string; to?: string };

/** The site's archived reports matching the filter (LIKE over report, cycle, sterilizer and signer, walked newest first). */
function archiveWhere(actor: Actor, { q, from, to }: ArchiveFilter) {
  const needle = q?.trim() || undefined;
  return and(
    // Unary + keeps SQLite from starting at the site's cycles: it walks reports newest first (reports_created_idx) instead of sorting them all.
    sql`+${cycles.siteId} = ${actor.siteId ?? ""}`,
    ne(cycles.status, "draft"),
    needle ? or(containsText(reports.reportNumber, needle), containsText(cycles.cycleNumber, needle), containsText(sterilizers.name, needle), containsText(signatures.printedName, needle)) : undefined,
    from ? gte(reports.createdAt, from) : undefined,
    to ? lte(reports.createdAt, `${to}T23:59:59.999Z`) : undefined,
  );
}

/** One page of the archive, newest report first (every matching report when no page is asked for). */
export async function listArchivedReports({ actor, page, pageSize, ...filter }: { actor: Actor; page?: number; pageSize?: number } & ArchiveFilter) {
  const query = getDb()
    .select({
      id: reports.id,
      reportNumber: reports.reportNumber,
      sha256: reports.sha256,
      sizeBytes: reports.sizeBytes,
      createdAt: reports.createdAt,
      cycleId: cycles.id,
      cycleNumber: cycles.cycleNumber,
      verdict: cycles.verdict,
      startedAt: cycles.startedAt,
      sterilizerName: sterilizers.name,
      signerName: signatures.printedName,
    })
    .from(reports)
    .innerJoin(cycles, eq(reports.cycleId, cycles.id))
    .innerJoin(sterilizers, eq(cycles.sterilizerId, sterilizers.id))
    .leftJoin(signatures, eq(reports.signatureId, signatures.id))
    .where(archiveWhere(actor, filter))
    .orderBy(desc(reports.createdAt));
  return pageSize ? query.limit(pageSize).offset(((page ?? 1) - 1) * pageSize) : query;
}

/** How many archived reports match (the service caches it per filter). */
export async function countArchivedReports({ actor, ...filter }: { actor: Actor } & ArchiveFilter): Promise<number> {
  const [{ total }] = await getDb()
    .select({ total: count() })
    .from(reports)
    .innerJoin(cycles, eq(reports.cycleId, cycles.id))
    .innerJoin(sterilizers, eq(cycles.sterilizerId, sterilizers.id))
    .leftJoin(signatures, eq(reports.signatureId, signatures.id))
    .where(archiveWhere(actor, filter));
  return total;
}

/** One archived report of the actor's site, by its id. */
export async function getArchivedReportRow({ actor, id }: { actor: Actor; id: string }) {
  const [row] = await getDb()
    .select({ id: reports.id, bytes: reports.bytes, sha256: reports.sha256, reportNumber: reports.reportNumber, cycleId: cycles.id })
    .from(reports)
    .innerJoin(cycles, eq(reports.cycleId, cycles.id))
    .where(and(eq(reports.id, id), eq(cycles.siteId, actor.siteId ?? "")))
    .limit(1);
  return row;
}

import "server-only";
import { and, asc, count, desc, eq, gte, inArray, lte, ne, or, sql, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { getDb, type Executor } from "@/db";
import { containsText, cycleIdsContaining, cycleRowMatchesText, isIndexedSearch, searchMatchesUpTo } from "./search";
import {
  acceptanceProfiles,
  analyses,
  cycles,
  instruments,
  loggerFiles,
  reports,
  signatures,
  sites,
  sterilizers,
  users,
  type CycleStatus,
  type NewAnalysis,
  type NewCycle,
  type NewLoggerFile,
} from "@/db/schema";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";
import { EDITABLE_CYCLE_STATUSES } from "@/lib/domain";
import type { Actor } from "./users";

const siteOf = (actor: Actor) => actor.siteId ?? "";

export type CycleFilter = {
  status?: CycleStatus;
  verdict?: "pass" | "fail";
  sterilizer?: string;
  from?: string;
  to?: string;
  q?: string;
};

const creator = alias(users, "creator");

const SORTS = {
  startedAt: cycles.startedAt,
  createdAt: cycles.createdAt,
  cycleNumber: cycles.cycleNumber,
  status: cycles.status,
  verdict: cycles.verdict,
  sterilizer: sterilizers.name,
  submittedAt: cycles.submittedAt,
} as const;

export type CycleSortKey = keyof typeof SORTS;

/**
 * `bySterilizer`: the site is taken from the sterilizer (the unary + keeps SQLite off the cycles site indexes), so the
 * page walks the site's sterilizers in name order and each one's cycles by start, instead of sorting every row.
 */
function cycleListWhere(actor: Actor, filter: CycleFilter, { bySterilizer = false, broadSearch = false } = {}): SQL | undefined {
  const site = bySterilizer ? and(eq(sterilizers.siteId, siteOf(actor)), sql`+${cycles.siteId} = ${siteOf(actor)}`) : eq(cycles.siteId, siteOf(actor));
  const conditions: Array<SQL | undefined> = [site];
  if (filter.status) conditions.push(eq(cycles.status, filter.status));
  if (filter.verdict) conditions.push(eq(cycles.verdict, filter.verdict));
  if (filter.sterilizer) conditions.push(eq(cycles.sterilizerId, filter.sterilizer));
  if (filter.from) conditions.push(gte(cycles.startedAt, filter.from));
  if (filter.to) conditions.push(lte(cycles.startedAt, filter.to.length === 10 ? `${filter.to}T23:59:59.999Z` : filter.to));
  if (filter.q) conditions.push(cycleTextCondition(filter.q, broadSearch));
  return and(...conditions);
}

/**
 * Number, load description or sterilizer name contains the text as typed: from the trigram index for three characters
 * or more; a shorter text is compared row by row (LIKE), in the page's index order, which stops when the page is full.
 * A `broad` text (one matching most cycles) is tested row by row in the page's index order too (LIKE on the row's own
 * columns, the index only where LIKE cannot decide), instead of fetching and sorting every match; all select the same rows.
 */
function cycleTextCondition(text: string, broad: boolean): SQL | undefined {
  if (!isIndexedSearch(text)) return or(containsText(cycles.cycleNumber, text), containsText(cycles.loadDescription, text), containsText(sterilizers.name, text));
  return broad ? cycleRowMatchesText(cycles.id, [cycles.cycleNumber, cycles.loadDescription, sterilizers.name], text) : sql`${cycles.id} IN ${cycleIdsContaining(text)}`;
}

/** From this many trigram matches on (every site's), a search is read in the page's index order (cycleTextCondition). */
export const BROAD_SEARCH_MATCHES = 5000;

/** How many cycles (of every site) the trigram index finds for `text`, counted no further than `cap`. */
export async function countSearchMatchesUpTo(text: string, cap: number): Promise<number> {
  const row = await getDb().get<{ matches: number }>(sql`select ${searchMatchesUpTo(text, cap)} as matches`);
  return Number(row?.matches ?? 0);
}

/** Whether the filter's text is broad: counted in the trigram index up to `broadAt` matches, so never all of them. */
async function isBroadSearch(filter: CycleFilter, broadAt: number): Promise<boolean> {
  if (!filter.q || !isIndexedSearch(filter.q)) return false;
  return (await countSearchMatchesUpTo(filter.q, broadAt)) >= broadAt;
}

/**
 * The sort column, then (for status and verdict) the start time, then the id, all in one direction: the order of
 * one of the cycles indexes (migration 0016), so a page is read from the index instead of sorting every row.
 */
function cycleListOrder(sort: { key: CycleSortKey; direction: "asc" | "desc" }): SQL[] {
  const by = sort.direction === "asc" ? asc : desc;
  return sortColumns(sort.key).map((c) => by(c));
}

function sortColumns(key: CycleSortKey) {
  if (key === "status" || key === "verdict") return [SORTS[key], cycles.startedAt, cycles.id];
  // The site's sterilizers in name order (sterilizers_site_name_idx), each one's cycles by start (cycles_sterilizer_started_idx).
  if (key === "sterilizer") return [sterilizers.name, sterilizers.id, cycles.startedAt, cycles.id];
  return [SORTS[key], cycles.id];
}

/** One page of the actor's site's cycles (the total is countCycles, cached by the service). */
export async function listCycles({
  actor,
  filter,
  page,
  pageSize,
  sort,
  broad,
  broadSearchAt = BROAD_SEARCH_MATCHES,
}: {
  actor: Actor;
  filter: CycleFilter;
  page: number;
  pageSize: number;
  sort: { key: CycleSortKey; direction: "asc" | "desc" };
  /** whether the text is broad, when the caller already knows (else looked up here) */
  broad?: boolean;
  /** tests only: from how many matches a search counts as broad */
  broadSearchAt?: number;
}) {
  const broadSearch = broad ?? (await isBroadSearch(filter, broadSearchAt));
  return getDb()
    .select({
      id: cycles.id,
      cycleNumber: cycles.cycleNumber,
      status: cycles.status,
      verdict: cycles.verdict,
      testKind: cycles.testKind,
      startedAt: cycles.startedAt,
      createdAt: cycles.createdAt,
      loadDescription: cycles.loadDescription,
      sterilizerId: sterilizers.id,
      sterilizerName: sterilizers.name,
      profileId: acceptanceProfiles.id,
      profileName: acceptanceProfiles.name,
      createdByName: creator.name,
    })
    .from(cycles)
    .innerJoin(sterilizers, eq(cycles.sterilizerId, sterilizers.id))
    .innerJoin(acceptanceProfiles, eq(cycles.profileId, acceptanceProfiles.id))
    .innerJoin(creator, eq(cycles.createdBy, creator.id))
    .where(cycleListWhere(actor, filter, { bySterilizer: sort.key === "sterilizer", broadSearch }))
    .orderBy(...cycleListOrder(sort))
    .limit(pageSize)
    .offset((page - 1) * pageSize);
}

/** How many of the actor's site's cycles match the filter. */
export async function countCycles({ actor, filter, broad, broadSearchAt = BROAD_SEARCH_MATCHES }: { actor: Actor; filter: CycleFilter; broad?: boolean; broadSearchAt?: number }): Promise<number> {
  const broadSearch = broad ?? (await isBroadSearch(filter, broadSearchAt));
  const [{ total }] = await getDb()
    .select({ total: count() })
    .from(cycles)
    .innerJoin(sterilizers, eq(cycles.sterilizerId, sterilizers.id))
    .where(cycleListWhere(actor, filter, { broadSearch }));
  return total;
}

/** The cycle row, only if it belongs to the actor's site. */
export async function getCycleRow({ actor, id, tx }: { actor: Actor; id: string; tx?: Executor }) {
  const [row] = await (tx ?? getDb())
    .select()
    .from(cycles)
    .where(and(eq(cycles.id, id), eq(cycles.siteId, siteOf(actor))))
    .limit(1);
  return row;
}

/** Everything the cycle record shows, read from the stored rows; undefined off the actor's site. */
export async function getCycleRecordRows({ actor, id }: { actor: Actor; id: string }) {
  const db = getDb();
  const [row] = await db
    .select({ cycle: cycles, site: sites, sterilizer: sterilizers, profile: acceptanceProfiles, instrument: instruments, creatorName: creator.name })
    .from(cycles)
    .innerJoin(sites, eq(cycles.siteId, sites.id))
    .innerJoin(sterilizers, eq(cycles.sterilizerId, sterilizers.id))
    .innerJoin(acceptanceProfiles, eq(cycles.profileId, acceptanceProfiles.id))
    .innerJoin(creator, eq(cycles.createdBy, creator.id))
    .leftJoin(instruments, eq(cycles.instrumentId, instruments.id))
    .where(and(eq(cycles.id, id), eq(cycles.siteId, siteOf(actor))))
    .limit(1);
  if (!row) return undefined;
  const uploader = alias(users, "uploader");
  const analyst = alias(users, "analyst");
  const [files, analysisRows, signatureRows, [report], duplicates] = await Promise.all([
    db
      .select({
        id: loggerFiles.id,
        name: loggerFiles.name,
        size: loggerFiles.sizeBytes,
        sha256: loggerFiles.sha256,
        uploadedAt: loggerFiles.uploadedAt,
        uploadedBy: uploader.name,
        dialect: loggerFiles.dialect,
        mapping: loggerFiles.mapping,
      })
      .from(loggerFiles)
      .innerJoin(uploader, eq(loggerFiles.uploadedBy, uploader.id))
      .where(eq(loggerFiles.cycleId, id))
      .orderBy(asc(loggerFiles.uploadedAt)),
    db
      .select({ analysis: analyses, fileName: loggerFiles.name, fileSha256: loggerFiles.sha256, analystName: analyst.name })
      .from(analyses)
      .innerJoin(loggerFiles, eq(analyses.loggerFileId, loggerFiles.id))
      .leftJoin(analyst, eq(analyses.createdBy, analyst.id))
      .where(eq(analyses.cycleId, id))
      .orderBy(desc(analyses.createdAt), desc(sql`analyses.rowid`)),
    db.select().from(signatures).where(eq(signatures.cycleId, id)).orderBy(asc(signatures.signedAt)),
    db.select({ id: reports.id, reportNumber: reports.reportNumber, sha256: reports.sha256 }).from(reports).where(eq(reports.cycleId, id)).orderBy(desc(reports.createdAt)).limit(1),
    listFilesSharedWithOtherCycles({ siteId: row.cycle.siteId, cycleId: id }),
  ]);
  return { ...row, files, analysisRows, signatureRows, report, duplicates };
}

const otherFile = alias(loggerFiles, "other_file");
const otherCycle = alias(cycles, "other_cycle");

/** The cycle's files whose bytes (SHA-256) another cycle of the site also holds, with that cycle and the reasons given. */
export async function listFilesSharedWithOtherCycles({ siteId, cycleId }: { siteId: string; cycleId: string }) {
  return getDb()
    .selectDistinct({
      fileName: loggerFiles.name,
      sha256: loggerFiles.sha256,
      reason: loggerFiles.duplicateReason,
      otherReason: otherFile.duplicateReason,
      cycleId: otherCycle.id,
      cycleNumber: otherCycle.cycleNumber,
    })
    .from(loggerFiles)
    .innerJoin(otherFile, and(eq(otherFile.sha256, loggerFiles.sha256), ne(otherFile.cycleId, loggerFiles.cycleId)))
    .innerJoin(otherCycle, and(eq(otherCycle.id, otherFile.cycleId), eq(otherCycle.siteId, siteId)))
    .where(eq(loggerFiles.cycleId, cycleId))
    .orderBy(asc(otherCycle.cycleNumber));
}

/** Cycles of the site (other than `exceptCycleId`) that already hold a file with one of these SHA-256 digests. */
export async function findCyclesHoldingFiles({ siteId, sha256s, exceptCycleId }: { siteId: string; sha256s: string[]; exceptCycleId?: string }) {
  if (sha256s.length === 0) return [];
  return getDb()
    .selectDistinct({ sha256: loggerFiles.sha256, cycleId: cycles.id, cycleNumber: cycles.cycleNumber })
    .from(loggerFiles)
    .innerJoin(cycles, eq(loggerFiles.cycleId, cycles.id))
    .where(and(eq(cycles.siteId, siteId), inArray(loggerFiles.sha256, sha256s), exceptCycleId ? ne(cycles.id, exceptCycleId) : undefined))
    .orderBy(asc(cycles.cycleNumber));
}

/** The stored logger file an analysis was made from, with that analysis's result. */
export async function getAnalysedFile({ analysisId }: { analysisId: string }) {
  const [row] = await getDb()
    .select({ fileId: loggerFiles.id, bytes: loggerFiles.bytes, fileMapping: loggerFiles.mapping, analysisMapping: analyses.mapping, result: analyses.result })
    .from(analyses)
    .innerJoin(loggerFiles, eq(analyses.loggerFileId, loggerFiles.id))
    .where(eq(analyses.id, analysisId))
    .limit(1);
  return row;
}

type Hook = (tx: Executor, cycleId: string) => Promise<void>;
type NewFile = Omit<NewLoggerFile, "cycleId"> & { primary: boolean };
type NewAnalysisRow = Omit<NewAnalysis, "cycleId" | "loggerFileId">;

export type CycleRecordInsert = {
  cycle: NewCycle;
  files: NewFile[];
  analysis: NewAnalysisRow;
  /** the instrument's mapping to save, with its audit event (old and new mapping) */
  savedMapping?: { instrumentId: string; mapping: unknown; audit: AuditInput };
  audit: (cycleId: string) => AuditInput;
  /** runs last inside the transaction (e.g. queueing mail), so it commits or rolls back with the rest */
  inside?: Hook;
};

/** A new cycle with its files, its first analysis and its audit events, in one transaction. */
export async function insertCycleRecord(input: CycleRecordInsert): Promise<string> {
  return getDb().transaction(async (tx) => {
    const [cycle] = await tx.insert(cycles).values(input.cycle).returning({ id: cycles.id });
    let primaryFileId = "";
    for (const { primary, ...file } of input.files) {
      const [saved] = await tx
        .insert(loggerFiles)
        .values({ ...file, cycleId: cycle.id })
        .returning({ id: loggerFiles.id });
      if (primary) primaryFileId = saved.id;
    }
    const [saved] = await tx
      .insert(analyses)
      .values({ ...input.analysis, cycleId: cycle.id, loggerFileId: primaryFileId })
      .returning({ id: analyses.id });
    await tx.update(cycles).set({ currentAnalysisId: saved.id }).where(eq(cycles.id, cycle.id));
    if (input.savedMapping) {
      await tx.update(instruments).set({ savedMapping: input.savedMapping.mapping }).where(eq(instruments.id, input.savedMapping.instrumentId));
      await appendAuditEvent(tx, input.savedMapping.audit);
    }
    await appendAuditEvent(tx, input.audit(cycle.id));
    await input.inside?.(tx, cycle.id);
    return cycle.id;
  });
}

export type CorrectionInsert = {
  cycleId: string;
  /** a new file, or the id of the stored file analysed again */
  file: Omit<NewLoggerFile, "cycleId"> | { existingId: string };
  analysis: NewAnalysisRow;
  /** the cycle's details changed with this analysis (profile, instrument, load) */
  details?: Partial<Pick<NewCycle, "profileId" | "instrumentId" | "loadDescription">>;
  audit: (analysisId: string) => AuditInput;
  inside?: Hook;
};

/**
 * A further analysis of a draft or returned cycle (with its new file and changed details, if any); earlier analyses
 * and files stay on the record. Null, with nothing written, when the cycle was no longer open to correction.
 */
export async function insertCorrection(input: CorrectionInsert): Promise<string | null> {
  return getDb().transaction(async (tx) => {
    const open = await tx
      .update(cycles)
      .set({ ...input.details, verdict: input.analysis.verdict, updatedAt: new Date().toISOString() })
      .where(and(eq(cycles.id, input.cycleId), inArray(cycles.status, EDITABLE_CYCLE_STATUSES)))
      .returning({ id: cycles.id });
    if (open.length === 0) return null;
    let fileId: string;
    if ("existingId" in input.file) {
      fileId = input.file.existingId;
    } else {
      const [saved] = await tx
        .insert(loggerFiles)
        .values({ ...input.file, cycleId: input.cycleId })
        .returning({ id: loggerFiles.id });
      fileId = saved.id;
    }
    const [saved] = await tx
      .insert(analyses)
      .values({ ...input.analysis, cycleId: input.cycleId, loggerFileId: fileId })
      .returning({ id: analyses.id });
    await tx.update(cycles).set({ currentAnalysisId: saved.id }).where(eq(cycles.id, input.cycleId));
    await appendAuditEvent(tx, input.audit(saved.id));
    await input.inside?.(tx, input.cycleId);
    return saved.id;
  });
}

import "server-only";
import { asc, desc, eq, and, gt, gte, lt, lte, count, sql } from "drizzle-orm";
import { getDb, type Executor } from "@/db";
import { containsText } from "./search";
import { acceptanceProfiles, apiTokens, auditEvents, cycles, instruments, loadingPatterns, periodicTests, reports, sites, sterilizers, studies, users } from "@/db/schema";
import { appendAuditEvent, readLedgerHead, type AuditInput } from "@/db/ledger";
import type { LedgerHead } from "@/lib/integrity/anchors";

/** Records an event in a transaction of its own (sign-ins, exports: no other change to join). */
export async function recordAuditEvent(input: AuditInput): Promise<void> {
  await getDb().transaction(async (tx) => appendAuditEvent(tx, input));
}

/** The chain's head now: event count, last seq and hash, read in one snapshot. */
export async function getLedgerHead() {
  return readLedgerHead(getDb());
}

/** Runs `inside` in one transaction with the head that transaction sees (mail written with the head it reports). */
export async function withLedgerHead<T>(inside: (tx: Executor, head: LedgerHead) => Promise<T>): Promise<T> {
  return getDb().transaction(async (tx) => inside(tx, await readLedgerHead(tx)));
}

/** Every enabled auditor with their site, for the daily ledger-head mail. */
export async function listSiteAuditors() {
  return getDb()
    .select({ siteId: sites.id, siteName: sites.name, email: users.email })
    .from(users)
    .innerJoin(sites, eq(users.siteId, sites.id))
    .where(and(eq(users.role, "auditor"), eq(users.disabled, false)))
    .orderBy(asc(sites.name), asc(users.email));
}

/** The newest event's seq (0 for none): every change to a record appends an event, so a new seq means something may have changed. */
export async function latestAuditSeq(): Promise<number> {
  const [row] = await getDb().select({ seq: auditEvents.seq }).from(auditEvents).orderBy(desc(auditEvents.seq)).limit(1);
  return row?.seq ?? 0;
}

/** One page of the whole chain in order, for walking it (the chain spans every site). */
export async function listAuditEventsAfter({ afterSeq, limit }: { afterSeq: number; limit: number }) {
  return getDb().select().from(auditEvents).where(gt(auditEvents.seq, afterSeq)).orderBy(asc(auditEvents.seq)).limit(limit);
}

export type AuditFilter = {
  action?: string;
  entityType?: string;
  entityId?: string;
  actor?: string;
  from?: string;
  to?: string;
  page?: number;
  pageSize?: number;
};

/** Counts the matching events; the service passes one that reuses a cached total (lib/services/list-totals.ts). */
export type TotalOf = (count: () => Promise<number>) => Promise<number>;

/**
 * The site's events, newest first; events of other sites and of no site never appear. The page is read in index order;
 * the total goes through `totalOf` (by default counted: every matching event, so the service caches it).
 */
export async function listAuditEventsOfSite({ siteId, filter, totalOf = (count) => count() }: { siteId: string; filter: AuditFilter; totalOf?: TotalOf }) {
  const db = getDb();
  const where = and(
    eq(auditEvents.siteId, siteId),
    filter.action ? eq(auditEvents.action, filter.action) : undefined,
    filter.entityType ? eq(auditEvents.entityType, filter.entityType) : undefined,
    filter.entityId ? eq(auditEvents.entityId, filter.entityId) : undefined,
    filter.actor ? containsText(auditEvents.actorEmail, filter.actor) : undefined,
    filter.from ? gte(auditEvents.at, filter.from) : undefined,
    filter.to ? lte(auditEvents.at, filter.to) : undefined,
  );
  const pageSize = Math.min(Math.max(filter.pageSize ?? 50, 1), 500);
  const page = Math.max(filter.page ?? 1, 1);
  const countAll = async () => (await db.select({ total: count() }).from(auditEvents).where(where))[0].total;
  const [items, total] = await Promise.all([
    db
      .select()
      .from(auditEvents)
      .where(where)
      .orderBy(desc(auditEvents.seq))
      .limit(pageSize)
      .offset((page - 1) * pageSize),
    totalOf(countAll),
  ]);
  return { items, total };
}

export async function listAuditEventsForEntity({ entityType, entityId }: { entityType: string; entityId: string }) {
  return getDb()
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.entityType, entityType), eq(auditEvents.entityId, entityId)))
    .orderBy(asc(auditEvents.seq));
}

/** The newest event of one kind about one record (a profile's retirement, say). */
export async function getLatestAuditEvent({ entityType, entityId, action }: { entityType: string; entityId: string; action: string }) {
  const [row] = await getDb()
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.entityType, entityType), eq(auditEvents.entityId, entityId), eq(auditEvents.action, action)))
    .orderBy(desc(auditEvents.seq))
    .limit(1);
  return row;
}

// ——— The audit trail as a person reads it (the ledger page and its exports) ———

/** The trail's filter: ids and instants already resolved by the service (site dates → UTC instants). */
export type AuditTrailFilter = { actorId?: string; action?: string; entityId?: string; fromIso?: string; beforeIso?: string; maxSeq?: number };

function trailWhere(siteId: string, filter: AuditTrailFilter) {
  return and(
    eq(auditEvents.siteId, siteId),
    filter.actorId ? eq(auditEvents.actorId, filter.actorId) : undefined,
    filter.action ? eq(auditEvents.action, filter.action) : undefined,
    filter.entityId ? eq(auditEvents.entityId, filter.entityId) : undefined,
    filter.fromIso ? gte(auditEvents.at, filter.fromIso) : undefined,
    filter.beforeIso ? lt(auditEvents.at, filter.beforeIso) : undefined,
    filter.maxSeq !== undefined ? lte(auditEvents.seq, filter.maxSeq) : undefined,
  );
}

/** One page of the site's trail, newest first, with the number of events the filter matches. */
export async function listAuditTrailPage({ siteId, filter, page, pageSize }: { siteId: string; filter: AuditTrailFilter; page: number; pageSize: number }) {
  const where = trailWhere(siteId, filter);
  const db = getDb();
  const [items, [{ total }]] = await Promise.all([
    db
      .select()
      .from(auditEvents)
      .where(where)
      .orderBy(desc(auditEvents.seq))
      .limit(pageSize)
      .offset((page - 1) * pageSize),
    db.select({ total: count() }).from(auditEvents).where(where),
  ]);
  return { items, total };
}

export async function countAuditTrail({ siteId, filter }: { siteId: string; filter: AuditTrailFilter }): Promise<number> {
  const [{ total }] = await getDb().select({ total: count() }).from(auditEvents).where(trailWhere(siteId, filter));
  return total;
}

/** The next batch of an export, newest first, below `beforeSeq` (keyset paging: the trail may grow meanwhile). */
export async function listAuditTrailBatch({ siteId, filter, beforeSeq, limit }: { siteId: string; filter: AuditTrailFilter; beforeSeq: number | null; limit: number }) {
  return getDb()
    .select()
    .from(auditEvents)
    .where(and(trailWhere(siteId, filter), beforeSeq === null ? undefined : lt(auditEvents.seq, beforeSeq)))
    .orderBy(desc(auditEvents.seq))
    .limit(limit);
}

export type AuditNameRow = { id: string; type: string; label: string; extra: string | null };

/**
 * The names behind record ids, in one query: cycle numbers, study numbers, loading patterns, sterilizer, profile, instrument and
 * token names, periodic tests (kind, sterilizer and date), reports, people (name and role). Only
 * records of the site; people by id (an event of this site names its actor).
 */
export async function listAuditNames({ siteId, ids }: { siteId: string; ids: string[] }): Promise<AuditNameRow[]> {
  if (ids.length === 0) return [];
  const wanted = sql`(select value from json_each(${JSON.stringify(ids)}))`;
  const rows = await getDb().all<AuditNameRow>(sql`
    select ${cycles.id} as id, 'cycle' as type, ${cycles.cycleNumber} as label, null as extra from ${cycles} where ${cycles.siteId} = ${siteId} and ${cycles.id} in ${wanted}
    union all select ${sterilizers.id}, 'sterilizer', ${sterilizers.name}, null from ${sterilizers} where ${sterilizers.siteId} = ${siteId} and ${sterilizers.id} in ${wanted}
    union all select ${acceptanceProfiles.id}, 'profile', ${acceptanceProfiles.name}, null from ${acceptanceProfiles} where ${acceptanceProfiles.siteId} = ${siteId} and ${acceptanceProfiles.id} in ${wanted}
    union all select ${instruments.id}, 'instrument', ${instruments.name}, ${instruments.serialNumber} from ${instruments} where ${instruments.siteId} = ${siteId} and ${instruments.id} in ${wanted}
    union all select ${periodicTests.id}, 'periodic-test', ${periodicTests.kind}, (select ${sterilizers.name} from ${sterilizers} where ${sterilizers.id} = ${periodicTests.sterilizerId}) || '|' || ${periodicTests.performedAt} from ${periodicTests} where ${periodicTests.siteId} = ${siteId} and ${periodicTests.id} in ${wanted}
    union all select ${reports.id}, 'report', ${reports.reportNumber}, null from ${reports} where ${reports.cycleId} in (select ${cycles.id} from ${cycles} where ${cycles.siteId} = ${siteId}) and ${reports.id} in ${wanted}
    union all select ${apiTokens.id}, 'api-token', ${apiTokens.name}, ${apiTokens.prefix} from ${apiTokens} where ${apiTokens.siteId} = ${siteId} and ${apiTokens.id} in ${wanted}
    union all select ${users.id}, 'user', ${users.name}, ${users.role} from ${users} where ${users.id} in ${wanted}
    union all select ${studies.id}, 'study', ${studies.studyNumber}, null from ${studies} where ${studies.siteId} = ${siteId} and ${studies.id} in ${wanted}
    union all select ${loadingPatterns.id}, 'loading-pattern', ${loadingPatterns.name}, null from ${loadingPatterns} where ${loadingPatterns.siteId} = ${siteId} and ${loadingPatterns.id} in ${wanted}
  `);
  return rows;
}

/** A cycle of the site by its number (the record filter takes a cycle number as well as an id). */
export async function findCycleIdByNumber({ siteId, cycleNumber }: { siteId: string; cycleNumber: string }): Promise<string | undefined> {
  const [row] = await getDb()
    .select({ id: cycles.id })
    .from(cycles)
    .where(and(eq(cycles.siteId, siteId), eq(cycles.cycleNumber, cycleNumber)))
    .limit(1);
  return row?.id;
}

/** The ledger event that recorded an audit-trail extract with this SHA-256, on the site. */
export async function findAuditExtractEvent({ siteId, sha256 }: { siteId: string; sha256: string }) {
  const [row] = await getDb()
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.siteId, siteId), eq(auditEvents.action, "audit.export"), sql`json_extract(${auditEvents.newValue}, '$.sha256') = ${sha256}`))
    .orderBy(desc(auditEvents.seq))
    .limit(1);
  return row;
}

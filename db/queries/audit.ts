import "server-only";
import { asc, desc, eq, and, gt, gte, lte, count } from "drizzle-orm";
import { getDb, type Executor } from "@/db";
import { containsText } from "./search";
import { auditEvents, sites, users } from "@/db/schema";
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

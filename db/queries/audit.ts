import "server-only";
import { asc, desc, eq, and, gte, lte, like, or, count } from "drizzle-orm";
import { getDb } from "@/db";
import { auditEvents } from "@/db/schema";
import { GENESIS_HASH } from "@/lib/integrity";
import { appendAuditEvent, auditEventHash, type AuditInput } from "@/db/ledger";

export { appendAuditEvent, type AuditInput };

/** Records an event in a transaction of its own (sign-ins, exports: no other change to join). */
export async function recordAuditEvent(input: AuditInput): Promise<void> {
  await getDb().transaction(async (tx) => appendAuditEvent(tx, input));
}

export type ChainState = { ok: boolean; events: number; firstBrokenAt?: number; problem?: string };

/** Walks the whole chain in order, recomputing each hash; names the first event that does not fit. */
export async function verifyAuditChain(): Promise<ChainState> {
  const db = getDb();
  const pageSize = 2000;
  let prevHash = GENESIS_HASH;
  let lastSeq = 0;
  let events = 0;
  for (;;) {
    const rows = await db
      .select()
      .from(auditEvents)
      .where(gte(auditEvents.seq, lastSeq + 1))
      .orderBy(asc(auditEvents.seq))
      .limit(pageSize);
    for (const row of rows) {
      events++;
      const { seq, hash, ...fields } = row;
      if (fields.prevHash !== prevHash) {
        return { ok: false, events, firstBrokenAt: seq, problem: `Event ${seq} does not point at the event before it.` };
      }
      if (auditEventHash(fields) !== hash) {
        return { ok: false, events, firstBrokenAt: seq, problem: `Event ${seq} was changed after it was written.` };
      }
      prevHash = hash;
      lastSeq = seq;
    }
    if (rows.length < pageSize) break;
  }
  return { ok: true, events };
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

export async function listAuditEvents(filter: AuditFilter) {
  const db = getDb();
  const conditions = [
    filter.action ? eq(auditEvents.action, filter.action) : undefined,
    filter.entityType ? eq(auditEvents.entityType, filter.entityType) : undefined,
    filter.entityId ? eq(auditEvents.entityId, filter.entityId) : undefined,
    filter.actor ? or(like(auditEvents.actorEmail, `%${filter.actor}%`)) : undefined,
    filter.from ? gte(auditEvents.at, filter.from) : undefined,
    filter.to ? lte(auditEvents.at, filter.to) : undefined,
  ].filter(Boolean);
  const where = conditions.length ? and(...conditions) : undefined;
  const pageSize = Math.min(Math.max(filter.pageSize ?? 50, 1), 500);
  const page = Math.max(filter.page ?? 1, 1);
  const [items, [{ total }]] = await Promise.all([
    db.select().from(auditEvents).where(where).orderBy(desc(auditEvents.seq)).limit(pageSize).offset((page - 1) * pageSize),
    db.select({ total: count() }).from(auditEvents).where(where),
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

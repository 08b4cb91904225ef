import "server-only";
import { and, asc, desc, eq, sql } from "drizzle-orm";
import { getDb, type Executor } from "@/db";
import { sterilizers, sterilizerStatusEvents, testSchedules } from "@/db/schema";
import type { SterilizerStatus } from "@/lib/domain";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";
import { CYCLE_AT, CYCLE_CONFIRMED, CYCLE_RESULT } from "./cycle-outcomes";

type Hook = (tx: Executor) => Promise<void>;

export type OutcomeRow = { sterilizerId: string; kind: string; at: string; result: "pass" | "fail"; sourceType: "cycle" | "periodic-test"; sourceId: string };

// A periodic record approved (its result) or failure-confirmed (a fail); cycles: see cycle-outcomes.ts.
const RECORD_CONFIRMED = sql.raw(`p.status in ('approved', 'failure-confirmed')`);
const RECORD_RESULT = sql.raw(`(case when p.status = 'failure-confirmed' then 'fail' else p.result end)`);

/**
 * The confirmed test outcomes of the site's sterilizers (or one of them), from both tables: only the latest pass and the
 * latest failure of each sterilizer and kind, all the status rule needs. Read through indexes, never every cycle: the
 * kinds each sterilizer has outcomes of are found by skipping along the index (a recursive step per kind), then each
 * kind's latest pass and latest failure is one index lookup per table; the later of the two tables' rows wins here.
 */
export async function listConfirmedOutcomes({ siteId, sterilizerId }: { siteId: string; sterilizerId?: string }): Promise<OutcomeRow[]> {
  const oneSterilizer = sterilizerId ? sql`and s.id = ${sterilizerId}` : sql``;
  const rows = await getDb().all<OutcomeRow>(sql`
    with recursive site_sterilizers(id) as (select s.id from sterilizers s where s.site_id = ${siteId} ${oneSterilizer}),
    cycle_kinds(sterilizer_id, kind) as (
      select s.id, (select c.test_kind from cycles c where c.sterilizer_id = s.id and ${CYCLE_CONFIRMED} order by c.test_kind limit 1) from site_sterilizers s
      union all
      select k.sterilizer_id, (select c.test_kind from cycles c where c.sterilizer_id = k.sterilizer_id and c.test_kind > k.kind and ${CYCLE_CONFIRMED} order by c.test_kind limit 1)
        from cycle_kinds k where k.kind is not null
    ),
    record_kinds(sterilizer_id, kind) as (
      select s.id, (select p.kind from periodic_tests p where p.sterilizer_id = s.id and ${RECORD_CONFIRMED} order by p.kind limit 1) from site_sterilizers s
      union all
      select k.sterilizer_id, (select p.kind from periodic_tests p where p.sterilizer_id = k.sterilizer_id and p.kind > k.kind and ${RECORD_CONFIRMED} order by p.kind limit 1)
        from record_kinds k where k.kind is not null
    ),
    results(result) as (values ('pass'), ('fail')),
    latest_cycles as (
      select k.sterilizer_id, k.kind, r.result, (
        select c.id from cycles c
         where c.sterilizer_id = k.sterilizer_id and c.test_kind = k.kind and ${CYCLE_CONFIRMED} and ${CYCLE_RESULT} = r.result and c.site_id = ${siteId}
         order by ${CYCLE_AT} desc limit 1) as source_id
      from cycle_kinds k, results r where k.kind is not null
    ),
    latest_records as (
      select k.sterilizer_id, k.kind, r.result, (
        select p.id from periodic_tests p
         where p.sterilizer_id = k.sterilizer_id and p.kind = k.kind and ${RECORD_CONFIRMED} and ${RECORD_RESULT} = r.result and p.site_id = ${siteId}
         order by p.performed_at desc limit 1) as source_id
      from record_kinds k, results r where k.kind is not null
    )
    select l.sterilizer_id as sterilizerId, l.kind, ${CYCLE_AT} as at, l.result, 'cycle' as sourceType, c.id as sourceId
      from latest_cycles l join cycles c on c.id = l.source_id
    union all
    select l.sterilizer_id, l.kind, p.performed_at, l.result, 'periodic-test', p.id
      from latest_records l join periodic_tests p on p.id = l.source_id`);
  return latestOfEachKey(rows);
}

/** Of a cycle and a periodic record with the same sterilizer, kind and result, the later one (compared as stored text). */
function latestOfEachKey(rows: OutcomeRow[]): OutcomeRow[] {
  const byKey = new Map<string, OutcomeRow>();
  for (const row of rows) {
    const key = `${row.sterilizerId}\u0000${row.kind}\u0000${row.result}`;
    const seen = byKey.get(key);
    if (!seen || row.at > seen.at) byKey.set(key, row);
  }
  return [...byKey.values()];
}

/** What the status of the site's active sterilizers (or one) is judged from, besides the outcomes. */
export async function getStatusFacts({ siteId, sterilizerId }: { siteId: string; sterilizerId?: string }) {
  const db = getDb();
  const ofSite = and(eq(sterilizers.siteId, siteId), eq(sterilizers.active, true), sterilizerId ? eq(sterilizers.id, sterilizerId) : undefined);
  const [rows, schedules, manual] = await Promise.all([
    db
      .select({
        id: sterilizers.id,
        name: sterilizers.name,
        status: sterilizers.status,
        statusReason: sterilizers.statusReason,
        statusSince: sterilizers.statusSince,
        createdAt: sterilizers.createdAt,
      })
      .from(sterilizers)
      .where(ofSite)
      .orderBy(asc(sterilizers.name)),
    db
      .select({
        sterilizerId: testSchedules.sterilizerId,
        kind: testSchedules.kind,
        intervalDays: testSchedules.intervalDays,
        requiredBeforeUse: testSchedules.requiredBeforeUse,
        since: testSchedules.createdAt,
      })
      .from(testSchedules)
      .innerJoin(sterilizers, eq(testSchedules.sterilizerId, sterilizers.id))
      .where(ofSite),
    // The engineers' latest hold and latest release of each sterilizer.
    db
      .select({
        sterilizerId: sterilizerStatusEvents.sterilizerId,
        status: sterilizerStatusEvents.status,
        at: sterilizerStatusEvents.at,
        reason: sterilizerStatusEvents.reason,
        byName: sterilizerStatusEvents.printedName,
        acknowledged: sterilizerStatusEvents.acknowledged,
      })
      .from(sterilizerStatusEvents)
      .innerJoin(sterilizers, eq(sterilizerStatusEvents.sterilizerId, sterilizers.id))
      .where(
        and(
          ofSite,
          eq(sterilizerStatusEvents.kind, "manual"),
          sql`${sterilizerStatusEvents.at} = (select max(e2.at) from sterilizer_status_events e2 where e2.sterilizer_id = ${sterilizerStatusEvents.sterilizerId} and e2.kind = 'manual' and e2.status = ${sterilizerStatusEvents.status})`,
        ),
      ),
  ]);
  return { sterilizers: rows, schedules, manual };
}

/** The status history of one sterilizer, newest first. */
export async function listStatusEvents({ sterilizerId, limit }: { sterilizerId: string; limit: number }) {
  return getDb().select().from(sterilizerStatusEvents).where(eq(sterilizerStatusEvents.sterilizerId, sterilizerId)).orderBy(desc(sterilizerStatusEvents.at)).limit(limit);
}

export type StatusWrite = {
  sterilizerId: string;
  fromStatus: SterilizerStatus;
  to: { status: SterilizerStatus; reason: string; since: string };
  event: Omit<typeof sterilizerStatusEvents.$inferInsert, "sterilizerId"> | null;
  audit: AuditInput | null;
  /** runs last inside the transaction (queueing mail) */
  inside?: Hook;
};

/**
 * Stores the sterilizer's new status, its event, its audit event and whatever `inside` adds, in one transaction, only
 * if the status is still what the caller saw; false when another request changed it first.
 */
export async function writeSterilizerStatus({ sterilizerId, fromStatus, to, event, audit, inside }: StatusWrite): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    const updated = await tx
      .update(sterilizers)
      .set({ status: to.status, statusReason: to.reason, statusSince: to.since })
      .where(and(eq(sterilizers.id, sterilizerId), eq(sterilizers.status, fromStatus)))
      .returning({ id: sterilizers.id });
    if (updated.length === 0) return false;
    if (event) await tx.insert(sterilizerStatusEvents).values({ ...event, sterilizerId });
    if (audit) await appendAuditEvent(tx, audit);
    await inside?.(tx);
    return true;
  });
}

/** The site a sterilizer belongs to (for a recomputation started by a workflow that already checked access). */
export async function getSterilizerSiteId({ id }: { id: string }): Promise<string | null> {
  const [row] = await getDb().select({ siteId: sterilizers.siteId }).from(sterilizers).where(eq(sterilizers.id, id)).limit(1);
  return row?.siteId ?? null;
}

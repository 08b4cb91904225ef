import "server-only";
import { and, asc, desc, eq, sql } from "drizzle-orm";
import { getDb, type Executor } from "@/db";
import { sterilizers, sterilizerStatusEvents, testSchedules } from "@/db/schema";
import type { SterilizerStatus } from "@/lib/domain";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";

type Hook = (tx: Executor) => Promise<void>;

export type OutcomeRow = { sterilizerId: string; kind: string; at: string; result: "pass" | "fail"; sourceType: "cycle" | "periodic-test"; sourceId: string };

/**
 * The confirmed test outcomes of the site's sterilizers (or one of them), from both tables: cycles approved (their
 * verdict) or failure-confirmed (a fail), periodic records approved (their result) or failure-confirmed (a fail).
 * Only the latest pass and the latest failure of each sterilizer and kind: all the status rule needs.
 */
export async function listConfirmedOutcomes({ siteId, sterilizerId }: { siteId: string; sterilizerId?: string }): Promise<OutcomeRow[]> {
  const oneCycle = sterilizerId ? sql`and c.sterilizer_id = ${sterilizerId}` : sql``;
  const oneRecord = sterilizerId ? sql`and p.sterilizer_id = ${sterilizerId}` : sql``;
  return getDb().all<OutcomeRow>(sql`
    select sterilizer_id as sterilizerId, kind, at, result, source_type as sourceType, source_id as sourceId from (
      select o.*, row_number() over (partition by sterilizer_id, kind, result order by at desc) as rn from (
        select c.sterilizer_id, c.test_kind as kind, coalesce(c.started_at, c.created_at) as at,
               case when c.status = 'failure-confirmed' then 'fail' else c.verdict end as result, 'cycle' as source_type, c.id as source_id
          from cycles c
         where c.site_id = ${siteId} ${oneCycle}
           and (c.status = 'failure-confirmed' or (c.status = 'approved' and c.verdict in ('pass', 'fail')))
        union all
        select p.sterilizer_id, p.kind, p.performed_at,
               case when p.status = 'failure-confirmed' then 'fail' else p.result end, 'periodic-test', p.id
          from periodic_tests p
         where p.site_id = ${siteId} ${oneRecord}
           and p.status in ('approved', 'failure-confirmed')
      ) o
    ) where rn = 1`);
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

import "server-only";
import { and, count, desc, eq, gte, inArray, lte, max, ne, sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db";
import { cycles, periodicTests, sites, sterilizers, testSchedules, users, type PeriodicTestKind } from "@/db/schema";
import { appendAuditEvent } from "@/db/ledger";
import type { Actor } from "./users";
import { AppError } from "@/lib/errors";
import { localDate, needsAction, scheduleStatus, SCHEDULE_URGENCY, type ScheduleStatus } from "@/lib/periodic-tests";

function siteOf(actor: Actor): string {
  if (!actor.siteId) throw new AppError(403, "Your account is not attached to a site, so it has no equipment. Ask an administrator.");
  return actor.siteId;
}

/** Periodic-test kinds whose evidence is a logged cycle (signed off in the cycle record) rather than a form. */
export const CYCLE_EVIDENCED_KINDS = ["thermometric-small-load", "thermometric-full-load"] as const satisfies readonly PeriodicTestKind[];
const isCycleEvidenced = (kind: string) => (CYCLE_EVIDENCED_KINDS as readonly string[]).includes(kind);

export type ScheduleRow = {
  sterilizerId: string;
  sterilizerName: string;
  sterilizerActive: boolean;
  kind: PeriodicTestKind;
  intervalDays: number;
  lastPassAt: string | null;
  lastAttempt: { at: string; result: "pass" | "fail" } | null;
  /** passing cycles of this kind that still wait for sign-off (thermometric tests only) */
  awaitingSignOff: number;
  status: ScheduleStatus;
  needsAction: boolean;
};

export async function getScheduleOverview({ actor, sterilizerId, now = new Date() }: { actor: Actor; sterilizerId?: string; now?: Date }) {
  const siteId = siteOf(actor);
  const db = getDb();
  const [site] = await db.select({ timeZone: sites.timeZone }).from(sites).where(eq(sites.id, siteId)).limit(1);
  const timeZone = site?.timeZone ?? "UTC";
  const today = localDate(now, timeZone);
  const sterilizerFilter = sterilizerId ? eq(sterilizers.id, sterilizerId) : undefined;
  const [schedules, passes, attempts, cyclePasses, cycleAttempts, pending] = await Promise.all([
    db
      .select({ sterilizerId: testSchedules.sterilizerId, kind: testSchedules.kind, intervalDays: testSchedules.intervalDays, sterilizerName: sterilizers.name, sterilizerActive: sterilizers.active })
      .from(testSchedules)
      .innerJoin(sterilizers, eq(testSchedules.sterilizerId, sterilizers.id))
      .where(and(eq(sterilizers.siteId, siteId), sterilizerFilter)),
    db
      .select({ sterilizerId: periodicTests.sterilizerId, kind: periodicTests.kind, at: max(periodicTests.performedAt) })
      .from(periodicTests)
      .where(and(eq(periodicTests.siteId, siteId), eq(periodicTests.result, "pass"), sterilizerId ? eq(periodicTests.sterilizerId, sterilizerId) : undefined))
      .groupBy(periodicTests.sterilizerId, periodicTests.kind),
    // The latest attempt of each kind, whatever its result.
    db
      .select({ sterilizerId: periodicTests.sterilizerId, kind: periodicTests.kind, at: periodicTests.performedAt, result: periodicTests.result })
      .from(periodicTests)
      .where(
        and(
          eq(periodicTests.siteId, siteId),
          sterilizerId ? eq(periodicTests.sterilizerId, sterilizerId) : undefined,
          sql`${periodicTests.performedAt} = (select max(p2.performed_at) from periodic_tests p2 where p2.sterilizer_id = ${periodicTests.sterilizerId} and p2.kind = ${periodicTests.kind})`,
        ),
      ),
    db
      .select({ sterilizerId: cycles.sterilizerId, kind: cycles.testKind, at: max(sql<string>`coalesce(${cycles.startedAt}, ${cycles.createdAt})`) })
      .from(cycles)
      .where(and(eq(cycles.siteId, siteId), eq(cycles.status, "approved"), eq(cycles.verdict, "pass"), inArray(cycles.testKind, [...CYCLE_EVIDENCED_KINDS])))
      .groupBy(cycles.sterilizerId, cycles.testKind),
    db
      .select({ sterilizerId: cycles.sterilizerId, kind: cycles.testKind, at: max(sql<string>`coalesce(${cycles.startedAt}, ${cycles.createdAt})`) })
      .from(cycles)
      .where(and(eq(cycles.siteId, siteId), eq(cycles.status, "approved"), eq(cycles.verdict, "fail"), inArray(cycles.testKind, [...CYCLE_EVIDENCED_KINDS])))
      .groupBy(cycles.sterilizerId, cycles.testKind),
    db
      .select({ sterilizerId: cycles.sterilizerId, kind: cycles.testKind, n: count() })
      .from(cycles)
      .where(and(eq(cycles.siteId, siteId), ne(cycles.status, "approved"), ne(cycles.status, "rejected"), eq(cycles.verdict, "pass"), inArray(cycles.testKind, [...CYCLE_EVIDENCED_KINDS])))
      .groupBy(cycles.sterilizerId, cycles.testKind),
  ]);
  const key = (s: string, k: string) => `${s}:${k}`;
  const latestOf = (...values: Array<string | null | undefined>) => values.filter((v): v is string => !!v).sort().at(-1) ?? null;
  const passBy = new Map(passes.map((p) => [key(p.sterilizerId, p.kind), p.at]));
  const attemptBy = new Map(attempts.map((a) => [key(a.sterilizerId, a.kind), { at: a.at, result: a.result }]));
  const cyclePassBy = new Map(cyclePasses.map((c) => [key(c.sterilizerId, c.kind), c.at]));
  const cycleFailBy = new Map(cycleAttempts.map((c) => [key(c.sterilizerId, c.kind), c.at]));
  const pendingBy = new Map(pending.map((p) => [key(p.sterilizerId, p.kind), p.n]));

  const rows: ScheduleRow[] = schedules.map((s) => {
    const k = key(s.sterilizerId, s.kind);
    let lastPassAt = passBy.get(k) ?? null;
    let lastAttempt = attemptBy.get(k) ?? null;
    if (isCycleEvidenced(s.kind)) {
      lastPassAt = latestOf(lastPassAt, cyclePassBy.get(k));
      const failAt = cycleFailBy.get(k);
      if (failAt && (!lastAttempt || failAt > lastAttempt.at)) lastAttempt = { at: failAt, result: "fail" };
      if (lastPassAt && (!lastAttempt || lastPassAt > lastAttempt.at)) lastAttempt = { at: lastPassAt, result: "pass" };
    }
    const status = scheduleStatus({ intervalDays: s.intervalDays, lastPassAt, lastAttempt, today, timeZone });
    return { ...s, lastPassAt, lastAttempt, awaitingSignOff: pendingBy.get(k) ?? 0, status, needsAction: s.sterilizerActive && needsAction(status.state) };
  });
  rows.sort((a, b) => SCHEDULE_URGENCY[a.status.state] - SCHEDULE_URGENCY[b.status.state] || (a.status.dueOn ?? "").localeCompare(b.status.dueOn ?? "") || a.sterilizerName.localeCompare(b.sterilizerName));
  return { rows, timeZone, today };
}

export type PeriodicTestFilter = { sterilizer?: string; kind?: string; result?: "pass" | "fail"; from?: string; to?: string; page?: number; pageSize?: number };

export async function listPeriodicTests({ actor, filter }: { actor: Actor; filter: PeriodicTestFilter }) {
  const siteId = siteOf(actor);
  const db = getDb();
  const pageSize = Math.min(Math.max(filter.pageSize ?? 25, 1), 200);
  const page = Math.max(filter.page ?? 1, 1);
  const conditions: Array<SQL | undefined> = [eq(periodicTests.siteId, siteId)];
  if (filter.sterilizer) conditions.push(eq(periodicTests.sterilizerId, filter.sterilizer));
  if (filter.kind) conditions.push(eq(periodicTests.kind, filter.kind as PeriodicTestKind));
  if (filter.result) conditions.push(eq(periodicTests.result, filter.result));
  if (filter.from) conditions.push(gte(periodicTests.performedAt, filter.from));
  if (filter.to) conditions.push(lte(periodicTests.performedAt, `${filter.to}T23:59:59.999Z`));
  const where = and(...conditions);
  const [items, [{ total }]] = await Promise.all([
    db
      .select({
        id: periodicTests.id,
        kind: periodicTests.kind,
        performedAt: periodicTests.performedAt,
        result: periodicTests.result,
        measurements: periodicTests.measurements,
        notes: periodicTests.notes,
        sterilizerId: periodicTests.sterilizerId,
        sterilizerName: sterilizers.name,
        performedByName: users.name,
      })
      .from(periodicTests)
      .innerJoin(sterilizers, eq(periodicTests.sterilizerId, sterilizers.id))
      .innerJoin(users, eq(periodicTests.performedBy, users.id))
      .where(where)
      .orderBy(desc(periodicTests.performedAt))
      .limit(pageSize)
      .offset((page - 1) * pageSize),
    db.select({ total: count() }).from(periodicTests).where(where),
  ]);
  return { items, total, page, pageSize };
}

export async function listSterilizerChoices({ actor }: { actor: Actor }) {
  const siteId = siteOf(actor);
  const rows = await getDb()
    .select({ id: sterilizers.id, name: sterilizers.name, serialNumber: sterilizers.serialNumber, active: sterilizers.active, chamberVolumeL: sterilizers.chamberVolumeL })
    .from(sterilizers)
    .where(eq(sterilizers.siteId, siteId))
    .orderBy(desc(sterilizers.active), sterilizers.name);
  const [site] = await getDb().select({ atmosphereKpa: sites.atmosphereKpa, altitudeM: sites.altitudeM, timeZone: sites.timeZone }).from(sites).where(eq(sites.id, siteId)).limit(1);
  return { sterilizers: rows, site: site ?? { atmosphereKpa: null, altitudeM: null, timeZone: "UTC" } };
}

export async function recordPeriodicTest({
  actor,
  sterilizerId,
  kind,
  performedAt,
  result,
  measurements,
  notes,
}: {
  actor: Actor;
  sterilizerId: string;
  kind: PeriodicTestKind;
  performedAt: string;
  result: "pass" | "fail";
  measurements: Record<string, unknown>;
  notes: string | null;
}) {
  const siteId = siteOf(actor);
  const db = getDb();
  const [sterilizer] = await db.select({ id: sterilizers.id, name: sterilizers.name, active: sterilizers.active }).from(sterilizers).where(and(eq(sterilizers.id, sterilizerId), eq(sterilizers.siteId, siteId))).limit(1);
  if (!sterilizer) throw new AppError(404, "That sterilizer was not found on your site.", "sterilizerId");
  if (!sterilizer.active) throw new AppError(409, `${sterilizer.name} is retired; tests cannot be recorded for it.`, "sterilizerId");
  return db.transaction(async (tx) => {
    const [created] = await tx.insert(periodicTests).values({ siteId, sterilizerId, kind, performedAt, performedBy: actor.id, result, measurements, notes }).returning();
    await appendAuditEvent(tx, {
      actorId: actor.id,
      actorEmail: actor.email,
      siteId,
      action: "periodic-test.record",
      entityType: "periodic-test",
      entityId: created.id,
      newValue: { sterilizer: sterilizer.name, sterilizerId, kind, performedAt, result, measurements, notes },
    });
    return { ...created, sterilizerName: sterilizer.name };
  });
}

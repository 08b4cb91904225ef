import "server-only";
import { and, count, desc, eq, gte, inArray, lte, max, ne, sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db";
import { cycles, periodicTests, sterilizers, testSchedules, users, type PeriodicTestKind, type TestKind } from "@/db/schema";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";

const startedOrCreated = sql<string>`coalesce(${cycles.startedAt}, ${cycles.createdAt})`;

/**
 * What the schedule of the site's sterilizers (or one of them) is judged from: each scheduled
 * test, the latest pass and the latest attempt of each recorded kind, and for the kinds
 * evidenced by a logged cycle the latest approved pass, the latest approved failure and the
 * passing cycles still waiting for sign-off.
 */
export async function getScheduleFacts({
  siteId,
  sterilizerId,
  cycleEvidencedKinds,
}: {
  siteId: string;
  sterilizerId?: string;
  cycleEvidencedKinds: ReadonlyArray<Extract<PeriodicTestKind, TestKind>>;
}) {
  const db = getDb();
  const ofSterilizer = sterilizerId ? eq(periodicTests.sterilizerId, sterilizerId) : undefined;
  const byCycle = inArray(cycles.testKind, [...cycleEvidencedKinds]);
  const [schedules, passes, attempts, cyclePasses, cycleFailures, awaitingSignOff] = await Promise.all([
    db
      .select({ sterilizerId: testSchedules.sterilizerId, kind: testSchedules.kind, intervalDays: testSchedules.intervalDays, sterilizerName: sterilizers.name, sterilizerActive: sterilizers.active })
      .from(testSchedules)
      .innerJoin(sterilizers, eq(testSchedules.sterilizerId, sterilizers.id))
      .where(and(eq(sterilizers.siteId, siteId), sterilizerId ? eq(sterilizers.id, sterilizerId) : undefined)),
    db
      .select({ sterilizerId: periodicTests.sterilizerId, kind: periodicTests.kind, at: max(periodicTests.performedAt) })
      .from(periodicTests)
      .where(and(eq(periodicTests.siteId, siteId), eq(periodicTests.result, "pass"), ofSterilizer))
      .groupBy(periodicTests.sterilizerId, periodicTests.kind),
    // The latest attempt of each kind, whatever its result.
    db
      .select({ sterilizerId: periodicTests.sterilizerId, kind: periodicTests.kind, at: periodicTests.performedAt, result: periodicTests.result })
      .from(periodicTests)
      .where(
        and(
          eq(periodicTests.siteId, siteId),
          ofSterilizer,
          sql`${periodicTests.performedAt} = (select max(p2.performed_at) from periodic_tests p2 where p2.sterilizer_id = ${periodicTests.sterilizerId} and p2.kind = ${periodicTests.kind})`,
        ),
      ),
    db
      .select({ sterilizerId: cycles.sterilizerId, kind: cycles.testKind, at: max(startedOrCreated) })
      .from(cycles)
      .where(and(eq(cycles.siteId, siteId), eq(cycles.status, "approved"), eq(cycles.verdict, "pass"), byCycle))
      .groupBy(cycles.sterilizerId, cycles.testKind),
    db
      .select({ sterilizerId: cycles.sterilizerId, kind: cycles.testKind, at: max(startedOrCreated) })
      .from(cycles)
      .where(and(eq(cycles.siteId, siteId), eq(cycles.status, "failure-confirmed"), eq(cycles.verdict, "fail"), byCycle))
      .groupBy(cycles.sterilizerId, cycles.testKind),
    db
      .select({ sterilizerId: cycles.sterilizerId, kind: cycles.testKind, n: count() })
      .from(cycles)
      .where(and(eq(cycles.siteId, siteId), ne(cycles.status, "approved"), ne(cycles.status, "failure-confirmed"), ne(cycles.status, "returned"), eq(cycles.verdict, "pass"), byCycle))
      .groupBy(cycles.sterilizerId, cycles.testKind),
  ]);
  return { schedules, passes, attempts, cyclePasses, cycleFailures, awaitingSignOff };
}

export type PeriodicTestFilter = { sterilizer?: string; kind?: string; result?: "pass" | "fail"; from?: string; to?: string };

/** One page of the site's recorded tests, newest first. */
export async function listPeriodicTestsOfSite({ siteId, filter, page, pageSize }: { siteId: string; filter: PeriodicTestFilter; page: number; pageSize: number }) {
  const db = getDb();
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
  return { items, total };
}

export async function listSterilizerChoicesOfSite({ siteId }: { siteId: string }) {
  return getDb()
    .select({ id: sterilizers.id, name: sterilizers.name, serialNumber: sterilizers.serialNumber, active: sterilizers.active, chamberVolumeL: sterilizers.chamberVolumeL })
    .from(sterilizers)
    .where(eq(sterilizers.siteId, siteId))
    .orderBy(desc(sterilizers.active), sterilizers.name);
}

export async function insertPeriodicTest({ values, audit }: { values: typeof periodicTests.$inferInsert; audit: Omit<AuditInput, "entityType" | "entityId"> }) {
  return getDb().transaction(async (tx) => {
    const [created] = await tx.insert(periodicTests).values(values).returning();
    await appendAuditEvent(tx, { ...audit, entityType: "periodic-test", entityId: created.id });
    return created;
  });
}

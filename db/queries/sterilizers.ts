import "server-only";
import { and, asc, desc, eq, gte, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { acceptanceProfiles, analyses, cycles, sterilizers, testSchedules, type NewSterilizer, type PeriodicTestKind } from "@/db/schema";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";

type Audit = Omit<AuditInput, "entityType" | "entityId">;
const startedOrCreated = sql`coalesce(${cycles.startedAt}, ${cycles.createdAt})`;

/** The site's sterilizers, in use first, with their default profile's name. */
export async function listSterilizersOfSite({ siteId }: { siteId: string }) {
  return getDb()
    .select({ sterilizer: sterilizers, profileName: acceptanceProfiles.name, profileActive: acceptanceProfiles.active })
    .from(sterilizers)
    .leftJoin(acceptanceProfiles, eq(sterilizers.defaultProfileId, acceptanceProfiles.id))
    .where(eq(sterilizers.siteId, siteId))
    .orderBy(desc(sterilizers.active), asc(sterilizers.name));
}

/**
 * The latest cycle of each of the site's sterilizers (by start, or creation before a file gives the start): one lookup
 * per sterilizer down cycles_sterilizer_at_idx, never a grouping of every cycle.
 */
export async function listLatestCycleOfEachSterilizer({ siteId }: { siteId: string }) {
  const latestId = sql`(select c.id from cycles c where c.sterilizer_id = ${sterilizers.id} and c.site_id = ${siteId} order by coalesce(c.started_at, c.created_at) desc limit 1)`;
  return getDb()
    .select({
      id: cycles.id,
      sterilizerId: cycles.sterilizerId,
      cycleNumber: cycles.cycleNumber,
      verdict: cycles.verdict,
      status: cycles.status,
      startedAt: cycles.startedAt,
      createdAt: cycles.createdAt,
    })
    .from(sterilizers)
    .innerJoin(cycles, eq(cycles.id, latestId))
    .where(eq(sterilizers.siteId, siteId));
}

export async function listRecentCyclesOfSterilizer({ siteId, sterilizerId, limit }: { siteId: string; sterilizerId: string; limit: number }) {
  return getDb()
    .select({
      id: cycles.id,
      cycleNumber: cycles.cycleNumber,
      status: cycles.status,
      verdict: cycles.verdict,
      startedAt: cycles.startedAt,
      testKind: cycles.testKind,
      profileName: acceptanceProfiles.name,
    })
    .from(cycles)
    .innerJoin(acceptanceProfiles, eq(cycles.profileId, acceptanceProfiles.id))
    .where(and(eq(cycles.siteId, siteId), eq(cycles.sterilizerId, sterilizerId)))
    .orderBy(desc(startedOrCreated))
    .limit(limit);
}

/** The current analysis of each of the sterilizer's cycles since `since`, newest first. */
export async function listAnalysedCyclesOfSterilizer({ siteId, sterilizerId, since, limit }: { siteId: string; sterilizerId: string; since: string; limit: number }) {
  return getDb()
    .select({ cycleId: cycles.id, cycleNumber: cycles.cycleNumber, startedAt: cycles.startedAt, createdAt: cycles.createdAt, result: analyses.result })
    .from(cycles)
    .innerJoin(analyses, eq(cycles.currentAnalysisId, analyses.id))
    .where(and(eq(cycles.siteId, siteId), eq(cycles.sterilizerId, sterilizerId), gte(startedOrCreated, since)))
    .orderBy(desc(startedOrCreated))
    .limit(limit);
}

/** The site's sterilizers holding this serial number, compared without case. */
export async function findSterilizersBySerial({ siteId, serialNumber }: { siteId: string; serialNumber: string }) {
  return getDb()
    .select({ id: sterilizers.id, name: sterilizers.name })
    .from(sterilizers)
    .where(and(eq(sterilizers.siteId, siteId), sql`lower(${sterilizers.serialNumber}) = ${serialNumber.toLowerCase()}`));
}

/** A new sterilizer with its first scheduled tests and the audit event, in one transaction. */
export async function insertSterilizer({
  values,
  schedule = [],
  audit,
}: {
  values: NewSterilizer;
  schedule?: Array<{ kind: PeriodicTestKind; intervalDays: number; requiredBeforeUse: boolean }>;
  audit: Audit;
}) {
  return getDb().transaction(async (tx) => {
    const [created] = await tx.insert(sterilizers).values(values).returning();
    if (schedule.length > 0) await tx.insert(testSchedules).values(schedule.map((s) => ({ ...s, sterilizerId: created.id })));
    await appendAuditEvent(tx, { ...audit, entityType: "sterilizer", entityId: created.id });
    return created;
  });
}

export async function updateSterilizerOnSite({ siteId, id, values, audit }: { siteId: string; id: string; values: Partial<NewSterilizer>; audit: Audit }) {
  await getDb().transaction(async (tx) => {
    await tx
      .update(sterilizers)
      .set(values)
      .where(and(eq(sterilizers.id, id), eq(sterilizers.siteId, siteId)));
    await appendAuditEvent(tx, { ...audit, entityType: "sterilizer", entityId: id });
  });
}

// ——— Test schedules (the sterilizer is checked to be on the site before these are called) ———

export async function getSchedule({ sterilizerId, kind }: { sterilizerId: string; kind: PeriodicTestKind }) {
  const [row] = await getDb()
    .select()
    .from(testSchedules)
    .where(and(eq(testSchedules.sterilizerId, sterilizerId), eq(testSchedules.kind, kind)))
    .limit(1);
  return row;
}

/** Sets the interval of one test and whether it is required before use (updating `existingId`, or adding the test) with its audit event. */
export async function saveScheduleRow({
  existingId,
  sterilizerId,
  kind,
  intervalDays,
  requiredBeforeUse,
  audit,
}: {
  existingId?: string;
  sterilizerId: string;
  kind: PeriodicTestKind;
  intervalDays: number;
  requiredBeforeUse: boolean;
  audit: Audit;
}) {
  await getDb().transaction(async (tx) => {
    if (existingId) await tx.update(testSchedules).set({ intervalDays, requiredBeforeUse }).where(eq(testSchedules.id, existingId));
    else await tx.insert(testSchedules).values({ sterilizerId, kind, intervalDays, requiredBeforeUse });
    await appendAuditEvent(tx, { ...audit, entityType: "sterilizer", entityId: sterilizerId });
  });
}

export async function deleteScheduleRow({ id, sterilizerId, audit }: { id: string; sterilizerId: string; audit: Audit }) {
  await getDb().transaction(async (tx) => {
    await tx.delete(testSchedules).where(eq(testSchedules.id, id));
    await appendAuditEvent(tx, { ...audit, entityType: "sterilizer", entityId: sterilizerId });
  });
}

/** Which of the sterilizer's scheduled tests are required before use. */
export async function listRequiredBeforeUse({ sterilizerId }: { sterilizerId: string }) {
  return getDb().select({ kind: testSchedules.kind, requiredBeforeUse: testSchedules.requiredBeforeUse }).from(testSchedules).where(eq(testSchedules.sterilizerId, sterilizerId));
}

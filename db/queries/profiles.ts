import "server-only";
import { and, asc, count, desc, eq } from "drizzle-orm";
import { getDb } from "@/db";
import { acceptanceProfiles, cycles, sterilizers, type NewAcceptanceProfile } from "@/db/schema";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";

type Audit = Omit<AuditInput, "entityType" | "entityId">;

/** The site's profiles (active first), how many cycles each was used for, and which sterilizers default to it. */
export async function listProfilesOfSite({ siteId }: { siteId: string }) {
  const db = getDb();
  const [rows, usage, defaults] = await Promise.all([
    db.select().from(acceptanceProfiles).where(eq(acceptanceProfiles.siteId, siteId)).orderBy(desc(acceptanceProfiles.active), asc(acceptanceProfiles.name), desc(acceptanceProfiles.createdAt)),
    db.select({ profileId: cycles.profileId, n: count() }).from(cycles).where(eq(cycles.siteId, siteId)).groupBy(cycles.profileId),
    db.select({ profileId: sterilizers.defaultProfileId, name: sterilizers.name }).from(sterilizers).where(eq(sterilizers.siteId, siteId)),
  ]);
  return { rows, usage, defaults };
}

export async function countCyclesOfProfile({ siteId, profileId }: { siteId: string; profileId: string }) {
  const [{ n }] = await getDb()
    .select({ n: count() })
    .from(cycles)
    .where(and(eq(cycles.siteId, siteId), eq(cycles.profileId, profileId)));
  return n;
}

export async function listActiveProfileChoices({ siteId }: { siteId: string }) {
  return getDb()
    .select({ id: acceptanceProfiles.id, name: acceptanceProfiles.name })
    .from(acceptanceProfiles)
    .where(and(eq(acceptanceProfiles.siteId, siteId), eq(acceptanceProfiles.active, true)))
    .orderBy(asc(acceptanceProfiles.name));
}

export async function insertProfile({ values, audit }: { values: NewAcceptanceProfile; audit: Audit }) {
  return getDb().transaction(async (tx) => {
    const [created] = await tx.insert(acceptanceProfiles).values(values).returning();
    await appendAuditEvent(tx, { ...audit, entityType: "acceptance-profile", entityId: created.id });
    return created;
  });
}

export async function updateProfileInPlace({ siteId, id, values, audit }: { siteId: string; id: string; values: Partial<NewAcceptanceProfile>; audit: Audit }) {
  await getDb().transaction(async (tx) => {
    await tx
      .update(acceptanceProfiles)
      .set(values)
      .where(and(eq(acceptanceProfiles.id, id), eq(acceptanceProfiles.siteId, siteId)));
    await appendAuditEvent(tx, { ...audit, entityType: "acceptance-profile", entityId: id });
  });
}

/**
 * In one transaction: adds the new version, retires the old one, moves the site's sterilizers
 * that defaulted to it, and audits each of those changes (`reason` on every event).
 */
export async function replaceProfileVersion({
  siteId,
  oldId,
  values,
  oldLimits,
  actor,
  reason,
}: {
  siteId: string;
  oldId: string;
  values: Omit<NewAcceptanceProfile, "siteId">;
  oldLimits: Record<string, unknown>;
  actor: Pick<AuditInput, "actorId" | "actorEmail" | "siteId">;
  reason: string;
}) {
  return getDb().transaction(async (tx) => {
    const [created] = await tx
      .insert(acceptanceProfiles)
      .values({ ...values, siteId })
      .returning();
    await tx
      .update(acceptanceProfiles)
      .set({ active: false })
      .where(and(eq(acceptanceProfiles.id, oldId), eq(acceptanceProfiles.siteId, siteId)));
    const moved = await tx
      .update(sterilizers)
      .set({ defaultProfileId: created.id })
      .where(and(eq(sterilizers.defaultProfileId, oldId), eq(sterilizers.siteId, siteId)))
      .returning({ id: sterilizers.id, name: sterilizers.name });
    await appendAuditEvent(tx, {
      ...actor,
      action: "profile.new-version",
      entityType: "acceptance-profile",
      entityId: created.id,
      oldValue: { id: oldId, ...oldLimits },
      newValue: { id: created.id, supersedes: oldId, ...values, sterilizersMoved: moved.map((m) => m.name) },
      reason,
    });
    await appendAuditEvent(tx, {
      ...actor,
      action: "profile.retire",
      entityType: "acceptance-profile",
      entityId: oldId,
      oldValue: { active: true },
      newValue: { active: false, replacedBy: created.id },
      reason,
    });
    for (const m of moved) {
      await appendAuditEvent(tx, {
        ...actor,
        action: "sterilizer.update",
        entityType: "sterilizer",
        entityId: m.id,
        oldValue: { defaultProfileId: oldId },
        newValue: { defaultProfileId: created.id },
        reason: `Default profile moved to its new version: ${reason}`,
      });
    }
    return { id: created.id, moved: moved.length };
  });
}

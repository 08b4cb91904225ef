import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { getDb } from "@/db";
import { acceptanceProfiles, instruments, sterilizers } from "@/db/schema";
import type { Actor } from "./users";

const siteOf = (actor: Actor) => actor.siteId ?? "";

export async function listSterilizersForSite({ actor }: { actor: Actor }) {
  return getDb()
    .select({
      id: sterilizers.id,
      name: sterilizers.name,
      serialNumber: sterilizers.serialNumber,
      chamberVolumeL: sterilizers.chamberVolumeL,
      location: sterilizers.location,
      defaultProfileId: sterilizers.defaultProfileId,
      active: sterilizers.active,
    })
    .from(sterilizers)
    .where(and(eq(sterilizers.siteId, siteOf(actor)), eq(sterilizers.active, true)))
    .orderBy(asc(sterilizers.name));
}

export async function listProfilesForSite({ actor }: { actor: Actor }) {
  return getDb()
    .select()
    .from(acceptanceProfiles)
    .where(and(eq(acceptanceProfiles.siteId, siteOf(actor)), eq(acceptanceProfiles.active, true)))
    .orderBy(asc(acceptanceProfiles.name));
}

export async function listInstrumentsForSite({ actor }: { actor: Actor }) {
  return getDb()
    .select({ id: instruments.id, name: instruments.name, serialNumber: instruments.serialNumber, kind: instruments.kind, hasSavedMapping: instruments.savedMapping })
    .from(instruments)
    .where(and(eq(instruments.siteId, siteOf(actor)), eq(instruments.active, true)))
    .orderBy(asc(instruments.name))
    .then((rows) => rows.map((r) => ({ ...r, hasSavedMapping: r.hasSavedMapping !== null })));
}

export async function getSterilizerForSite({ actor, id }: { actor: Actor; id: string }) {
  const [row] = await getDb()
    .select()
    .from(sterilizers)
    .where(and(eq(sterilizers.id, id), eq(sterilizers.siteId, siteOf(actor))))
    .limit(1);
  return row;
}

export async function getProfileForSite({ actor, id }: { actor: Actor; id: string }) {
  const [row] = await getDb()
    .select()
    .from(acceptanceProfiles)
    .where(and(eq(acceptanceProfiles.id, id), eq(acceptanceProfiles.siteId, siteOf(actor))))
    .limit(1);
  return row;
}

export async function getInstrumentForSite({ actor, id }: { actor: Actor; id: string }) {
  const [row] = await getDb()
    .select()
    .from(instruments)
    .where(and(eq(instruments.id, id), eq(instruments.siteId, siteOf(actor))))
    .limit(1);
  return row;
}

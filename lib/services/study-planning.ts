import "server-only";
import type { Actor } from "@/db/queries/users";
import { listProfilesForSite } from "@/db/queries/catalog";
import { getSiteById } from "@/db/queries/sites";
import { listLoadingPatternsForSite } from "@/db/queries/study-planning";
import { assertAllowed } from "./access";
import { listSterilizerCatalog } from "./catalog";

/** What a study can be planned on: the site's sterilizers (with their default profile), profiles and loading patterns. */
export async function getStudyPlanningOptions({ actor }: { actor: Actor }) {
  assertAllowed(actor, "study:plan", "plan qualification studies");
  const [sterilizers, profiles, patterns] = await Promise.all([
    listSterilizerCatalog({ actor }),
    listProfilesForSite({ actor }),
    actor.siteId ? listLoadingPatternsForSite({ siteId: actor.siteId }) : Promise.resolve([]),
  ]);
  return {
    sterilizers: sterilizers.map((s) => ({ id: s.id, name: s.name, defaultProfileId: s.defaultProfileId })),
    profiles: profiles.map((p) => ({
      id: p.id,
      name: p.name,
      sterilizationTempC: p.sterilizationTempC,
      holdingTimeS: p.holdingTimeS,
      f0ReferenceC: p.f0ReferenceC,
      f0ZK: p.f0ZK,
      maxSpreadK: p.maxSpreadK,
    })),
    patterns,
  };
}

/** The time zone the actor's site keeps its calendar in (dates on the study pages). */
export async function siteTimeZone({ actor }: { actor: Actor }): Promise<string> {
  const site = actor.siteId ? await getSiteById({ id: actor.siteId }) : undefined;
  return site?.timeZone ?? "UTC";
}

import "server-only";
import type { Actor } from "@/db/queries/users";
import { getSiteById, updateSite } from "@/db/queries/sites";
import { siteAtmosphereKpa } from "@/lib/cycles/analyze-file";
import { AppError } from "@/lib/errors";
import { formatNumber } from "@/lib/format";
import { localDate } from "@/lib/periodic-tests";
import { STANDARD_ATMOSPHERE_KPA, atmosphereAtAltitudeKpa } from "@/lib/steam";
import { altitudeAtmosphereProblem, siteAtmosphereProblem, type SiteSettingsChanges } from "@/lib/validations/site";

/** Every record belongs to a site; an account without one sees and changes nothing. */
export function siteIdOf(actor: Actor, what = "equipment"): string {
  if (!actor.siteId) throw new AppError(403, `Your account is not attached to a site, so it has no ${what}. Ask an administrator.`);
  return actor.siteId;
}

export const auditActor = (actor: Actor) => ({ actorId: actor.id, actorEmail: actor.email, siteId: actor.siteId });

/** The actor's site (undefined without one), its time zone and today's date there. */
export async function getSiteContext({ actor, now = new Date() }: { actor: Actor; now?: Date }) {
  const site = actor.siteId ? await getSiteById({ id: actor.siteId }) : undefined;
  const timeZone = site?.timeZone ?? "UTC";
  return { site, timeZone, today: localDate(now, timeZone) };
}

function atmosphereInUse(site: { atmosphereKpa: number | null; altitudeM: number | null }) {
  try {
    const kpa = siteAtmosphereKpa(site);
    // A value stored before rule 11 may lie outside the physical range: say so rather than use it.
    const problem = siteAtmosphereProblem(kpa);
    if (problem) return { kpa: null, source: `${problem} Correct it here: analyses refuse it.` };
    const source = site.atmosphereKpa
      ? "From the measured pressure entered here"
      : site.altitudeM !== null
        ? `From the altitude of ${formatNumber(site.altitudeM, 0)} m, through the standard atmosphere`
        : "The standard atmosphere at sea level, since neither pressure nor altitude is set";
    return { kpa, source };
  } catch (error) {
    return { kpa: null, source: error instanceof Error ? error.message : "The stored altitude cannot be converted." };
  }
}

/** The administrator's settings page: the actor's own site and the atmospheric pressure analyses use. */
export async function getSiteSettings({ actor }: { actor: Actor }) {
  const site = actor.siteId ? await getSiteById({ id: actor.siteId }) : undefined;
  if (!site) return null;
  return { site, atmosphere: atmosphereInUse(site) };
}

/** Rule 11: an atmosphere outside 50–110 kPa would make gauge readings absolute wrongly; refused with the range named at its field. */
function assertPhysicalAtmosphere(changes: SiteSettingsChanges) {
  const pressureProblem = changes.atmosphereKpa === null ? null : siteAtmosphereProblem(changes.atmosphereKpa);
  if (pressureProblem) throw new AppError(422, pressureProblem, "atmosphereKpa");
  const altitudeProblem = changes.altitudeM === null ? null : altitudeAtmosphereProblem(changes.altitudeM);
  if (altitudeProblem) throw new AppError(422, altitudeProblem, "altitudeM");
}

const SITE_FIELDS = ["name", "timeZone", "atmosphereKpa", "altitudeM", "address"] as const;

/** Changes the actor's own site; the ledger records only the fields that really changed. */
export async function updateSiteSettings({ actor, changes, reason }: { actor: Actor; changes: SiteSettingsChanges; reason: string }) {
  if (!actor.siteId) throw new AppError(409, "Your account is not attached to a site, so there are no site settings to change.");
  const before = await getSiteById({ id: actor.siteId });
  if (!before) throw new AppError(404, "Your site was not found.");
  assertPhysicalAtmosphere(changes);
  const oldValue: Record<string, unknown> = {};
  const newValue: Record<string, unknown> = {};
  for (const key of SITE_FIELDS) {
    if (changes[key] !== before[key]) {
      oldValue[key] = before[key];
      newValue[key] = changes[key];
    }
  }
  const changed = Object.keys(newValue);
  if (changed.length === 0) throw new AppError(400, "Nothing to save: the settings are as they were.");
  await updateSite({ id: before.id, values: newValue, audit: { ...auditActor(actor), action: "site.update", oldValue, newValue, reason } });
  return changed;
}

/** The atmosphere the steam calculator starts from: the site's pressure, else its altitude, else the standard atmosphere. */
export async function getSiteAtmosphere({ actor }: { actor: Actor }) {
  const site = actor.siteId ? await getSiteById({ id: actor.siteId }) : undefined;
  const siteName = site?.name ?? null;
  if (site?.atmosphereKpa != null) return { siteName, atmosphereKpa: site.atmosphereKpa, source: "site" as const, altitudeM: site.altitudeM ?? null };
  if (site?.altitudeM != null) return { siteName, atmosphereKpa: atmosphereAtAltitudeKpa(site.altitudeM), source: "site-altitude" as const, altitudeM: site.altitudeM };
  return { siteName, atmosphereKpa: STANDARD_ATMOSPHERE_KPA, source: "standard" as const, altitudeM: null };
}

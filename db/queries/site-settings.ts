import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db";
import { sites } from "@/db/schema";
import { appendAuditEvent } from "@/db/ledger";
import { AppError } from "@/lib/errors";
import type { SiteSettingsChanges } from "@/lib/validations/site";
import type { Actor } from "./users";

const FIELDS = ["name", "timeZone", "atmosphereKpa", "altitudeM", "address"] as const;

/** Changes the actor's own site; the ledger records only the fields that really changed. */
export async function updateSiteSettings({ actor, changes, reason }: { actor: Actor; changes: SiteSettingsChanges; reason: string }) {
  const siteId = actor.siteId;
  if (!siteId) throw new AppError(409, "Your account is not attached to a site, so there are no site settings to change.");
  return getDb().transaction(async (tx) => {
    const [before] = await tx.select().from(sites).where(eq(sites.id, siteId)).limit(1);
    if (!before) throw new AppError(404, "Your site was not found.");
    const oldValue: Record<string, unknown> = {};
    const newValue: Record<string, unknown> = {};
    for (const key of FIELDS) {
      if (changes[key] !== before[key]) {
        oldValue[key] = before[key];
        newValue[key] = changes[key];
      }
    }
    const changed = Object.keys(newValue);
    if (changed.length === 0) throw new AppError(400, "Nothing to save: the settings are as they were.");
    await tx.update(sites).set(newValue).where(eq(sites.id, siteId));
    await appendAuditEvent(tx, {
      actorId: actor.id,
      actorEmail: actor.email,
      siteId,
      action: "site.update",
      entityType: "site",
      entityId: siteId,
      oldValue,
      newValue,
      reason,
    });
    return changed;
  });
}

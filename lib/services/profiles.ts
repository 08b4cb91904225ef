import "server-only";
import type { AcceptanceProfile } from "@/db/schema";
import type { Actor } from "@/db/queries/users";
import { getLatestAuditEvent } from "@/db/queries/audit";
import { getProfileForSite } from "@/db/queries/catalog";
import { countCyclesOfProfile, insertProfile, listProfilesOfSite, replaceProfileVersion, updateProfileInPlace } from "@/db/queries/profiles";
import { can } from "@/lib/auth/permissions";
import { AppError } from "@/lib/errors";
import { basisShortfalls, PROFILE_FIELDS } from "@/lib/domain";
import type { ProfileInput } from "@/lib/validations/equipment";
import { changedFields } from "./equipment";
import { auditActor, siteIdOf } from "./site";

export async function listProfiles({ actor }: { actor: Actor }) {
  const { rows, usage, defaults } = await listProfilesOfSite({ siteId: siteIdOf(actor) });
  const cyclesBy = new Map(usage.map((u) => [u.profileId, u.n]));
  return rows.map((p) => ({ ...p, cycleCount: cyclesBy.get(p.id) ?? 0, defaultFor: defaults.filter((d) => d.profileId === p.id).map((d) => d.name) }));
}

/** The profiles page: active and retired versions, and whether the actor may add or edit. */
export async function getProfilesPage({ actor }: { actor: Actor }) {
  const rows = await listProfiles({ actor });
  return { active: rows.filter((r) => r.active), retired: rows.filter((r) => !r.active), mayManage: can(actor.role, "equipment:manage") };
}

/** A profile of the actor's site with its use, and for a retired version the one that replaced it. */
export async function getProfile({ actor, id }: { actor: Actor; id: string }) {
  const siteId = siteIdOf(actor);
  const row = await getProfileForSite({ actor, id });
  if (!row) throw new AppError(404, "That acceptance profile was not found on your site.");
  const cycleCount = await countCyclesOfProfile({ siteId, profileId: id });
  let replacedBy: { id: string; name: string } | null = null;
  if (!row.active) {
    const retire = await getLatestAuditEvent({ entityType: "acceptance-profile", entityId: id, action: "profile.retire" });
    const successorId = retire?.newValue ? (JSON.parse(retire.newValue) as { replacedBy?: string }).replacedBy : undefined;
    const next = successorId ? await getProfileForSite({ actor, id: successorId }) : undefined;
    replacedBy = next ? { id: next.id, name: next.name } : null;
  }
  return { ...row, cycleCount, replacedBy };
}

export async function getProfilePage({ actor, id }: { actor: Actor; id: string }) {
  return { profile: await getProfile({ actor, id }), mayManage: can(actor.role, "equipment:manage") };
}

const profileValues = (p: AcceptanceProfile) => Object.fromEntries(PROFILE_FIELDS.map((k) => [k, p[k]]));

/** Refuses limits weaker than the standard the profile names (the form shows the same sentence beside the field). */
function assertMeetsBasis(input: ProfileInput) {
  const [first] = basisShortfalls(input);
  if (first) throw new AppError(422, first.message, first.field);
}

export async function createProfile({ actor, input }: { actor: Actor; input: ProfileInput }) {
  const siteId = siteIdOf(actor);
  assertMeetsBasis(input);
  return insertProfile({ values: { ...input, siteId }, audit: { ...auditActor(actor), action: "profile.create", newValue: input } });
}

/**
 * A profile that cycles were analysed against is never changed in place: those analyses must
 * keep pointing at the limits they used. The change becomes a new version; the old one is
 * retired and sterilizers that used it as their default move to the new version.
 */
export async function updateProfile({ actor, id, input, reason }: { actor: Actor; id: string; input: ProfileInput; reason: string }) {
  assertMeetsBasis(input);
  const before = await getProfile({ actor, id });
  if (!before.active) throw new AppError(409, "This profile version has been retired; edit its current version instead.");
  const { oldValue, newValue, changed } = changedFields(profileValues(before), input);
  if (!changed) return { mode: "unchanged" as const, id };
  if (before.cycleCount === 0) {
    await updateProfileInPlace({ siteId: before.siteId, id, values: input, audit: { ...auditActor(actor), action: "profile.update", oldValue, newValue, reason } });
    return { mode: "in-place" as const, id };
  }
  const created = await replaceProfileVersion({ siteId: before.siteId, oldId: id, values: input, oldLimits: profileValues(before), actor: auditActor(actor), reason });
  return { mode: "new-version" as const, ...created };
}

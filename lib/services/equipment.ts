import "server-only";
import type { PeriodicTestKind, Sterilizer } from "@/db/schema";
import type { Actor } from "@/db/queries/users";
import { getProfileForSite, getSterilizerForSite } from "@/db/queries/catalog";
import { listActiveProfileChoices } from "@/db/queries/profiles";
import {
  deleteScheduleRow,
  findSterilizersBySerial,
  getSchedule,
  insertSterilizer,
  listAnalysedCyclesOfSterilizer,
  listLatestCycleOfEachSterilizer,
  listRecentCyclesOfSterilizer,
  listRequiredBeforeUse,
  listSterilizersOfSite,
  saveScheduleRow,
  updateSterilizerOnSite,
} from "@/db/queries/sterilizers";
import { thermometricOf, type CycleAnalysis } from "@/lib/analysis/types";
import { can } from "@/lib/auth/permissions";
import { AppError } from "@/lib/errors";
import { defaultScheduleFor, sizeClassOf, trendsFromAnalyses } from "@/lib/periodic-tests";
import type { SterilizerInput } from "@/lib/validations/equipment";
import { getScheduleOverview } from "./periodic-tests";
import { auditActor, getSiteContext, siteIdOf } from "./site";
import { currentSterilizerStatuses, listSterilizerStatusHistory, refreshSterilizerStatus } from "./sterilizer-status";
import { getRequalificationOverview } from "./requalification";

const DAY_MS = 86_400_000;

/** Only the fields that changed, as { old, new } halves for the ledger. */
export function changedFields<T extends Record<string, unknown>>(before: T, after: Partial<T>) {
  const oldValue: Record<string, unknown> = {};
  const newValue: Record<string, unknown> = {};
  for (const key of Object.keys(after) as Array<keyof T & string>) {
    if (after[key] !== undefined && after[key] !== before[key]) {
      oldValue[key] = before[key];
      newValue[key] = after[key];
    }
  }
  return { oldValue, newValue, changed: Object.keys(newValue).length > 0 };
}

// ——— Sterilizers ———

export async function listSterilizers({ actor }: { actor: Actor }) {
  const siteId = siteIdOf(actor);
  const [rows, lastCycles, overview, statuses] = await Promise.all([
    listSterilizersOfSite({ siteId }),
    listLatestCycleOfEachSterilizer({ siteId }),
    getScheduleOverview({ actor }),
    currentSterilizerStatuses({ siteId }),
  ]);
  const lastBySterilizer = new Map(lastCycles.map((c) => [c.sterilizerId, c]));
  return rows.map(({ sterilizer, profileName, profileActive }) => {
    const schedule = overview.rows.filter((r) => r.sterilizerId === sterilizer.id);
    // A retired sterilizer is not judged any more; it keeps its last stored status.
    const now = statuses.get(sterilizer.id);
    return {
      ...sterilizer,
      ...(now ? { status: now.status, statusReason: now.statusReason, statusSince: now.statusSince } : {}),
      sizeClass: sizeClassOf(sterilizer.chamberVolumeL),
      defaultProfile: sterilizer.defaultProfileId ? { id: sterilizer.defaultProfileId, name: profileName ?? "—", active: !!profileActive } : null,
      lastCycle: lastBySterilizer.get(sterilizer.id) ?? null,
      testsNeedingAction: schedule.filter((r) => r.needsAction),
      scheduledTests: schedule.length,
    };
  });
}

/** A sterilizer of the actor's site; any other is "not found" (404). */
async function getSterilizer({ actor, id }: { actor: Actor; id: string }): Promise<Sterilizer> {
  siteIdOf(actor);
  const row = await getSterilizerForSite({ actor, id });
  if (!row) throw new AppError(404, "That sterilizer was not found on your site.");
  return row;
}

async function getSterilizerDetail({ actor, id, trendDays = 90 }: { actor: Actor; id: string; trendDays?: number }) {
  const sterilizer = await getSterilizer({ actor, id });
  const siteId = sterilizer.siteId;
  const since = new Date(Date.now() - trendDays * DAY_MS).toISOString();
  const [profile, recentCycles, analysed, overview, statuses, statusHistory, required] = await Promise.all([
    sterilizer.defaultProfileId ? getProfileForSite({ actor, id: sterilizer.defaultProfileId }).then((p) => p ?? null) : Promise.resolve(null),
    listRecentCyclesOfSterilizer({ siteId, sterilizerId: id, limit: 15 }),
    listAnalysedCyclesOfSterilizer({ siteId, sterilizerId: id, since, limit: 500 }),
    getScheduleOverview({ actor, sterilizerId: id }),
    currentSterilizerStatuses({ siteId }),
    listSterilizerStatusHistory({ actor, sterilizerId: id }),
    listRequiredBeforeUse({ sterilizerId: id }),
  ]);
  const requiredKinds = new Set(required.filter((r) => r.requiredBeforeUse).map((r) => r.kind));
  const status = statuses.get(id) ?? { status: sterilizer.status, statusReason: sterilizer.statusReason, statusSince: sterilizer.statusSince };
  // Trends follow the thermometric figures; air leakage tests have none of them.
  const trends = trendsFromAnalyses(analysed.flatMap((a) => (thermometricOf(a.result as CycleAnalysis) ? [{ ...a, result: thermometricOf(a.result as CycleAnalysis)! }] : [])));
  return {
    sterilizer: { ...sterilizer, status: status.status, statusReason: status.statusReason, statusSince: status.statusSince },
    sizeClass: sizeClassOf(sterilizer.chamberVolumeL),
    profile,
    recentCycles,
    trends,
    trendDays,
    schedule: overview.rows.map((r) => ({ ...r, requiredBeforeUse: requiredKinds.has(r.kind) })),
    statusHistory,
    timeZone: overview.timeZone,
  };
}

/** The sterilizers page: the list, the site's time zone, and the profiles to choose from when the actor may manage. */
export async function getSterilizersPage({ actor }: { actor: Actor }) {
  const mayManage = can(actor.role, "equipment:manage");
  const [rows, profiles, { timeZone }] = await Promise.all([
    listSterilizers({ actor }),
    mayManage ? listActiveProfileChoices({ siteId: siteIdOf(actor) }) : Promise.resolve([]),
    getSiteContext({ actor }),
  ]);
  return { rows, profiles, timeZone, mayManage };
}

export async function getSterilizerPage({ actor, id }: { actor: Actor; id: string }) {
  const mayManage = can(actor.role, "equipment:manage");
  const [detail, profiles] = await Promise.all([getSterilizerDetail({ actor, id }), mayManage ? listActiveProfileChoices({ siteId: siteIdOf(actor) }) : Promise.resolve([])]);
  // Loading patterns and their requalification (issue 14 §7), once the sterilizer is known to be on the actor's site.
  const { patterns } = await getRequalificationOverview({ actor, sterilizerId: id });
  return { ...detail, profiles, mayManage, mayRecord: can(actor.role, "periodic-test:record"), patterns, mayDecideRequalification: can(actor.role, "study:plan") };
}

async function checkProfileOnSite(actor: Actor, profileId: string | null) {
  if (!profileId) return;
  const p = await getProfileForSite({ actor, id: profileId });
  if (!p) throw new AppError(422, "That acceptance profile does not exist on your site.", "defaultProfileId");
  if (!p.active) throw new AppError(422, "That acceptance profile has been replaced by a newer version; choose an active one.", "defaultProfileId");
}

async function checkSerialFree(siteId: string, serialNumber: string, exceptId?: string) {
  const clash = (await findSterilizersBySerial({ siteId, serialNumber })).find((r) => r.id !== exceptId);
  if (clash) throw new AppError(409, `The serial number ${serialNumber} already belongs to “${clash.name}”.`, "serialNumber");
}

/** A new sterilizer; one that removes air by vacuum starts with its daily and weekly tests required before use. */
export async function createSterilizer({ actor, input: { vacuumAirRemoval = false, ...input } }: { actor: Actor; input: SterilizerInput & { vacuumAirRemoval?: boolean } }) {
  const siteId = siteIdOf(actor);
  await checkProfileOnSite(actor, input.defaultProfileId);
  await checkSerialFree(siteId, input.serialNumber);
  const schedule = defaultScheduleFor({ vacuumAirRemoval, chamberVolumeL: input.chamberVolumeL });
  const created = await insertSterilizer({ values: { ...input, siteId }, schedule, audit: { ...auditActor(actor), action: "sterilizer.create", newValue: { ...input, vacuumAirRemoval, schedule } } });
  await refreshSterilizerStatus({ sterilizerId: created.id, actor, cause: "sterilizer added" });
  return created;
}

export async function updateSterilizer({ actor, id, input, active, reason }: { actor: Actor; id: string; input: SterilizerInput; active: boolean; reason: string }) {
  const before = await getSterilizer({ actor, id });
  if (input.defaultProfileId !== before.defaultProfileId) await checkProfileOnSite(actor, input.defaultProfileId);
  await checkSerialFree(before.siteId, input.serialNumber, id);
  const { oldValue, newValue, changed } = changedFields(before as Record<string, unknown>, { ...input, active });
  if (!changed) return { changed: false };
  await updateSterilizerOnSite({ siteId: before.siteId, id, values: { ...input, active }, audit: { ...auditActor(actor), action: "sterilizer.update", oldValue, newValue, reason } });
  return { changed: true };
}

// ——— Test schedules ———

type ScheduleInput = { actor: Actor; sterilizerId: string; kind: PeriodicTestKind; intervalDays: number; requiredBeforeUse?: boolean; reason: string | null };

/** Adds a test to the schedule or changes its interval or whether it is required before use; the status follows. */
export async function saveSchedule({ actor, sterilizerId, kind, intervalDays, reason, ...input }: ScheduleInput) {
  await getSterilizer({ actor, id: sterilizerId });
  const existing = await getSchedule({ sterilizerId, kind });
  const requiredBeforeUse = input.requiredBeforeUse ?? existing?.requiredBeforeUse ?? false;
  if (existing && existing.intervalDays === intervalDays && existing.requiredBeforeUse === requiredBeforeUse) return { changed: false };
  if (existing && !reason) throw new AppError(422, "Give a reason for changing this test's schedule; it goes into the audit ledger.", "reason");
  await saveScheduleRow({
    existingId: existing?.id,
    sterilizerId,
    kind,
    intervalDays,
    requiredBeforeUse,
    audit: {
      ...auditActor(actor),
      action: existing ? "schedule.update" : "schedule.create",
      oldValue: existing ? { kind, intervalDays: existing.intervalDays, requiredBeforeUse: existing.requiredBeforeUse } : null,
      newValue: { kind, intervalDays, requiredBeforeUse },
      reason,
    },
  });
  await refreshSterilizerStatus({ sterilizerId, actor, cause: "test schedule changed" });
  return { changed: true };
}

export async function removeSchedule({ actor, sterilizerId, kind, reason }: { actor: Actor; sterilizerId: string; kind: PeriodicTestKind; reason: string }) {
  await getSterilizer({ actor, id: sterilizerId });
  const existing = await getSchedule({ sterilizerId, kind });
  if (!existing) throw new AppError(404, "That test is not on this sterilizer's schedule.");
  await deleteScheduleRow({
    id: existing.id,
    sterilizerId,
    audit: { ...auditActor(actor), action: "schedule.remove", oldValue: { kind, intervalDays: existing.intervalDays, requiredBeforeUse: existing.requiredBeforeUse }, newValue: null, reason },
  });
  await refreshSterilizerStatus({ sterilizerId, actor, cause: "test taken off the schedule" });
}

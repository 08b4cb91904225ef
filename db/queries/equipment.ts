import "server-only";
import { and, asc, count, desc, eq, gte, inArray, sql } from "drizzle-orm";
import { getDb } from "@/db";
import {
  acceptanceProfiles,
  analyses,
  auditEvents,
  calibrationCertificates,
  cycles,
  instruments,
  sites,
  sterilizers,
  testSchedules,
  type AcceptanceProfile,
  type Instrument,
  type PeriodicTestKind,
  type Sterilizer,
} from "@/db/schema";
import { appendAuditEvent } from "@/db/ledger";
import type { Actor } from "./users";
import { AppError } from "@/lib/errors";
import type { AnalysisResult } from "@/lib/analysis/types";
import { calibrationState, latestCertificate, localDate, sizeClassOf, trendsFromAnalyses } from "@/lib/periodic-tests";
import type { ProfileInput, SterilizerInput } from "@/lib/validations/equipment";
import { getScheduleOverview } from "./periodic-tests";

const DAY_MS = 86_400_000;

/** Every equipment record belongs to a site; an account without one sees and changes nothing. */
export function siteOf(actor: Actor): string {
  if (!actor.siteId) throw new AppError(403, "Your account is not attached to a site, so it has no equipment. Ask an administrator.");
  return actor.siteId;
}

const audit = (actor: Actor) => ({ actorId: actor.id, actorEmail: actor.email, siteId: actor.siteId });

/** Only the fields that changed, as { old, new } halves for the ledger. */
function diff<T extends Record<string, unknown>>(before: T, after: Partial<T>) {
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

export async function getSiteContext({ actor }: { actor: Actor }) {
  const [site] = await getDb().select().from(sites).where(eq(sites.id, siteOf(actor))).limit(1);
  const timeZone = site?.timeZone ?? "UTC";
  return { site, timeZone, today: localDate(new Date(), timeZone) };
}

// ——— Sterilizers ———

export async function listSterilizers({ actor }: { actor: Actor }) {
  const siteId = siteOf(actor);
  const db = getDb();
  const latest = db
    .select({ sterilizerId: cycles.sterilizerId, startedAt: sql<string>`max(coalesce(${cycles.startedAt}, ${cycles.createdAt}))`.as("latest_started") })
    .from(cycles)
    .where(eq(cycles.siteId, siteId))
    .groupBy(cycles.sterilizerId)
    .as("latest");
  const [rows, lastCycles, overview] = await Promise.all([
    db
      .select({ sterilizer: sterilizers, profileName: acceptanceProfiles.name, profileActive: acceptanceProfiles.active })
      .from(sterilizers)
      .leftJoin(acceptanceProfiles, eq(sterilizers.defaultProfileId, acceptanceProfiles.id))
      .where(eq(sterilizers.siteId, siteId))
      .orderBy(desc(sterilizers.active), asc(sterilizers.name)),
    db
      .select({ id: cycles.id, sterilizerId: cycles.sterilizerId, cycleNumber: cycles.cycleNumber, verdict: cycles.verdict, status: cycles.status, startedAt: cycles.startedAt, createdAt: cycles.createdAt })
      .from(cycles)
      .innerJoin(latest, and(eq(latest.sterilizerId, cycles.sterilizerId), eq(sql`coalesce(${cycles.startedAt}, ${cycles.createdAt})`, latest.startedAt)))
      .where(eq(cycles.siteId, siteId)),
    getScheduleOverview({ actor }),
  ]);
  const lastBySterilizer = new Map(lastCycles.map((c) => [c.sterilizerId, c]));
  return rows.map(({ sterilizer, profileName, profileActive }) => {
    const schedule = overview.rows.filter((r) => r.sterilizerId === sterilizer.id);
    return {
      ...sterilizer,
      sizeClass: sizeClassOf(sterilizer.chamberVolumeL),
      defaultProfile: sterilizer.defaultProfileId ? { id: sterilizer.defaultProfileId, name: profileName ?? "—", active: !!profileActive } : null,
      lastCycle: lastBySterilizer.get(sterilizer.id) ?? null,
      testsNeedingAction: schedule.filter((r) => r.needsAction),
      scheduledTests: schedule.length,
    };
  });
}

export async function getSterilizer({ actor, id }: { actor: Actor; id: string }): Promise<Sterilizer> {
  const [row] = await getDb().select().from(sterilizers).where(and(eq(sterilizers.id, id), eq(sterilizers.siteId, siteOf(actor)))).limit(1);
  if (!row) throw new AppError(404, "That sterilizer was not found on your site.");
  return row;
}

export async function getSterilizerDetail({ actor, id, trendDays = 90 }: { actor: Actor; id: string; trendDays?: number }) {
  const sterilizer = await getSterilizer({ actor, id });
  const db = getDb();
  const since = new Date(Date.now() - trendDays * DAY_MS).toISOString();
  const [profile, recent, analysed, overview] = await Promise.all([
    sterilizer.defaultProfileId
      ? db.select().from(acceptanceProfiles).where(eq(acceptanceProfiles.id, sterilizer.defaultProfileId)).limit(1).then((r) => r[0] ?? null)
      : Promise.resolve(null),
    db
      .select({ id: cycles.id, cycleNumber: cycles.cycleNumber, status: cycles.status, verdict: cycles.verdict, startedAt: cycles.startedAt, testKind: cycles.testKind, profileName: acceptanceProfiles.name })
      .from(cycles)
      .innerJoin(acceptanceProfiles, eq(cycles.profileId, acceptanceProfiles.id))
      .where(eq(cycles.sterilizerId, id))
      .orderBy(desc(sql`coalesce(${cycles.startedAt}, ${cycles.createdAt})`))
      .limit(15),
    db
      .select({ cycleId: cycles.id, cycleNumber: cycles.cycleNumber, startedAt: cycles.startedAt, createdAt: cycles.createdAt, result: analyses.result })
      .from(cycles)
      .innerJoin(analyses, eq(cycles.currentAnalysisId, analyses.id))
      .where(and(eq(cycles.sterilizerId, id), gte(sql`coalesce(${cycles.startedAt}, ${cycles.createdAt})`, since)))
      .orderBy(desc(sql`coalesce(${cycles.startedAt}, ${cycles.createdAt})`))
      .limit(500),
    getScheduleOverview({ actor, sterilizerId: id }),
  ]);
  const trends = trendsFromAnalyses(analysed.map((a) => ({ ...a, result: a.result as AnalysisResult })));
  return { sterilizer, sizeClass: sizeClassOf(sterilizer.chamberVolumeL), profile, recentCycles: recent, trends, trendDays, schedule: overview.rows, timeZone: overview.timeZone };
}

async function checkProfileOnSite(siteId: string, profileId: string | null) {
  if (!profileId) return;
  const [p] = await getDb()
    .select({ id: acceptanceProfiles.id, active: acceptanceProfiles.active })
    .from(acceptanceProfiles)
    .where(and(eq(acceptanceProfiles.id, profileId), eq(acceptanceProfiles.siteId, siteId)))
    .limit(1);
  if (!p) throw new AppError(422, "That acceptance profile does not exist on your site.", "defaultProfileId");
  if (!p.active) throw new AppError(422, "That acceptance profile has been replaced by a newer version; choose an active one.", "defaultProfileId");
}

async function checkSerialFree(siteId: string, serialNumber: string, exceptId?: string) {
  const rows = await getDb()
    .select({ id: sterilizers.id, name: sterilizers.name })
    .from(sterilizers)
    .where(and(eq(sterilizers.siteId, siteId), sql`lower(${sterilizers.serialNumber}) = ${serialNumber.toLowerCase()}`));
  const clash = rows.find((r) => r.id !== exceptId);
  if (clash) throw new AppError(409, `The serial number ${serialNumber} already belongs to “${clash.name}”.`, "serialNumber");
}

export async function createSterilizer({ actor, input }: { actor: Actor; input: SterilizerInput }) {
  const siteId = siteOf(actor);
  await checkProfileOnSite(siteId, input.defaultProfileId);
  await checkSerialFree(siteId, input.serialNumber);
  return getDb().transaction(async (tx) => {
    const [created] = await tx.insert(sterilizers).values({ ...input, siteId }).returning();
    await appendAuditEvent(tx, { ...audit(actor), action: "sterilizer.create", entityType: "sterilizer", entityId: created.id, newValue: input });
    return created;
  });
}

export async function updateSterilizer({ actor, id, input, active, reason }: { actor: Actor; id: string; input: SterilizerInput; active: boolean; reason: string }) {
  const siteId = siteOf(actor);
  const before = await getSterilizer({ actor, id });
  if (input.defaultProfileId !== before.defaultProfileId) await checkProfileOnSite(siteId, input.defaultProfileId);
  await checkSerialFree(siteId, input.serialNumber, id);
  const { oldValue, newValue, changed } = diff(before as Record<string, unknown>, { ...input, active });
  if (!changed) return { changed: false };
  await getDb().transaction(async (tx) => {
    await tx.update(sterilizers).set({ ...input, active }).where(eq(sterilizers.id, id));
    await appendAuditEvent(tx, { ...audit(actor), action: "sterilizer.update", entityType: "sterilizer", entityId: id, oldValue, newValue, reason });
  });
  return { changed: true };
}

export async function saveSchedule({ actor, sterilizerId, kind, intervalDays, reason }: { actor: Actor; sterilizerId: string; kind: PeriodicTestKind; intervalDays: number; reason: string | null }) {
  await getSterilizer({ actor, id: sterilizerId });
  const db = getDb();
  const [existing] = await db.select().from(testSchedules).where(and(eq(testSchedules.sterilizerId, sterilizerId), eq(testSchedules.kind, kind))).limit(1);
  if (existing && existing.intervalDays === intervalDays) return { changed: false };
  if (existing && !reason) throw new AppError(422, "Give a reason for changing the interval; it goes into the audit ledger.", "reason");
  await db.transaction(async (tx) => {
    if (existing) {
      await tx.update(testSchedules).set({ intervalDays }).where(eq(testSchedules.id, existing.id));
    } else {
      await tx.insert(testSchedules).values({ sterilizerId, kind, intervalDays });
    }
    await appendAuditEvent(tx, {
      ...audit(actor),
      action: existing ? "schedule.update" : "schedule.create",
      entityType: "sterilizer",
      entityId: sterilizerId,
      oldValue: existing ? { kind, intervalDays: existing.intervalDays } : null,
      newValue: { kind, intervalDays },
      reason,
    });
  });
  return { changed: true };
}

export async function removeSchedule({ actor, sterilizerId, kind, reason }: { actor: Actor; sterilizerId: string; kind: PeriodicTestKind; reason: string }) {
  await getSterilizer({ actor, id: sterilizerId });
  const db = getDb();
  const [existing] = await db.select().from(testSchedules).where(and(eq(testSchedules.sterilizerId, sterilizerId), eq(testSchedules.kind, kind))).limit(1);
  if (!existing) throw new AppError(404, "That test is not on this sterilizer's schedule.");
  await db.transaction(async (tx) => {
    await tx.delete(testSchedules).where(eq(testSchedules.id, existing.id));
    await appendAuditEvent(tx, { ...audit(actor), action: "schedule.remove", entityType: "sterilizer", entityId: sterilizerId, oldValue: { kind, intervalDays: existing.intervalDays }, newValue: null, reason });
  });
}

// ——— Acceptance profiles ———

export async function listProfiles({ actor }: { actor: Actor }) {
  const siteId = siteOf(actor);
  const db = getDb();
  const [rows, usage, defaults] = await Promise.all([
    db.select().from(acceptanceProfiles).where(eq(acceptanceProfiles.siteId, siteId)).orderBy(desc(acceptanceProfiles.active), asc(acceptanceProfiles.name), desc(acceptanceProfiles.createdAt)),
    db.select({ profileId: cycles.profileId, n: count() }).from(cycles).where(eq(cycles.siteId, siteId)).groupBy(cycles.profileId),
    db.select({ profileId: sterilizers.defaultProfileId, name: sterilizers.name }).from(sterilizers).where(eq(sterilizers.siteId, siteId)),
  ]);
  const cyclesBy = new Map(usage.map((u) => [u.profileId, u.n]));
  return rows.map((p) => ({ ...p, cycleCount: cyclesBy.get(p.id) ?? 0, defaultFor: defaults.filter((d) => d.profileId === p.id).map((d) => d.name) }));
}

export async function getProfile({ actor, id }: { actor: Actor; id: string }) {
  const [row] = await getDb().select().from(acceptanceProfiles).where(and(eq(acceptanceProfiles.id, id), eq(acceptanceProfiles.siteId, siteOf(actor)))).limit(1);
  if (!row) throw new AppError(404, "That acceptance profile was not found on your site.");
  const [{ n }] = await getDb().select({ n: count() }).from(cycles).where(eq(cycles.profileId, id));
  let replacedBy: { id: string; name: string } | null = null;
  if (!row.active) {
    const [retire] = await getDb()
      .select({ newValue: auditEvents.newValue })
      .from(auditEvents)
      .where(and(eq(auditEvents.entityType, "acceptance-profile"), eq(auditEvents.entityId, id), eq(auditEvents.action, "profile.retire")))
      .orderBy(desc(auditEvents.seq))
      .limit(1);
    const successorId = retire?.newValue ? (JSON.parse(retire.newValue) as { replacedBy?: string }).replacedBy : undefined;
    if (successorId) {
      const [next] = await getDb().select({ id: acceptanceProfiles.id, name: acceptanceProfiles.name }).from(acceptanceProfiles).where(eq(acceptanceProfiles.id, successorId)).limit(1);
      replacedBy = next ?? null;
    }
  }
  return { ...row, cycleCount: n, replacedBy };
}

const PROFILE_LIMIT_KEYS = ["name", "sterilizationTempC", "bandK", "holdingTimeS", "maxEquilibrationS", "maxSpreadK", "saturationLimitK", "f0ReferenceC", "f0ZK", "basis"] as const;
const profileValues = (p: AcceptanceProfile) => Object.fromEntries(PROFILE_LIMIT_KEYS.map((k) => [k, p[k]]));

export async function createProfile({ actor, input }: { actor: Actor; input: ProfileInput }) {
  const siteId = siteOf(actor);
  return getDb().transaction(async (tx) => {
    const [created] = await tx.insert(acceptanceProfiles).values({ ...input, siteId }).returning();
    await appendAuditEvent(tx, { ...audit(actor), action: "profile.create", entityType: "acceptance-profile", entityId: created.id, newValue: input });
    return created;
  });
}

/**
 * A profile that cycles were analysed against is never changed in place: those analyses must
 * keep pointing at the limits they used. The change becomes a new version; the old one is
 * retired and sterilizers that used it as their default move to the new version.
 */
export async function updateProfile({ actor, id, input, reason }: { actor: Actor; id: string; input: ProfileInput; reason: string }) {
  const before = await getProfile({ actor, id });
  if (!before.active) throw new AppError(409, "This profile version has been retired; edit its current version instead.");
  const { oldValue, newValue, changed } = diff(profileValues(before), input);
  if (!changed) return { mode: "unchanged" as const, id };
  if (before.cycleCount === 0) {
    await getDb().transaction(async (tx) => {
      await tx.update(acceptanceProfiles).set(input).where(eq(acceptanceProfiles.id, id));
      await appendAuditEvent(tx, { ...audit(actor), action: "profile.update", entityType: "acceptance-profile", entityId: id, oldValue, newValue, reason });
    });
    return { mode: "in-place" as const, id };
  }
  return getDb().transaction(async (tx) => {
    const [created] = await tx.insert(acceptanceProfiles).values({ ...input, siteId: before.siteId }).returning();
    await tx.update(acceptanceProfiles).set({ active: false }).where(eq(acceptanceProfiles.id, id));
    const moved = await tx.update(sterilizers).set({ defaultProfileId: created.id }).where(eq(sterilizers.defaultProfileId, id)).returning({ id: sterilizers.id, name: sterilizers.name });
    await appendAuditEvent(tx, {
      ...audit(actor),
      action: "profile.new-version",
      entityType: "acceptance-profile",
      entityId: created.id,
      oldValue: { id, ...profileValues(before) },
      newValue: { id: created.id, supersedes: id, ...input, sterilizersMoved: moved.map((m) => m.name) },
      reason,
    });
    await appendAuditEvent(tx, { ...audit(actor), action: "profile.retire", entityType: "acceptance-profile", entityId: id, oldValue: { active: true }, newValue: { active: false, replacedBy: created.id }, reason });
    for (const m of moved) {
      await appendAuditEvent(tx, { ...audit(actor), action: "sterilizer.update", entityType: "sterilizer", entityId: m.id, oldValue: { defaultProfileId: id }, newValue: { defaultProfileId: created.id }, reason: `Default profile moved to its new version: ${reason}` });
    }
    return { mode: "new-version" as const, id: created.id, moved: moved.length };
  });
}

// ——— Instruments and calibration ———

export async function listInstruments({ actor }: { actor: Actor }) {
  const siteId = siteOf(actor);
  const db = getDb();
  const [rows, { today }] = await Promise.all([db.select().from(instruments).where(eq(instruments.siteId, siteId)).orderBy(desc(instruments.active), asc(instruments.name)), getSiteContext({ actor })]);
  const certs = rows.length
    ? await db.select().from(calibrationCertificates).where(inArray(calibrationCertificates.instrumentId, rows.map((r) => r.id)))
    : [];
  return rows.map((i) => {
    const latest = latestCertificate(certs.filter((c) => c.instrumentId === i.id));
    return { ...withoutMapping(i), latestCertificate: latest, calibration: calibrationState(latest?.dueOn, today) };
  });
}

function withoutMapping(i: Instrument) {
  const { savedMapping, ...rest } = i;
  return { ...rest, hasSavedMapping: savedMapping !== null && savedMapping !== undefined };
}

export async function getInstrumentDetail({ actor, id }: { actor: Actor; id: string }) {
  const siteId = siteOf(actor);
  const db = getDb();
  const [row] = await db.select().from(instruments).where(and(eq(instruments.id, id), eq(instruments.siteId, siteId))).limit(1);
  if (!row) throw new AppError(404, "That instrument was not found on your site.");
  const [certs, recent, { today, timeZone }] = await Promise.all([
    db.select().from(calibrationCertificates).where(eq(calibrationCertificates.instrumentId, id)).orderBy(desc(calibrationCertificates.calibratedOn), desc(calibrationCertificates.createdAt)),
    db
      .select({ id: cycles.id, cycleNumber: cycles.cycleNumber, verdict: cycles.verdict, status: cycles.status, startedAt: cycles.startedAt, sterilizerName: sterilizers.name })
      .from(cycles)
      .innerJoin(sterilizers, eq(cycles.sterilizerId, sterilizers.id))
      .where(eq(cycles.instrumentId, id))
      .orderBy(desc(cycles.startedAt))
      .limit(8),
    getSiteContext({ actor }),
  ]);
  const latest = latestCertificate(certs);
  return { instrument: { ...withoutMapping(row), savedMapping: row.savedMapping }, certificates: certs, latest, calibration: calibrationState(latest?.dueOn, today), recentCycles: recent, today, timeZone };
}

async function getInstrumentRow(actor: Actor, id: string) {
  const [row] = await getDb().select().from(instruments).where(and(eq(instruments.id, id), eq(instruments.siteId, siteOf(actor)))).limit(1);
  if (!row) throw new AppError(404, "That instrument was not found on your site.");
  return row;
}

export async function createInstrument({ actor, input }: { actor: Actor; input: { name: string; serialNumber: string; kind: Instrument["kind"]; channelCount: number | null } }) {
  const siteId = siteOf(actor);
  const [clash] = await getDb()
    .select({ name: instruments.name })
    .from(instruments)
    .where(and(eq(instruments.siteId, siteId), sql`lower(${instruments.serialNumber}) = ${input.serialNumber.toLowerCase()}`))
    .limit(1);
  if (clash) throw new AppError(409, `The serial number ${input.serialNumber} already belongs to “${clash.name}”.`, "serialNumber");
  return getDb().transaction(async (tx) => {
    const [created] = await tx.insert(instruments).values({ ...input, siteId }).returning();
    await appendAuditEvent(tx, { ...audit(actor), action: "instrument.create", entityType: "instrument", entityId: created.id, newValue: input });
    return created;
  });
}

export async function addCalibrationCertificate({
  actor,
  input,
}: {
  actor: Actor;
  input: { instrumentId: string; certificateNumber: string; issuedBy: string; calibratedOn: string; dueOn: string; uncertaintyK: number | null; notes: string | null };
}) {
  const instrument = await getInstrumentRow(actor, input.instrumentId);
  const [dup] = await getDb()
    .select({ id: calibrationCertificates.id })
    .from(calibrationCertificates)
    .where(and(eq(calibrationCertificates.instrumentId, instrument.id), eq(calibrationCertificates.certificateNumber, input.certificateNumber)))
    .limit(1);
  if (dup) throw new AppError(409, `Certificate ${input.certificateNumber} is already recorded for this instrument.`, "certificateNumber");
  return getDb().transaction(async (tx) => {
    const [created] = await tx.insert(calibrationCertificates).values(input).returning();
    await appendAuditEvent(tx, { ...audit(actor), action: "calibration.add", entityType: "instrument", entityId: instrument.id, newValue: { ...input, certificateId: created.id } });
    return created;
  });
}

export async function clearSavedMapping({ actor, instrumentId, reason }: { actor: Actor; instrumentId: string; reason: string }) {
  const instrument = await getInstrumentRow(actor, instrumentId);
  if (instrument.savedMapping === null || instrument.savedMapping === undefined) throw new AppError(409, "This instrument has no saved channel mapping.");
  await getDb().transaction(async (tx) => {
    await tx.update(instruments).set({ savedMapping: null }).where(eq(instruments.id, instrumentId));
    await appendAuditEvent(tx, { ...audit(actor), action: "instrument.mapping-cleared", entityType: "instrument", entityId: instrumentId, oldValue: { savedMapping: instrument.savedMapping }, newValue: { savedMapping: null }, reason });
  });
}

export async function listActiveProfileChoices({ actor }: { actor: Actor }) {
  return getDb()
    .select({ id: acceptanceProfiles.id, name: acceptanceProfiles.name })
    .from(acceptanceProfiles)
    .where(and(eq(acceptanceProfiles.siteId, siteOf(actor)), eq(acceptanceProfiles.active, true)))
    .orderBy(asc(acceptanceProfiles.name));
}

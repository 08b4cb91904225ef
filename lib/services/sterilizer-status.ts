import "server-only";
import type { Executor } from "@/db";
import type { Actor } from "@/db/queries/users";
import { getSterilizerForSite } from "@/db/queries/catalog";
import { engineersOfSite } from "@/db/queries/mail";
import { getSiteById } from "@/db/queries/sites";
import { getStatusFacts, listConfirmedOutcomes, listStatusEvents, writeSterilizerStatus, getSterilizerSiteId, type OutcomeRow } from "@/db/queries/sterilizer-status";
import { STERILIZER_STATUS_LABELS, type SterilizerStatus } from "@/lib/domain";
import { AppError } from "@/lib/errors";
import { formatDateTime } from "@/lib/format";
import { kickMailDelivery } from "@/lib/mail/delivery";
import { sterilizerStatusMail, sterilizerUrl } from "@/lib/mail/templates";
import { failuresToAcknowledge, sterilizerStatusOf, type ConfirmedOutcome, type ManualStatusEvent, type StatusFinding, type StatusInput } from "@/lib/periodic-tests";
import { assertAllowed } from "./access";
import { enqueueMail } from "./mail";
import { reauthenticate } from "./reauthenticate";
import { auditActor, siteIdOf } from "./site";

export type SterilizerStatusView = { id: string; name: string; status: SterilizerStatus; statusReason: string; statusSince: string };
type Facts = Awaited<ReturnType<typeof getStatusFacts>>;
type CachedRow = Facts["sterilizers"][number];
type Evaluated = { row: CachedRow; finding: StatusFinding; input: StatusInput };

/** An ISO text as the instant it names, so outcomes from both tables compare as strings; an unreadable one sorts first. */
const instant = (text: string) => {
  const t = Date.parse(text);
  return Number.isNaN(t) ? text : new Date(t).toISOString();
};
const toOutcome = (o: OutcomeRow): ConfirmedOutcome => ({ kind: o.kind, at: instant(o.at), result: o.result, source: { type: o.sourceType, id: o.sourceId } });

/** The status rule applied to the site's active sterilizers (or one of them) at `now`. */
async function evaluate({ siteId, sterilizerId, now }: { siteId: string; sterilizerId?: string; now: Date }) {
  const [facts, outcomeRows, site] = await Promise.all([getStatusFacts({ siteId, sterilizerId }), listConfirmedOutcomes({ siteId, sterilizerId }), getSiteById({ id: siteId })]);
  const timeZone = site?.timeZone ?? "UTC";
  const evaluated: Evaluated[] = facts.sterilizers.map((row) => {
    const outcomes = outcomeRows.filter((o) => o.sterilizerId === row.id).map(toOutcome);
    const manual: ManualStatusEvent[] = facts.manual
      .filter((m) => m.sterilizerId === row.id)
      .map((m) => ({ status: m.status, at: m.at, reason: m.reason, byName: m.byName ?? "an engineer", acknowledged: m.acknowledged ?? [] }));
    const schedules = facts.schedules.filter((s) => s.sterilizerId === row.id);
    // Never judged before (the column's default): in use, if it is, since it was registered.
    const input: StatusInput = { schedules, outcomes, manual, now, timeZone, previous: { status: row.status, since: row.statusSince ?? row.createdAt } };
    return { row, finding: sterilizerStatusOf(input), input };
  });
  return { evaluated, timeZone };
}

type Change = { actor?: Actor; cause: string; now: Date; timeZone: string; siteId: string; manual?: { status: SterilizerStatus; reason: string; acknowledged: string[] | null } };

/** Stores what the rule found: a changed status with its event, audit event and mail to the site's engineers; a changed reason quietly. */
async function persist({ row, finding }: Evaluated, change: Change): Promise<boolean> {
  const { actor, cause, now, timeZone, siteId, manual } = change;
  const statusChanged = finding.status !== row.status;
  if (!statusChanged && !manual) {
    if (finding.reason === row.statusReason && finding.since === row.statusSince) return false;
    await writeSterilizerStatus({ sterilizerId: row.id, fromStatus: row.status, to: finding, event: null, audit: null });
    return false;
  }
  const at = now.toISOString();
  const signer =
    manual && actor
      ? { userId: actor.id, printedName: actor.name, role: actor.role, passwordReauthenticated: true }
      : { userId: actor?.id ?? null, printedName: actor?.name ?? null, role: actor?.role ?? null };
  const event = manual
    ? { ...signer, status: manual.status, reason: manual.reason, at, since: at, kind: "manual" as const, cause, acknowledged: manual.acknowledged }
    : { ...signer, status: finding.status, reason: finding.reason, at, since: finding.since, kind: "automatic" as const, cause };
  const action = manual ? `sterilizer.${manual.status}` : `sterilizer.${finding.status}`;
  const before = { status: row.status, reason: row.statusReason, since: row.statusSince };
  const wrote = await writeSterilizerStatus({
    sterilizerId: row.id,
    fromStatus: row.status,
    to: finding,
    event,
    audit: {
      ...(actor ? auditActor(actor) : { actorId: null, actorEmail: null }),
      siteId,
      action,
      entityType: "sterilizer",
      entityId: row.id,
      oldValue: before,
      newValue: { status: finding.status, reason: finding.reason, since: finding.since, cause, ...(manual ? { decision: manual.status, acknowledged: manual.acknowledged } : {}) },
      reason: manual ? manual.reason : finding.reason,
    },
    inside: statusChanged ? (tx) => queueStatusMail(tx, { row, finding, siteId, timeZone, byName: manual ? (actor?.name ?? null) : null }) : undefined,
  });
  if (wrote && statusChanged) kickMailDelivery();
  return wrote;
}

async function queueStatusMail(tx: Executor, { row, finding, siteId, timeZone, byName }: { row: CachedRow; finding: StatusFinding; siteId: string; timeZone: string; byName: string | null }) {
  const content = sterilizerStatusMail({
    sterilizerName: row.name,
    status: finding.status,
    reason: finding.reason,
    since: formatDateTime(finding.since, timeZone),
    byName,
    url: sterilizerUrl(row.id),
  });
  await enqueueMail(tx, { to: await engineersOfSite(tx, siteId), ...content, siteId });
}

/**
 * Recomputes one sterilizer's status (after a sign-off, a schedule change, a decision) and stores a change: the
 * event, the ledger's `sterilizer.out-of-use` / `sterilizer.in-use`, a mail to the site's engineers.
 */
export async function refreshSterilizerStatus({ sterilizerId, actor, cause, now = new Date() }: { sterilizerId: string; actor?: Actor; cause: string; now?: Date }): Promise<void> {
  const siteId = await getSterilizerSiteId({ id: sterilizerId });
  if (!siteId) return;
  const { evaluated, timeZone } = await evaluate({ siteId, sterilizerId, now });
  for (const e of evaluated) await persist(e, { actor, cause, now, timeZone, siteId });
}

/**
 * The current status of the site's active sterilizers. Overdue happens with time, so every read applies the rule
 * with `now` and stores what changed (no scheduled job needed).
 */
export async function currentSterilizerStatuses({ siteId, now = new Date() }: { siteId: string; now?: Date }): Promise<Map<string, SterilizerStatusView>> {
  const { evaluated, timeZone } = await evaluate({ siteId, now });
  const views = new Map<string, SterilizerStatusView>();
  for (const e of evaluated) {
    await persist(e, { cause: "found when read (the calendar moved on)", now, timeZone, siteId });
    views.set(e.row.id, { id: e.row.id, name: e.row.name, status: e.finding.status, statusReason: e.finding.reason, statusSince: e.finding.since });
  }
  return views;
}

/** The status board of the actor's site: each active sterilizer, out of use first. */
export async function getStatusBoard({ actor, now = new Date() }: { actor: Actor; now?: Date }) {
  if (!actor.siteId) return [];
  const views = [...(await currentSterilizerStatuses({ siteId: actor.siteId, now })).values()];
  return views.sort((a, b) => (a.status === b.status ? a.name.localeCompare(b.name) : a.status === "out-of-use" ? -1 : 1));
}

/** The status history of one of the actor's site's sterilizers, newest first. */
export async function listSterilizerStatusHistory({ actor, sterilizerId, limit = 50 }: { actor: Actor; sterilizerId: string; limit?: number }) {
  const sterilizer = await getSterilizerForSite({ actor, id: sterilizerId });
  if (!sterilizer) throw new AppError(404, "That sterilizer was not found on your site.");
  return listStatusEvents({ sterilizerId, limit });
}

/**
 * An engineer's signed decision: take a sterilizer out of use, or release it. A release clears a hold and
 * acknowledges the confirmed failures on record, but it cannot stand in for a required test that is due: then it is
 * refused and nothing is stored.
 */
export async function setSterilizerStatus({
  actor,
  sterilizerId,
  status,
  reason,
  password,
  now = new Date(),
}: {
  actor: Actor;
  sterilizerId: string;
  status: SterilizerStatus;
  reason: string;
  password: string;
  now?: Date;
}): Promise<SterilizerStatusView> {
  const siteId = siteIdOf(actor);
  const sterilizer = await getSterilizerForSite({ actor, id: sterilizerId });
  if (!sterilizer) throw new AppError(404, "That sterilizer was not found on your site.");
  assertAllowed(actor, "equipment:manage", "take a sterilizer out of use or release it");
  if (!sterilizer.active) throw new AppError(409, `${sterilizer.name} is retired; its status cannot be changed.`);
  const trimmed = reason.trim();
  if (trimmed.length < 3) throw new AppError(422, "Give the reason for this decision; it is signed and goes into the audit ledger.", "reason");
  await reauthenticate({ actor, password, now, entity: { type: "sterilizer", id: sterilizerId } });

  const { evaluated, timeZone } = await evaluate({ siteId, sterilizerId, now });
  const current = evaluated[0];
  if (!current) throw new AppError(404, "That sterilizer was not found on your site.");
  const at = now.toISOString();
  const manual = status === "in-use" ? { status, reason: trimmed, acknowledged: failuresToAcknowledge(current.input.outcomes) } : { status, reason: trimmed, acknowledged: null };
  const held = current.finding.causes.some((c) => c.kind === "manual");
  if (status === "out-of-use" && held) throw new AppError(409, `${sterilizer.name} is already out of use by an engineer's decision: ${current.row.statusReason ?? current.finding.reason}`);
  if (status === "in-use" && current.finding.status === "in-use") throw new AppError(409, `${sterilizer.name} is already in use; there is nothing to release.`);

  // The rule again, with this decision added, decides what the sterilizer's status becomes.
  const after = sterilizerStatusOf({ ...current.input, manual: [...current.input.manual, { ...manual, at, byName: actor.name, acknowledged: manual.acknowledged ?? [] }] });
  if (status === "in-use" && after.status === "out-of-use") {
    throw new AppError(409, `A release cannot make a required test current; ${sterilizer.name} stays out of use until it passes and is approved. ${after.reason}`);
  }
  const wrote = await persist({ ...current, finding: after }, { actor, cause: `engineer's signed decision: ${STERILIZER_STATUS_LABELS[status].toLowerCase()}`, now, timeZone, siteId, manual });
  if (!wrote) throw new AppError(409, "The sterilizer's status changed while you were signing; look at it again and repeat if still needed.");
  return { id: sterilizerId, name: sterilizer.name, status: after.status, statusReason: after.reason, statusSince: after.since };
}

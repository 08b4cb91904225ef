import "server-only";
import { and, count, desc, eq, gte, inArray, max, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { auditEvents, calibrationCertificates, cycles, instruments, sterilizers, users } from "@/db/schema";
import { EDITABLE_CYCLE_STATUSES } from "@/lib/domain";

const DAY_MS = 86_400_000;

const cycleSummary = {
  id: cycles.id,
  cycleNumber: cycles.cycleNumber,
  status: cycles.status,
  verdict: cycles.verdict,
  startedAt: cycles.startedAt,
  sterilizerName: sterilizers.name,
};

export async function listCyclesAwaitingReview({ siteId, limit = 6 }: { siteId: string; limit?: number }) {
  const db = getDb();
  const where = and(eq(cycles.siteId, siteId), eq(cycles.status, "submitted"));
  const [items, [{ total }]] = await Promise.all([
    db.select(cycleSummary).from(cycles).innerJoin(sterilizers, eq(cycles.sterilizerId, sterilizers.id)).where(where).orderBy(cycles.submittedAt).limit(limit),
    db.select({ total: count() }).from(cycles).where(where),
  ]);
  return { items, total };
}

/**
 * The person's drafts and returned cycles, newest first. Found through the site-and-status index and then sorted (a
 * few rows): ordered by `+created_at` so SQLite does not walk every cycle of the site in creation order looking for them.
 */
export async function listMyOpenCycles({ siteId, userId, limit = 6 }: { siteId: string; userId: string; limit?: number }) {
  return getDb()
    .select(cycleSummary)
    .from(cycles)
    .innerJoin(sterilizers, eq(cycles.sterilizerId, sterilizers.id))
    .where(and(eq(cycles.siteId, siteId), eq(cycles.createdBy, userId), inArray(cycles.status, EDITABLE_CYCLE_STATUSES)))
    .orderBy(desc(sql`+${cycles.createdAt}`))
    .limit(limit);
}

export async function listRecentFailures({ siteId, days = 14, limit = 6 }: { siteId: string; days?: number; limit?: number }) {
  const since = new Date(Date.now() - days * DAY_MS).toISOString();
  return getDb()
    .select(cycleSummary)
    .from(cycles)
    .innerJoin(sterilizers, eq(cycles.sterilizerId, sterilizers.id))
    .where(and(eq(cycles.siteId, siteId), eq(cycles.verdict, "fail"), gte(cycles.startedAt, since)))
    .orderBy(desc(cycles.startedAt))
    .limit(limit);
}

/** The site's latest approvals, walked down cycles_site_status_updated_idx. */
export async function listRecentlyApproved({ siteId, limit = 6 }: { siteId: string; limit?: number }) {
  return getDb()
    .select(cycleSummary)
    .from(cycles)
    .innerJoin(sterilizers, eq(cycles.sterilizerId, sterilizers.id))
    .where(and(eq(cycles.siteId, siteId), eq(cycles.status, "approved")))
    .orderBy(desc(cycles.updatedAt), desc(cycles.id))
    .limit(limit);
}

export async function listCalibrationsDue({ siteId, withinDays = 30, now = new Date() }: { siteId: string; withinDays?: number; now?: Date }) {
  const limit = new Date(now.getTime() + withinDays * DAY_MS).toISOString().slice(0, 10);
  const today = now.toISOString().slice(0, 10);
  const latest = getDb()
    .select({ instrumentId: calibrationCertificates.instrumentId, dueOn: max(calibrationCertificates.dueOn).as("due_on") })
    .from(calibrationCertificates)
    .groupBy(calibrationCertificates.instrumentId)
    .as("latest");
  const rows = await getDb()
    .select({ instrumentId: instruments.id, name: instruments.name, serialNumber: instruments.serialNumber, dueOn: latest.dueOn })
    .from(instruments)
    .innerJoin(latest, eq(latest.instrumentId, instruments.id))
    .where(and(eq(instruments.siteId, siteId), eq(instruments.active, true), sql`${latest.dueOn} <= ${limit}`))
    .orderBy(sql`${latest.dueOn}`);
  return rows.map((r) => ({ ...r, overdue: (r.dueOn ?? "") < today }));
}

/** The site's accounts and its failed sign-ins of the last 7 days (an unknown e-mail belongs to no site). */
export async function getAdminOverview({ siteId }: { siteId: string }) {
  const db = getDb();
  const since = new Date(Date.now() - 7 * DAY_MS).toISOString();
  const [[{ total }], [{ disabled }], [{ failed }]] = await Promise.all([
    db.select({ total: count() }).from(users).where(eq(users.siteId, siteId)),
    db
      .select({ disabled: count() })
      .from(users)
      .where(and(eq(users.siteId, siteId), eq(users.disabled, true))),
    db
      .select({ failed: count() })
      .from(auditEvents)
      .where(and(eq(auditEvents.siteId, siteId), eq(auditEvents.action, "auth.sign-in-failed"), gte(auditEvents.at, since))),
  ]);
  return { users: total, disabled, failedSignIns: failed };
}

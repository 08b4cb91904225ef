import "server-only";
import type { Actor } from "@/db/queries/users";
import { getAdminOverview, listCalibrationsDue, listCyclesAwaitingReview, listMyOpenCycles, listRecentFailures, listRecentlyApproved } from "@/db/queries/dashboard";
import { can } from "@/lib/auth/permissions";
import { getScheduleOverview } from "./periodic-tests";
import { getSiteContext } from "./site";
import { getRequalificationOverview } from "./requalification";
import { getStatusBoard } from "./sterilizer-status";

/**
 * What waits for the actor on the home page, by role, from the actor's own site only. An
 * account without a site has nothing waiting.
 */
export async function getHomeDashboard({ actor }: { actor: Actor }) {
  const { site, timeZone } = await getSiteContext({ actor });
  const siteName = site?.name ?? null;
  const siteId = actor.siteId;
  // Every role sees at a glance which sterilizers may be used.
  const [statuses, requalification] = await Promise.all([getStatusBoard({ actor }), getRequalificationOverview({ actor })]);
  // A sterilizer in use may still hold a load whose pattern must be requalified before use (issue 14 §7).
  const board = statuses.map((s) => ({ ...s, notices: requalification.patterns.filter((p) => p.sterilizerId === s.id && p.blockedNotice).map((p) => p.blockedNotice!) }));
  const patterns = requalification.patterns;
  if (actor.role === "admin") {
    const overview = siteId ? await getAdminOverview({ siteId }) : { users: 0, disabled: 0, failedSignIns: 0 };
    return { kind: "admin" as const, siteName, timeZone, board, overview };
  }
  if (actor.role === "auditor") {
    return { kind: "auditor" as const, siteName, timeZone, board, patterns, approved: siteId ? await listRecentlyApproved({ siteId }) : [] };
  }
  if (!siteId) return { kind: "worker" as const, siteName, timeZone, board, patterns, review: null, mine: [], failures: [], testsDue: [], calibrations: [] };
  const [review, mine, failures, testsDue, calibrations] = await Promise.all([
    can(actor.role, "review:queue") ? listCyclesAwaitingReview({ siteId }) : Promise.resolve(null),
    listMyOpenCycles({ siteId, userId: actor.id }),
    listRecentFailures({ siteId }),
    getScheduleOverview({ actor }).then((o) => o.rows.filter((r) => r.needsAction)),
    listCalibrationsDue({ siteId }),
  ]);
  return { kind: "worker" as const, siteName, timeZone, board, patterns, review, mine, failures, testsDue, calibrations };
}

import "server-only";
import type { PeriodicTestKind } from "@/db/schema";
import type { Actor } from "@/db/queries/users";
import { getScheduleFacts, listPeriodicTestsOfSite, listSterilizerChoicesOfSite, type PeriodicTestFilter } from "@/db/queries/periodic-tests";
import { can } from "@/lib/auth/permissions";
import { needsAction, scheduleStatus, SCHEDULE_URGENCY, type ScheduleStatus } from "@/lib/periodic-tests";
import { getSiteContext, siteIdOf } from "./site";

/** Periodic-test kinds whose evidence is a logged cycle (signed off in the cycle record) rather than a form. */
const CYCLE_EVIDENCED_KINDS = ["thermometric-small-load", "thermometric-full-load"] as const satisfies readonly PeriodicTestKind[];
const isCycleEvidenced = (kind: string) => (CYCLE_EVIDENCED_KINDS as readonly string[]).includes(kind);

type ScheduleRow = {
  sterilizerId: string;
  sterilizerName: string;
  sterilizerActive: boolean;
  kind: PeriodicTestKind;
  intervalDays: number;
  lastPassAt: string | null;
  lastAttempt: { at: string; result: "pass" | "fail" } | null;
  /** passing cycles of this kind that still wait for sign-off (thermometric tests only) */
  awaitingSignOff: number;
  /** recorded tests of this kind waiting for an engineer's signature; they do not count until signed */
  recordsAwaitingSignOff: number;
  status: ScheduleStatus;
  needsAction: boolean;
};

const key = (sterilizerId: string, kind: string) => `${sterilizerId}:${kind}`;
const latestOf = (...values: Array<string | null | undefined>) =>
  values
    .filter((v): v is string => !!v)
    .sort()
    .at(-1) ?? null;

/** Each scheduled test of the site's sterilizers (or one of them) with its state, most urgent first. */
export async function getScheduleOverview({ actor, sterilizerId, now = new Date() }: { actor: Actor; sterilizerId?: string; now?: Date }) {
  const siteId = siteIdOf(actor);
  const [facts, { timeZone, today }] = await Promise.all([getScheduleFacts({ siteId, sterilizerId, cycleEvidencedKinds: CYCLE_EVIDENCED_KINDS }), getSiteContext({ actor, now })]);
  const passBy = new Map(facts.passes.map((p) => [key(p.sterilizerId, p.kind), p.at]));
  const attemptBy = new Map(facts.attempts.map((a) => [key(a.sterilizerId, a.kind), { at: a.at, result: a.result }]));
  const cyclePassBy = new Map(facts.cyclePasses.map((c) => [key(c.sterilizerId, c.kind), c.at]));
  const cycleFailBy = new Map(facts.cycleFailures.map((c) => [key(c.sterilizerId, c.kind), c.at]));
  const pendingBy = new Map(facts.awaitingSignOff.map((p) => [key(p.sterilizerId, p.kind), p.n]));
  const pendingRecordsBy = new Map(facts.recordsAwaitingSignOff.map((p) => [key(p.sterilizerId, p.kind), p.n]));

  const rows: ScheduleRow[] = facts.schedules.map((s) => {
    const k = key(s.sterilizerId, s.kind);
    let lastPassAt = passBy.get(k) ?? null;
    let lastAttempt = attemptBy.get(k) ?? null;
    if (isCycleEvidenced(s.kind)) {
      lastPassAt = latestOf(lastPassAt, cyclePassBy.get(k));
      const failAt = cycleFailBy.get(k);
      if (failAt && (!lastAttempt || failAt > lastAttempt.at)) lastAttempt = { at: failAt, result: "fail" };
      if (lastPassAt && (!lastAttempt || lastPassAt > lastAttempt.at)) lastAttempt = { at: lastPassAt, result: "pass" };
    }
    const status = scheduleStatus({ intervalDays: s.intervalDays, lastPassAt, lastAttempt, today, timeZone });
    return {
      ...s,
      lastPassAt,
      lastAttempt,
      awaitingSignOff: pendingBy.get(k) ?? 0,
      recordsAwaitingSignOff: pendingRecordsBy.get(k) ?? 0,
      status,
      needsAction: s.sterilizerActive && needsAction(status.state),
    };
  });
  rows.sort(
    (a, b) => SCHEDULE_URGENCY[a.status.state] - SCHEDULE_URGENCY[b.status.state] || (a.status.dueOn ?? "").localeCompare(b.status.dueOn ?? "") || a.sterilizerName.localeCompare(b.sterilizerName),
  );
  return { rows, timeZone, today };
}

export async function listPeriodicTests({ actor, filter }: { actor: Actor; filter: PeriodicTestFilter & { page?: number; pageSize?: number } }) {
  const pageSize = Math.min(Math.max(filter.pageSize ?? 25, 1), 200);
  const page = Math.max(filter.page ?? 1, 1);
  const { items, total } = await listPeriodicTestsOfSite({ siteId: siteIdOf(actor), filter, page, pageSize });
  return { items, total, page, pageSize };
}

/** The site's sterilizers to choose from (in use first) and the site's atmosphere for the superheat test. */
export async function listSterilizerChoices({ actor }: { actor: Actor }) {
  const siteId = siteIdOf(actor);
  const [rows, { site }] = await Promise.all([listSterilizerChoicesOfSite({ siteId }), getSiteContext({ actor })]);
  return { sterilizers: rows, site: site ? { atmosphereKpa: site.atmosphereKpa, altitudeM: site.altitudeM, timeZone: site.timeZone } : { atmosphereKpa: null, altitudeM: null, timeZone: "UTC" } };
}

/** The periodic-tests page: the schedule, one page of the history, the filter's choices, and whether the actor may record. */
export async function getPeriodicTestsPage({ actor, filter }: { actor: Actor; filter: PeriodicTestFilter & { page?: number } }) {
  const [overview, history, choices] = await Promise.all([getScheduleOverview({ actor }), listPeriodicTests({ actor, filter: { ...filter, pageSize: 25 } }), listSterilizerChoices({ actor })]);
  return { overview, history, choices, mayRecord: can(actor.role, "periodic-test:record") };
}

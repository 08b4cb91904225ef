import "server-only";
import { z } from "zod";
import { countAuditEvents, findCycleIdByNumber, listAuditEventsOfSite, listAuditNames, type AuditEventFilter, type AuditNameRow } from "@/db/queries/audit";
import { listUsersOfSite } from "@/db/queries/users";
import type { AuditEvent } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { ROLE_LABELS, localDateTimeToInstant, testKindLabel, type Role } from "@/lib/domain";
import { AUDIT_ACTIONS, AUDIT_ACTION_CHOICES, auditActionLabel, describeAuditEvent, type AuditLine, type AuditPerson } from "@/lib/domain/audit-words";
import { isRecordId } from "@/lib/domain/audit-fields";
import { assertAllowed, type Actor } from "./access";
import { getSiteContext, siteIdOf } from "./site";
import { verifyLedger } from "./audit";
import { cachedTotal } from "./list-totals";

const SITE_DATE = /^\d{4}-\d{2}-\d{2}$/;

/** The trail's filter as the page's address and the export links carry it. */
export const auditTrailQuerySchema = z.object({
  person: z.string().trim().max(64).optional(),
  action: z.string().trim().max(80).optional(),
  record: z.string().trim().max(120).optional(),
  from: z.string().trim().max(10).optional(),
  to: z.string().trim().max(10).optional(),
});
export type AuditTrailQuery = z.infer<typeof auditTrailQuerySchema>;

export type ResolvedTrailFilter = { siteId: string; timeZone: string; filter: AuditEventFilter; words: string[] };

function siteDateInstant(date: string, timeZone: string, field: "from" | "to"): string {
  const instant = SITE_DATE.test(date) ? localDateTimeToInstant(`${date}T00:00:00`, timeZone) : null;
  if (!instant) throw new AppError(400, `The ${field === "from" ? "start" : "end"} date "${date}" is not a date; use the date picker (year-month-day).`, field);
  return instant.toISOString();
}

const nextDay = (date: string) => new Date(Date.parse(`${date}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10);

/**
 * The actor's site, its time zone and the filter in the ledger's terms: site dates become instants
 * (from the start of the first day to the end of the last, on the site's clock), a cycle number
 * becomes the cycle's id. A record that is not on the site matches nothing rather than everything.
 */
export async function resolveTrailFilter(actor: Actor, query: AuditTrailQuery): Promise<ResolvedTrailFilter> {
  assertAllowed(actor, "audit:read", "read the audit trail");
  const siteId = siteIdOf(actor, "audit trail");
  const { timeZone } = await getSiteContext({ actor });
  const filter: AuditEventFilter = {};
  const words: string[] = [];
  if (query.person) {
    const person = (await listUsersOfSite({ siteId })).find((u) => u.id === query.person);
    if (!person) throw new AppError(400, "That person is not a user of your site; choose one from the list.", "person");
    filter.actorId = person.id;
    words.push(`person ${person.name}`);
  }
  if (query.action) {
    filter.action = query.action;
    words.push(`action "${auditActionLabel(query.action)}"`);
  }
  if (query.record) {
    filter.entityId = isRecordId(query.record) ? query.record : ((await findCycleIdByNumber({ siteId, cycleNumber: query.record })) ?? `not-on-site:${query.record}`);
    words.push(`record ${query.record}`);
  }
  if (query.from) {
    filter.fromIso = siteDateInstant(query.from, timeZone, "from");
    words.push(`from ${query.from}`);
  }
  if (query.to) {
    siteDateInstant(query.to, timeZone, "to");
    filter.beforeIso = siteDateInstant(nextDay(query.to), timeZone, "to");
    words.push(`to ${query.to}`);
  }
  if (filter.fromIso && filter.beforeIso && filter.fromIso >= filter.beforeIso) throw new AppError(400, "The end date is before the start date; swap them.", "to");
  return { siteId, timeZone, filter, words };
}

/** Every record id an event names: its own, its actor, and ids inside its old and new values. */
function idsOf(event: AuditEvent, into: Set<string>) {
  if (event.entityId && isRecordId(event.entityId)) into.add(event.entityId);
  if (event.actorId) into.add(event.actorId);
  for (const text of [event.oldValue, event.newValue]) {
    if (!text) continue;
    for (const match of text.matchAll(/[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/gi)) into.add(match[0]);
  }
}

function nameOf(row: AuditNameRow): string {
  if (row.type === "instrument" && row.extra) return `${row.label} (${row.extra})`;
  if (row.type === "periodic-test") {
    const [sterilizer, performedAt] = (row.extra ?? "").split("|");
    return `${testKindLabel(row.label)}, ${sterilizer}, ${(performedAt ?? "").slice(0, 10)}`;
  }
  return row.label;
}

/** The events in words, with every name joined in one query for the whole batch (not one per row). */
export async function describeEvents({ siteId, timeZone, events }: { siteId: string; timeZone: string; events: AuditEvent[] }): Promise<AuditLine[]> {
  const ids = new Set<string>();
  for (const event of events) idsOf(event, ids);
  const rows = await listAuditNames({ siteId, ids: [...ids] });
  const names = new Map<string, string>();
  const people = new Map<string, AuditPerson>();
  for (const row of rows) {
    names.set(row.id, nameOf(row));
    if (row.type === "user" && row.extra && Object.hasOwn(ROLE_LABELS, row.extra)) people.set(row.id, { name: row.label, role: row.extra as Role });
  }
  return events.map((event) => describeAuditEvent(event, { people, names, timeZone }));
}

export const AUDIT_PAGE_SIZE = 50;

/** One page of the trail; its total is counted once per filter and reused until the ledger gains an event (cachedTotal). */
function listTrailPage({ siteId, filter }: ResolvedTrailFilter, page: number) {
  const totalOf = (count: () => Promise<number>) => cachedTotal({ list: "audit", siteId, filter, count });
  return listAuditEventsOfSite({ siteId, filter, page, pageSize: AUDIT_PAGE_SIZE, totalOf });
}

/** The ledger page: the chain's state, one page of the site's trail in words, and the filter's choices. */
export async function getAuditTrail({ actor, query, page }: { actor: Actor; query: AuditTrailQuery; page: number }) {
  // A filter that cannot be read shows its problem and no events, never the unfiltered trail.
  let problem: string | null = null;
  const resolved = await resolveTrailFilter(actor, query).catch(async (error: unknown) => {
    if (!(error instanceof AppError) || error.status !== 400) throw error;
    problem = error.message;
    return resolveTrailFilter(actor, {});
  });
  const [chain, listed, siteUsers] = await Promise.all([verifyLedger(), problem ? { items: [], total: 0 } : listTrailPage(resolved, page), listUsersOfSite({ siteId: resolved.siteId })]);
  const lines = await describeEvents({ siteId: resolved.siteId, timeZone: resolved.timeZone, events: listed.items });
  const actions = query.action && !AUDIT_ACTIONS[query.action] ? [...AUDIT_ACTION_CHOICES, { value: query.action, label: auditActionLabel(query.action) }] : AUDIT_ACTION_CHOICES;
  return {
    chain,
    lines,
    total: listed.total,
    pages: Math.max(Math.ceil(listed.total / AUDIT_PAGE_SIZE), 1),
    timeZone: resolved.timeZone,
    filterWords: resolved.words,
    problem: problem as string | null,
    choices: { people: siteUsers.map((u) => ({ value: u.id, label: `${u.name} (${ROLE_LABELS[u.role as Role] ?? u.role})` })), actions },
  };
}

/** How many events the filter matches (the exports refuse more than their limit before they start). */
export async function countTrail(resolved: ResolvedTrailFilter): Promise<number> {
  return countAuditEvents({ siteId: resolved.siteId, filter: resolved.filter });
}

/**
 * One audit-ledger event as a person reads it: who (name and role), what in words ("approved cycle
 * P2-20261112-009"), when (the site's clock and UTC), why, the old → new values, and the record it
 * is about with a link. The service joins the names; this stays pure so the page, the CSV and the
 * PDF extract print the same words.
 */
import { auditChanges, auditObject, parseAuditValue, shortChange, type AuditChange, type RecordNames } from "./audit-fields";
import { ROLE_LABELS, type Role } from "./roles";
import { testKindLabel } from "./test-kinds";
import { isValidTimeZone } from "./time-zone";
import { studyAuditActions } from "./audit-words-studies";

export { type AuditChange, type RecordNames } from "./audit-fields";

export type AuditEventFacts = {
  seq: number;
  at: string;
  action: string;
  entityType: string;
  entityId: string | null;
  actorId: string | null;
  actorEmail: string | null;
  oldValue: string | null;
  newValue: string | null;
  reason: string | null;
};

export type AuditPerson = { name: string; role: Role };

export type AuditLine = {
  seq: number;
  who: string;
  role: string | null;
  what: string;
  kind: string;
  when: { site: string; utc: string };
  reason: string | null;
  changes: AuditChange[];
  record: { label: string; href: string | null } | null;
};

type Facts = { record: string; old: Record<string, unknown>; new: Record<string, unknown>; names: RecordNames; at: (iso: string) => string };
type Kind = { label: string; what: (f: Facts) => string };

const str = (v: unknown): string | null => (typeof v === "string" && v ? v : null);
const num = (v: unknown): number | null => (typeof v === "number" && Number.isFinite(v) ? v : null);

/** "changed profile X: hold 180 → 210 s" when one or two fields changed; more are in the list below the line. */
function changedSummary(f: Facts, skip: string[] = []): string {
  const keys = Object.keys(f.new).filter((k) => !skip.includes(k) && Object.hasOwn(f.old, k) && JSON.stringify(f.old[k]) !== JSON.stringify(f.new[k]));
  if (keys.length === 0 || keys.length > 2) return "";
  return `: ${keys.map((k) => shortChange(k, f.old[k], f.new[k], f.names, f.at)).join("; ")}`;
}

const signed = (meaning: string): Kind => ({
  label: `${SIGN_VERBS[meaning].charAt(0).toUpperCase()}${SIGN_VERBS[meaning].slice(1)} a cycle`,
  what: (f) => `${SIGN_VERBS[meaning]} cycle ${f.record}`,
});
const SIGN_VERBS: Record<string, string> = {
  reviewed: "signed as reviewed",
  approved: "approved",
  "failure-confirmed": "confirmed the failure of",
  returned: "returned for correction",
  rejected: "returned for correction (signed as rejected)",
};
const periodicSigned = (verb: string): Kind => ({ label: `${verb.charAt(0).toUpperCase()}${verb.slice(1)} a periodic test`, what: (f) => `${verb} the periodic test ${f.record}` });

/** A label inside a sentence: "Air leakage test" → "air leakage test", but a name such as "Bowie-Dick test" keeps its capitals. */
const inSentence = (label: string) => (/^\p{Lu}[^\s]*\p{Lu}/u.test(label) ? label : label.charAt(0).toLowerCase() + label.slice(1));

const withArticle = (words: string) => `${/^[aeiou]/i.test(words) ? "an" : "a"} ${words}`;

/** Every action Papin writes to the ledger, with the words for the action filter and for one event. */
export const AUDIT_ACTIONS: Record<string, Kind> = {
  "auth.sign-in": { label: "Signed in", what: () => "signed in" },
  "auth.sign-in-refused": { label: "Sign-in refused", what: () => "was refused sign-in" },
  "auth.sign-in-failed": { label: "Sign-in failed", what: () => "failed to sign in" },
  "auth.sign-out": { label: "Signed out", what: () => "signed out" },
  "account.locked": { label: "Account locked", what: (f) => `had the account ${f.record} locked after failed sign-ins` },
  "account.unlocked": { label: "Unlocked an account", what: (f) => `unlocked the account of ${f.record}` },
  "user.create": { label: "Added a user", what: (f) => `added the user ${str(f.new.name) ?? f.record}${str(f.new.role) ? ` as ${ROLE_LABELS[f.new.role as Role] ?? f.new.role}` : ""}` },
  "user.update": { label: "Changed a user", what: (f) => `changed the user ${f.record}${changedSummary(f, ["sessions"])}` },
  "user.password-reset": { label: "Reset a password", what: (f) => `reset the password of ${f.record}` },
  "user.password-change": { label: "Changed own password", what: () => "changed their own password" },
  "api-token.issue": { label: "Issued an API token", what: (f) => `issued the API token ${str(f.new.name) ?? f.record}` },
  "api-token.revoke": { label: "Revoked an API token", what: (f) => `revoked the API token ${str(f.old.name) ?? f.record}` },
  "api-token.used": { label: "Used an API token", what: (f) => `used the API token ${str(f.new.name) ?? f.record}${str(f.new.route) ? ` on ${f.new.route}` : ""}` },
  "site.update": { label: "Changed the site settings", what: (f) => `changed the site settings${changedSummary(f)}` },
  "demo.load": { label: "Loaded the demo site", what: (f) => `loaded the demo site ${str(f.new.name) ?? f.record}` },
  "sterilizer.create": { label: "Added a sterilizer", what: (f) => `added the sterilizer ${str(f.new.name) ?? f.record}` },
  "sterilizer.update": { label: "Changed a sterilizer", what: (f) => `changed the sterilizer ${f.record}${changedSummary(f)}` },
  "sterilizer.in-use": { label: "Sterilizer put in use", what: (f) => `put the sterilizer ${f.record} in use` },
  "sterilizer.out-of-use": { label: "Sterilizer taken out of use", what: (f) => `took the sterilizer ${f.record} out of use` },
  "schedule.create": {
    label: "Scheduled a test",
    what: (f) => `scheduled the ${testKindLabel(str(f.new.kind) ?? "test").toLowerCase()} for ${f.record}${num(f.new.intervalDays) ? ` every ${num(f.new.intervalDays)} days` : ""}`,
  },
  "schedule.update": { label: "Changed a test schedule", what: (f) => `changed the ${testKindLabel(str(f.new.kind) ?? "test").toLowerCase()} schedule of ${f.record}${changedSummary(f, ["kind"])}` },
  "schedule.remove": { label: "Removed a scheduled test", what: (f) => `took the ${testKindLabel(str(f.old.kind) ?? "test").toLowerCase()} off the schedule of ${f.record}` },
  "profile.create": { label: "Added a profile", what: (f) => `added the profile ${str(f.new.name) ?? f.record}` },
  "profile.update": { label: "Changed a profile", what: (f) => `changed the profile ${f.record}${changedSummary(f)}` },
  "profile.new-version": { label: "New profile version", what: (f) => `made a new version of the profile ${str(f.new.name) ?? f.record}${changedSummary(f, ["id", "name"])}` },
  "profile.retire": { label: "Retired a profile version", what: (f) => `retired the profile version ${f.record}` },
  "instrument.create": { label: "Added an instrument", what: (f) => `added the instrument ${str(f.new.name) ?? f.record}` },
  "instrument.mapping-saved": { label: "Saved an instrument mapping", what: (f) => `saved the column mapping of the instrument ${f.record}` },
  "instrument.mapping-cleared": { label: "Cleared an instrument mapping", what: (f) => `cleared the saved mapping of the instrument ${f.record}` },
  "calibration.add": {
    label: "Added a calibration certificate",
    what: (f) => `added the calibration certificate ${str(f.new.certificateNumber) ?? ""} to the instrument ${f.record}`.replace("  ", " "),
  },
  "cycle.create": { label: "Registered a cycle", what: (f) => `registered and analysed cycle ${str(f.new.cycleNumber) ?? f.record}` },
  "cycle.reanalyse": { label: "Analysed a cycle again", what: (f) => `analysed cycle ${f.record} again` },
  "cycle.edit": { label: "Edited a cycle", what: (f) => `edited cycle ${f.record}` },
  "cycle.submit": { label: "Submitted a cycle", what: (f) => `submitted cycle ${f.record} for review` },
  "cycle.sign.reviewed": signed("reviewed"),
  "cycle.sign.approved": signed("approved"),
  "cycle.sign.failure-confirmed": signed("failure-confirmed"),
  "cycle.sign.returned": signed("returned"),
  "cycle.sign.rejected": signed("rejected"),
  "cycle.indicator-sheet": { label: "Read an indicator sheet", what: (f) => `recorded the indicator sheet of cycle ${f.record}` },
  "cycles.export": { label: "Exported the cycle list", what: (f) => `exported the cycle list${num(f.new.rows) !== null ? ` (${num(f.new.rows)} ${num(f.new.rows) === 1 ? "row" : "rows"})` : ""}` },
  "report.download": { label: "Downloaded a report", what: (f) => `downloaded the report ${str(f.new.report) ?? ""} of cycle ${f.record}`.replace("  ", " ") },
  "report.export-draft": { label: "Exported a draft report", what: (f) => `exported a draft report of cycle ${f.record}` },
  "report.verify": {
    label: "Checked a report file",
    what: (f) =>
      num(f.new.auditExtract) !== null
        ? `checked a file: it is the audit-trail extract recorded in event ${num(f.new.auditExtract)}`
        : f.new.match === true
          ? `checked a report file: it matches the archived report of cycle ${f.record}`
          : "checked a report file: no match in the archive",
  },
  "report.integrity-failed": {
    label: "Report failed its integrity check",
    what: (f) => `found the report ${str(f.new.reportNumber) ?? ""} of cycle ${f.record} failing its integrity check`.replace("  ", " "),
  },
  "study.report-draft": { label: "Exported a draft study report", what: (f) => `exported a draft report of study ${f.record}` },
  "study.report-verify": {
    label: "Checked a study report file",
    what: (f) =>
      f.new.match === true ? `checked a report file: it matches the archived report of study ${f.record}` : `checked a report file against the archived report of study ${f.record}: no match`,
  },
  "study.report-integrity-failed": {
    label: "Study report failed its integrity check",
    what: (f) => `found the report ${str(f.new.reportNumber) ?? ""} of study ${f.record} failing its integrity check`.replace("  ", " "),
  },
  "signature.failed": { label: "Wrong signing password", what: (f) => `entered a wrong password signing ${f.record}` },
  "signature.locked": { label: "Signing locked", what: (f) => `was locked out of signing after wrong passwords (signing ${f.record})` },
  "periodic-test.record": { label: "Recorded a periodic test", what: (f) => `recorded ${withArticle(inSentence(testKindLabel(str(f.new.kind) ?? "test")))} for ${str(f.new.sterilizer) ?? f.record}` },
  "periodic-test.sign.approved": periodicSigned("approved"),
  "periodic-test.sign.failure-confirmed": periodicSigned("confirmed the failure of"),
  "periodic-test.sign.returned": periodicSigned("returned"),
  "mail.retry": { label: "Retried a mail", what: () => "sent a failed mail again" },
  "audit.export": {
    label: "Exported the audit trail",
    what: (f) =>
      `exported the audit trail as ${f.new.format === "pdf" ? "a signed PDF extract" : "CSV"}${num(f.new.events) !== null ? ` (${num(f.new.events)} ${num(f.new.events) === 1 ? "event" : "events"})` : ""}`,
  },
  ...studyAuditActions((f) => changedSummary(f as Facts)),
};

/** The action filter's choices, in words, in the order a reader looks for them. */
export const AUDIT_ACTION_CHOICES: Array<{ value: string; label: string }> = Object.entries(AUDIT_ACTIONS)
  .map(([value, kind]) => ({ value, label: kind.label }))
  .sort((a, b) => a.label.localeCompare(b.label));

/** An action this version does not know, spelt out: "cycle.label-print" → "cycle: label print". */
function genericWhat(action: string, record: string): string {
  const [noun, ...rest] = action.split(".");
  const verb = rest.join(" ").replace(/-/g, " ");
  return `${verb || "recorded"} (${noun.replace(/-/g, " ")}${record ? ` ${record}` : ""})`;
}

export const auditActionLabel = (action: string): string => AUDIT_ACTIONS[action]?.label ?? genericWhat(action, "").replace(/^./, (c) => c.toUpperCase());

const NOUNS: Record<string, string> = {
  cycle: "cycle",
  sterilizer: "sterilizer",
  "acceptance-profile": "profile",
  instrument: "instrument",
  "periodic-test": "periodic test",
  user: "user",
  report: "cycle",
  "api-token": "API token",
  site: "site",
  mail: "mail",
  study: "study",
  "loading-pattern": "loading pattern",
};

/** Where a record of this type is read; null where there is no page for one. */
export function recordHref(entityType: string, entityId: string | null): string | null {
  if (!entityId) return null;
  const pages: Record<string, string> = {
    cycle: `/cycles/${entityId}`,
    report: `/cycles/${entityId}`,
    sterilizer: `/sterilizers/${entityId}`,
    "acceptance-profile": `/profiles/${entityId}`,
    instrument: `/instruments/${entityId}`,
    "periodic-test": `/periodic-tests/${entityId}`,
    user: "/admin/users",
    "api-token": "/tokens",
    site: "/admin/site",
    mail: "/admin/mail",
    study: `/studies/${entityId}`,
  };
  return pages[entityType] ?? null;
}

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];
const pad = (n: number) => String(n).padStart(2, "0");

/** "2026-11-12 08:14:03 UTC" */
export function auditUtcText(iso: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${d.getUTCFullYear()}-${pad(d.getUTCMonth() + 1)}-${pad(d.getUTCDate())} ${pad(d.getUTCHours())}:${pad(d.getUTCMinutes())}:${pad(d.getUTCSeconds())} UTC`;
}

/** "12 Nov 2026 09:14:03 CET" on the site's clock; UTC when the zone is not a real one. */
export function auditSiteText(iso: string, timeZone: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  if (!isValidTimeZone(timeZone)) return auditUtcText(iso);
  const parts = new Intl.DateTimeFormat("en-GB", {
    timeZone,
    year: "numeric",
    month: "numeric",
    day: "numeric",
    hour: "2-digit",
    minute: "2-digit",
    second: "2-digit",
    hourCycle: "h23",
    timeZoneName: "short",
  }).formatToParts(d);
  const get = (type: Intl.DateTimeFormatPartTypes) => parts.find((p) => p.type === type)?.value ?? "";
  return `${Number(get("day"))} ${MONTHS[Number(get("month")) - 1]} ${get("year")} ${get("hour")}:${get("minute")}:${get("second")} ${get("timeZoneName")}`;
}

/**
 * One event in words. `people` maps actor ids to their names and roles, `names` record ids to
 * their names (cycle numbers, sterilizer and profile names); both come from one query per page.
 */
export function describeAuditEvent(event: AuditEventFacts, { people, names, timeZone }: { people: ReadonlyMap<string, AuditPerson>; names: RecordNames; timeZone: string }): AuditLine {
  const person = event.actorId ? people.get(event.actorId) : undefined;
  const at = (iso: string) => auditSiteText(iso, timeZone);
  const noun = NOUNS[event.entityType] ?? event.entityType.replace(/-/g, " ");
  const recordName = event.entityId ? names.get(event.entityId) : undefined;
  const record = recordName ?? (event.entityId ? `(a ${noun} not on file)` : "");
  const facts: Facts = { record, old: auditObject(parseAuditValue(event.oldValue)) ?? {}, new: auditObject(parseAuditValue(event.newValue)) ?? {}, names, at };
  const kind = AUDIT_ACTIONS[event.action];
  const what = kind ? kind.what(facts) : genericWhat(event.action, record);
  return {
    seq: event.seq,
    who: person?.name ?? event.actorEmail ?? "Papin (automatic)",
    role: person ? ROLE_LABELS[person.role] : null,
    what,
    kind: auditActionLabel(event.action),
    when: { site: at(event.at), utc: auditUtcText(event.at) },
    reason: event.reason,
    changes: auditChanges(event.oldValue, event.newValue, names, at),
    record: event.entityId && event.entityType !== "site" ? { label: recordName ? `${noun} ${recordName}` : `${noun} not on file`, href: recordHref(event.entityType, event.entityId) } : null,
  };
}

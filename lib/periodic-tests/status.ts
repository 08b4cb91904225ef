/**
 * Whether a sterilizer may be used, from its schedule, its confirmed test outcomes and the engineers' decisions.
 * Pure: values in, a status out. Fails closed: a required test never passed counts as overdue.
 */
import { localDateTimeToInstant, testKindLabel, type SterilizerStatus } from "@/lib/domain";
import { addDays, daysBetween, localDate } from "./schedule";

export type OutcomeSource = { type: "cycle" | "periodic-test"; id: string };
/** A signed test: a cycle or periodic record approved (pass) or confirmed as failed (fail). */
export type ConfirmedOutcome = { kind: string; at: string; result: "pass" | "fail"; source: OutcomeSource };
export type StatusSchedule = { kind: string; intervalDays: number; requiredBeforeUse: boolean; /** when the test became part of the schedule */ since: string };
/** An engineer's signed decision; a release lists the failures it acknowledged (source keys). */
export type ManualStatusEvent = { status: SterilizerStatus; at: string; reason: string; byName: string; acknowledged: string[] };

export type StatusCause = { kind: "manual" | "failure" | "repeat-needed" | "overdue" | "never-passed"; testKind: string | null; since: string; sentence: string };
export type StatusFinding = { status: SterilizerStatus; reason: string; since: string; causes: StatusCause[] };

export type StatusInput = {
  schedules: StatusSchedule[];
  outcomes: ConfirmedOutcome[];
  manual: ManualStatusEvent[];
  now: Date;
  timeZone: string;
  /** the cached state; an in-use sterilizer stays "in use since" the moment it last became so */
  previous: { status: SterilizerStatus; since: string | null } | null;
};

export const sourceKey = (s: OutcomeSource) => `${s.type}:${s.id}`;
const latest = <T extends { at: string }>(items: T[]): T | null => items.reduce<T | null>((best, x) => (!best || x.at > best.at ? x : best), null);
/** The kind's label inside a sentence: "air leakage test", but a name such as "Bowie-Dick test" keeps its capitals. */
const lower = (kind: string) => {
  const label = testKindLabel(kind);
  const firstWord = label.split(/[\s,:]/)[0];
  return firstWord.slice(1) === firstWord.slice(1).toLowerCase() ? label.charAt(0).toLowerCase() + label.slice(1) : label;
};

/** The latest pass and the latest failure of each kind. */
function latestByKind(outcomes: ConfirmedOutcome[]) {
  const byKind = new Map<string, { pass: ConfirmedOutcome | null; fail: ConfirmedOutcome | null }>();
  for (const o of outcomes) {
    const entry = byKind.get(o.kind) ?? { pass: null, fail: null };
    if (!entry[o.result] || o.at > entry[o.result]!.at) entry[o.result] = o;
    byKind.set(o.kind, entry);
  }
  return byKind;
}

/** The failures a release made now acknowledges: the latest failure of every kind (whether or not a pass followed it). */
export function failuresToAcknowledge(outcomes: ConfirmedOutcome[]): string[] {
  return [...latestByKind(outcomes).values()].flatMap((e) => (e.fail ? [sourceKey(e.fail.source)] : []));
}

/** The kind's latest failure when no pass came after it (a pass at the same instant does not: fail closed). */
const failedLast = ({ pass, fail }: { pass: ConfirmedOutcome | null; fail: ConfirmedOutcome | null }): ConfirmedOutcome | null => (fail && (!pass || fail.at >= pass.at) ? fail : null);

/** Failures of the kinds not required before use: a release acknowledges them. */
function failureCauses(outcomes: ConfirmedOutcome[], required: Set<string>, acknowledged: Set<string>, timeZone: string): StatusCause[] {
  const causes: StatusCause[] = [];
  for (const [kind, latest] of latestByKind(outcomes)) {
    const fail = failedLast(latest);
    if (required.has(kind) || !fail || acknowledged.has(sourceKey(fail.source))) continue;
    const label = testKindLabel(kind);
    causes.push({ kind: "failure", testKind: kind, since: fail.at, sentence: `${label} of ${localDate(fail.at, timeZone)} failed (confirmed).` });
  }
  return causes;
}

function overdueCauses(schedules: StatusSchedule[], outcomes: ConfirmedOutcome[], now: Date, timeZone: string): StatusCause[] {
  const today = localDate(now, timeZone);
  const passes = latestByKind(outcomes);
  const causes: StatusCause[] = [];
  for (const s of schedules.filter((x) => x.requiredBeforeUse)) {
    const latest = passes.get(s.kind) ?? { pass: null, fail: null };
    const pass = latest.pass;
    // A required test whose latest outcome is a failure is not current, whatever a release says: it must pass again.
    const fail = failedLast(latest);
    if (fail) {
      const failedOn = localDate(fail.at, timeZone);
      causes.push({ kind: "repeat-needed", testKind: s.kind, since: fail.at, sentence: `The ${lower(s.kind)} of ${failedOn} failed (confirmed); it must pass again before use.` });
      continue;
    }
    if (!pass) {
      causes.push({ kind: "never-passed", testKind: s.kind, since: s.since, sentence: `No signed passing ${lower(s.kind)} is on record; it is required before use.` });
      continue;
    }
    const lastPassOn = localDate(pass.at, timeZone);
    const dueOn = addDays(lastPassOn, s.intervalDays);
    // Required before use: the sterilizer waits for the test on the day it falls due, not a day later.
    if (daysBetween(today, dueOn) > 0) continue;
    const since = localDateTimeToInstant(`${dueOn}T00:00:00`, timeZone)?.toISOString() ?? `${dueOn}T00:00:00.000Z`;
    const when = dueOn === today ? "is due today" : `has been due since ${dueOn}`;
    causes.push({ kind: "overdue", testKind: s.kind, since, sentence: `The ${lower(s.kind)} ${when} and is required before use (last passed ${lastPassOn}).` });
  }
  return causes;
}

/**
 * Out of use while any cause holds: an engineer's hold not yet released, a confirmed failure that is the latest
 * outcome of its kind and not acknowledged by a release, a required-before-use test due, failed or never passed (a
 * release cannot clear these: only a passing, approved test can). Each cause
 * has held without a break since its start, so the sterilizer has been out of use since the earliest of them.
 */
export function sterilizerStatusOf({ schedules, outcomes, manual, now, timeZone, previous }: StatusInput): StatusFinding {
  const lastManual = latest(manual);
  const lastRelease = latest(manual.filter((m) => m.status === "in-use"));
  const causes: StatusCause[] = [];
  if (lastManual?.status === "out-of-use") {
    causes.push({ kind: "manual", testKind: null, since: lastManual.at, sentence: `Taken out of use by ${lastManual.byName}: ${lastManual.reason.replace(/[.\s]+$/, "")}.` });
  }
  const required = new Set(schedules.filter((s) => s.requiredBeforeUse).map((s) => s.kind));
  causes.push(...failureCauses(outcomes, required, new Set(lastRelease?.acknowledged ?? []), timeZone));
  causes.push(...overdueCauses(schedules, outcomes, now, timeZone));
  causes.sort((a, b) => a.since.localeCompare(b.since));
  if (causes.length > 0) return { status: "out-of-use", reason: causes.map((c) => c.sentence).join(" "), since: causes[0].since, causes };

  const since = previous?.status === "in-use" && previous.since ? previous.since : now.toISOString();
  const lastPass = latest(outcomes.filter((o) => o.result === "pass"));
  const reason =
    lastRelease && lastManual === lastRelease && (!lastPass || lastRelease.at >= lastPass.at)
      ? `Released by ${lastRelease.byName}: ${lastRelease.reason.replace(/[.\s]+$/, "")}.`
      : required.size === 0
        ? "No test is required before use and no confirmed failure is open."
        : "The tests required before use are current and no confirmed failure is open.";
  return { status: "in-use", reason, since, causes };
}

/** Calendar arithmetic on plain dates (YYYY-MM-DD) so a due date means the same day everywhere. */

const DAY_MS = 86_400_000;

export function addDays(date: string, days: number): string {
  const t = Date.parse(`${date}T00:00:00Z`);
  return new Date(t + days * DAY_MS).toISOString().slice(0, 10);
}

export function daysBetween(from: string, to: string): number {
  return Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / DAY_MS);
}

/** The calendar date of an instant in a time zone, as YYYY-MM-DD. */
export function localDate(instant: Date | string, timeZone = "UTC"): string {
  const d = typeof instant === "string" ? new Date(instant) : instant;
  const parts = new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).formatToParts(d);
  const get = (type: string) => parts.find((p) => p.type === type)?.value ?? "";
  return `${get("year")}-${get("month")}-${get("day")}`;
}

export type ScheduleState = "never" | "failed" | "overdue" | "due-today" | "due-soon" | "ok";

export type ScheduleStatus = {
  state: ScheduleState;
  /** the date by which the next passing test is needed; null when no passing test is on record */
  dueOn: string | null;
  /** negative when overdue */
  daysLeft: number | null;
  lastPassOn: string | null;
  lastAttemptFailed: boolean;
};

/**
 * A scheduled test is satisfied by a passing result: the next one is due `intervalDays` after
 * the date of the last pass. A failure after the last pass means the sterilizer needs a repeat.
 */
export function scheduleStatus({
  intervalDays,
  lastPassAt,
  lastAttempt,
  today,
  timeZone = "UTC",
}: {
  intervalDays: number;
  lastPassAt: string | null;
  lastAttempt: { at: string; result: "pass" | "fail" } | null;
  today: string;
  timeZone?: string;
}): ScheduleStatus {
  const lastPassOn = lastPassAt ? localDate(lastPassAt, timeZone) : null;
  const lastAttemptFailed = !!lastAttempt && lastAttempt.result === "fail" && (!lastPassAt || lastAttempt.at > lastPassAt);
  if (!lastPassOn) return { state: lastAttemptFailed ? "failed" : "never", dueOn: null, daysLeft: null, lastPassOn, lastAttemptFailed };
  const dueOn = addDays(lastPassOn, intervalDays);
  const daysLeft = daysBetween(today, dueOn);
  let state: ScheduleState;
  if (lastAttemptFailed) state = "failed";
  else if (daysLeft < 0) state = "overdue";
  else if (daysLeft === 0) state = "due-today";
  else if (daysLeft <= Math.min(7, Math.max(1, Math.floor(intervalDays / 4)))) state = "due-soon";
  else state = "ok";
  return { state, dueOn, daysLeft, lastPassOn, lastAttemptFailed };
}

/** States that need someone to act, most urgent first. */
export const SCHEDULE_URGENCY: Record<ScheduleState, number> = { failed: 0, never: 1, overdue: 2, "due-today": 3, "due-soon": 4, ok: 5 };

export function needsAction(state: ScheduleState): boolean {
  return SCHEDULE_URGENCY[state] <= SCHEDULE_URGENCY["due-today"];
}

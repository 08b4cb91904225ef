/**
 * Requalification of loading patterns (issue 14 §7): an approved study sets the date the pattern falls due again
 * (loading_patterns.requalification_due_on, a date on the site's calendar). Pure: dates in, a state and words out.
 */
import { loadTypeLabel } from "./sensor-positions";

/** never: no approved study yet; overdue: the due date is before today; due-soon: within REQUALIFICATION_SOON_DAYS. */
export const REQUALIFICATION_STATES = ["never", "overdue", "due-soon", "ok"] as const;
export type RequalificationState = (typeof REQUALIFICATION_STATES)[number];
export const REQUALIFICATION_STATE_LABELS: Record<RequalificationState, string> = {
  never: "Never qualified",
  overdue: "Requalification overdue",
  "due-soon": "Requalification due soon",
  ok: "Qualified",
};

/** How far ahead a coming requalification is shown, in days (Papin's choice: time to plan three runs). */
export const REQUALIFICATION_SOON_DAYS = 30;

const dayNumber = (isoDate: string): number => Math.floor(Date.parse(`${isoDate}T00:00:00Z`) / 86_400_000);

/** The state of a pattern whose requalification falls due on `dueOn` (YYYY-MM-DD or null), `today` on the site's calendar. */
export function requalificationStateOf(dueOn: string | null, today: string): RequalificationState {
  if (!dueOn) return "never";
  const daysLeft = dayNumber(dueOn) - dayNumber(today);
  // An unreadable stored date proves nothing: treat it as overdue (fail closed).
  if (Number.isNaN(daysLeft) || daysLeft < 0) return "overdue";
  return daysLeft <= REQUALIFICATION_SOON_DAYS ? "due-soon" : "ok";
}

/** Whether the pattern's load may not be run: marked required before use and not (or no longer) qualified. */
export const isPatternBlocked = (state: RequalificationState, requiredBeforeUse: boolean): boolean => requiredBeforeUse && (state === "overdue" || state === "never");

/** "wrapped instruments" for a known load type, else the pattern's own name in quotes. */
export function patternLoadWords(loadType: string | null, patternName: string): string {
  return loadType ? loadTypeLabel(loadType).toLowerCase() : `the load “${patternName}”`;
}

/** The board's sentence for a blocked pattern: the sterilizer stays in use for other loads. */
export function blockedPatternNotice(loadType: string | null, patternName: string, state: RequalificationState): string {
  return `Not to be used for ${patternLoadWords(loadType, patternName)} until ${state === "never" ? "qualified" : "requalified"}.`;
}

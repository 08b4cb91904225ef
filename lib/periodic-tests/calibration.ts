import { daysBetween } from "./schedule";

export type CalibrationState = "none" | "overdue" | "due-soon" | "valid";

const CALIBRATION_WARNING_DAYS = 30;

/** valid / due within 30 days / overdue, from the latest certificate's due date (YYYY-MM-DD). */
export function calibrationState(dueOn: string | null | undefined, today: string, warningDays = CALIBRATION_WARNING_DAYS): { state: CalibrationState; daysLeft: number | null } {
  if (!dueOn) return { state: "none", daysLeft: null };
  const daysLeft = daysBetween(today, dueOn.slice(0, 10));
  if (daysLeft < 0) return { state: "overdue", daysLeft };
  if (daysLeft <= warningDays) return { state: "due-soon", daysLeft };
  return { state: "valid", daysLeft };
}

/** The certificate in force: the one calibrated most recently (ties: the later due date). */
export function latestCertificate<T extends { calibratedOn: string; dueOn: string }>(certificates: readonly T[]): T | null {
  let best: T | null = null;
  for (const c of certificates) {
    if (!best || c.calibratedOn > best.calibratedOn || (c.calibratedOn === best.calibratedOn && c.dueOn > best.dueOn)) best = c;
  }
  return best;
}

/**
 * The certificate in force on a test's date (YYYY-MM-DD): the latest calibrated on or before that day, and whether its
 * due date had passed by then. Null when no certificate predates the test: the instrument was not shown to be calibrated.
 */
export function certificateOnDate<T extends { calibratedOn: string; dueOn: string }>(certificates: readonly T[], testDate: string): { certificate: T; lapsed: boolean } | null {
  const day = testDate.slice(0, 10);
  const inForce = latestCertificate(certificates.filter((c) => c.calibratedOn.slice(0, 10) <= day));
  return inForce ? { certificate: inForce, lapsed: inForce.dueOn.slice(0, 10) < day } : null;
}

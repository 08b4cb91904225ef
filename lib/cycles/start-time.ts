import { instantInZone, isValidTimeZone, zoneOffsetMs } from "@/lib/domain";
import type { TimeFormat } from "@/lib/logger-files/types";

/** Time formats that carry a calendar date, so the file itself says when the cycle started. */
export function timeFormatHasDate(format: TimeFormat): boolean {
  return format !== "elapsed-seconds" && format !== "clock";
}

export type CycleStart = { ok: true; startedAt: string } | { ok: false; status: 409 | 422; field: "startedAt" | "files"; message: string };

/**
 * When the cycle started, as an instant (ISO 8601, UTC). The file's own clock wins; a clock
 * without a zone is read in the site's time zone, never the server's. A file with elapsed times
 * only needs the start from the user (`startedAt`); there is no fallback to the upload time.
 */
export function resolveCycleStart({ fileStartedAt, givenStartedAt, timeZone }: { fileStartedAt: string | null; givenStartedAt?: string | null; timeZone: string }): CycleStart {
  const source = fileStartedAt ?? givenStartedAt?.trim() ?? "";
  if (!source) {
    return {
      ok: false,
      status: 422,
      field: "startedAt",
      message: `This file holds elapsed times without a date, so give the cycle's start time in startedAt (ISO 8601, e.g. 2025-03-03T07:30, read in the site's time zone ${timeZone}).`,
    };
  }
  const zoneless = !/(?:[zZ]|[+-]\d{2}:?\d{2})$/.test(source);
  if (zoneless && !isValidTimeZone(timeZone)) {
    return {
      ok: false,
      status: 409,
      field: fileStartedAt ? "files" : "startedAt",
      message: `The site's time zone "${timeZone}" is not a known IANA zone, so a local time cannot be placed; an administrator corrects it in the site settings.`,
    };
  }
  const instant = instantInZone(source, timeZone);
  if (!instant) {
    return fileStartedAt
      ? { ok: false, status: 422, field: "files", message: `The file's first time, ${fileStartedAt}, is not a real date and time.` }
      : { ok: false, status: 422, field: "startedAt", message: `startedAt "${source}" is not a real date and time; write it as ISO 8601, e.g. 2025-03-03T07:30.` };
  }
  return { ok: true, startedAt: instant.toISOString() };
}

/** "202503030730": an instant as the site's wall clock showed it, for default cycle numbers. */
export function siteClockStamp(instantIso: string, timeZone: string): string {
  const ms = Date.parse(instantIso);
  const wall = new Date(ms + (isValidTimeZone(timeZone) ? zoneOffsetMs(ms, timeZone) : 0)).toISOString();
  return wall.slice(0, 16).replace(/[-:T]/g, "");
}

/** Instants printed twice: in UTC and on the site's clock, with the zone named. */
import { instantInZone, isValidTimeZone } from "@/lib/domain";

export { isValidTimeZone };

type Parts = { year: number; month: number; day: number; hour: number; minute: number; second: number; zoneName: string };

function partsIn(date: Date, timeZone: string): Parts {
  const formatter = new Intl.DateTimeFormat("en-GB", {
    timeZone,
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    second: "2-digit",
    hourCycle: "h23",
    timeZoneName: "short",
  });
  const get = (type: string) => formatter.formatToParts(date).find((p) => p.type === type)?.value ?? "";
  return {
    year: Number(get("year")),
    month: Number(get("month")),
    day: Number(get("day")),
    hour: Number(get("hour")),
    minute: Number(get("minute")),
    second: Number(get("second")),
    zoneName: get("timeZoneName"),
  };
}

/**
 * The instant an ISO text stands for. A text without an offset is a wall-clock reading from a
 * logger set to the site's time (how logger files write their times), so it is placed in that zone;
 * with an unknown zone it is read as UTC.
 */
export function instantOf(iso: string, siteTimeZone: string): Date | null {
  return instantInZone(iso, siteTimeZone) ?? instantInZone(iso, "UTC");
}

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];
const pad = (n: number) => String(n).padStart(2, "0");

/** "2025-03-03 07:30:00 UTC" */
export function utcText(date: Date): string {
  return `${date.getUTCFullYear()}-${pad(date.getUTCMonth() + 1)}-${pad(date.getUTCDate())} ${pad(date.getUTCHours())}:${pad(date.getUTCMinutes())}:${pad(date.getUTCSeconds())} UTC`;
}

/** "3 Mar 2025 07:30:00 GMT (Europe/London)" */
export function siteText(date: Date, timeZone: string): string {
  if (!isValidTimeZone(timeZone)) return utcText(date);
  const p = partsIn(date, timeZone);
  return `${p.day} ${MONTHS[p.month - 1]} ${p.year} ${pad(p.hour)}:${pad(p.minute)}:${pad(p.second)} ${p.zoneName} (${timeZone})`;
}

/** Both clocks for an ISO text; "—" when there is none. */
export function bothClocks(iso: string | null | undefined, timeZone: string): { site: string; utc: string } {
  if (!iso) return { site: "—", utc: "—" };
  const date = instantOf(iso, timeZone);
  if (!date) return { site: iso, utc: iso };
  return { site: siteText(date, timeZone), utc: utcText(date) };
}

/** The site's clock time (hh:mm:ss) at an offset from a start instant. */
export function siteClockAt(start: Date, offsetS: number, timeZone: string): string {
  const date = new Date(start.getTime() + offsetS * 1000);
  if (!isValidTimeZone(timeZone)) return `${pad(date.getUTCHours())}:${pad(date.getUTCMinutes())}:${pad(date.getUTCSeconds())}`;
  const p = partsIn(date, timeZone);
  return `${pad(p.hour)}:${pad(p.minute)}:${pad(p.second)}`;
}

/**
 * Wall-clock readings and instants. Logger files usually write local date-times without a zone;
 * Papin reads them in the site's IANA time zone (never the server's), with the zone's own
 * daylight-saving rules from Intl.
 */

const ZONE_SUFFIX = /(?:[zZ]|[+-]\d{2}:?\d{2})$/;
const LOCAL_DATE_TIME = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?$/;
const DAY_MS = 86_400_000;

/** Whether an ISO 8601 date-time names its zone (Z or an offset). */
export function hasZone(iso: string): boolean {
  return ZONE_SUFFIX.test(iso.trim());
}

export function isValidTimeZone(timeZone: string): boolean {
  if (!timeZone) return false;
  try {
    new Intl.DateTimeFormat("en-GB", { timeZone });
    return true;
  } catch {
    return false;
  }
}

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-GB", { timeZone, year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit", hourCycle: "h23" });
    formatters.set(timeZone, f);
  }
  return f;
}

/** How far the zone's clock is ahead of UTC at an instant, in milliseconds (BST: +3 600 000). */
export function zoneOffsetMs(instantMs: number, timeZone: string): number {
  const whole = Math.floor(instantMs / 1000) * 1000;
  const parts = formatterFor(timeZone).formatToParts(new Date(whole));
  const get = (type: Intl.DateTimeFormatPartTypes) => Number(parts.find((p) => p.type === type)?.value);
  const wallAsUtc = Date.UTC(get("year"), get("month") - 1, get("day"), get("hour"), get("minute"), get("second"));
  return wallAsUtc - whole;
}

/** The wall-clock reading as if it were UTC, in ms; null when the text is not a zone-less local date-time or not a real date. */
function wallMsOf(local: string): number | null {
  const m = LOCAL_DATE_TIME.exec(local.trim());
  if (!m) return null;
  const [year, month, day, hour, minute] = m.slice(1, 6).map(Number);
  const second = Number(m[6] ?? 0);
  const ms = m[7] ? Math.round(Number(`0.${m[7]}`) * 1000) : 0;
  if (month < 1 || month > 12 || day < 1 || hour > 23 || minute > 59 || second > 59) return null;
  const wall = Date.UTC(year, month - 1, day, hour, minute, second, ms);
  if (new Date(wall).getUTCDate() !== day) return null; // 30 February and the like
  return wall;
}

/**
 * The instant at which the site's clock showed a zone-less local date-time ("2024-03-31T02:30:00").
 * Around a daylight-saving change it resolves as the "compatible" rule of ECMAScript Temporal
 * does: a time that occurs twice (clocks back) is the earlier one; a time the clocks skipped
 * (clocks forward) is read with the offset before the change, so it lands after the jump.
 * Null when the text is not such a date-time, the date is not real, or the zone is unknown.
 */
export function localDateTimeToInstant(local: string, timeZone: string): Date | null {
  const wall = wallMsOf(local);
  if (wall === null || !isValidTimeZone(timeZone)) return null;
  const before = zoneOffsetMs(wall - DAY_MS, timeZone);
  const after = zoneOffsetMs(wall + DAY_MS, timeZone);
  const fits = [wall - before, wall - after].filter((t) => zoneOffsetMs(t, timeZone) === wall - t);
  if (fits.length > 0) return new Date(Math.min(...fits));
  return new Date(wall - before);
}

/** The instant an ISO 8601 text stands for: as written when it names its zone, else read on the site's clock. */
export function instantInZone(iso: string, timeZone: string): Date | null {
  const text = iso.trim();
  if (hasZone(text)) {
    const date = new Date(text);
    return Number.isNaN(date.getTime()) ? null : date;
  }
  return localDateTimeToInstant(text, timeZone);
}

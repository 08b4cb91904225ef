export type TimeFormat =
  | "iso" // 2024-05-01T10:00:00 or 2024-05-01 10:00:00, optional fraction and offset
  | "dmy" // 01.05.2024 10:00:00 (also / or - between the date parts), 24-hour clock
  | "mdy" // 05/01/2024 10:00:00, 24-hour clock
  | "mdy-ampm" // 05/01/2024 10:00:00 AM
  | "dmy-ampm" // 01/05/2024 10:00:00 AM
  | "clock" // 10:00:00 time of day (or h:mm:ss elapsed); a step back past midnight adds a day
  | "elapsed-seconds"; // numbers: seconds (or minutes/hours, given by the header) since the start

const DIGIT_GROUPS = new Float64Array(9);

/** Parsed cell: seconds on a UTC-naive scale, plus offset when the text carried one. */
export type ParsedTime = { seconds: number; hasDate: boolean; hasOffset: boolean };

/**
 * Splits text[start,end) into numeric groups. Returns the count, or −1 if the text holds
 * characters that a date-time never has. Fraction of seconds is kept as a decimal in group 'fraction'.
 */
function scanGroups(text: string, start: number, end: number, out: Float64Array, state: { ampm: number; offsetMinutes: number; hasOffset: boolean; fraction: number; separators: string }): number {
  let count = 0;
  let current = -1;
  state.ampm = 0;
  state.hasOffset = false;
  state.offsetMinutes = 0;
  state.fraction = 0;
  state.separators = "";
  let i = start;
  while (i < end && text.charCodeAt(i) === 32) i++;
  while (end > i && (text.charCodeAt(end - 1) === 32 || text.charCodeAt(end - 1) === 13)) end--;
  for (; i < end; i++) {
    const code = text.charCodeAt(i);
    if (code >= 48 && code <= 57) {
      current = current < 0 ? code - 48 : current * 10 + (code - 48);
      continue;
    }
    if (current >= 0) {
      if (count >= out.length) return -1;
      out[count++] = current;
      current = -1;
    }
    if ((code === 46 || code === 44) && count >= 3 && state.separators.endsWith("::")) {
      // fraction of a second after h:m:s
      let j = i + 1;
      let scale = 0.1;
      let fraction = 0;
      while (j < end) {
        const c = text.charCodeAt(j);
        if (c < 48 || c > 57) break;
        fraction += (c - 48) * scale;
        scale /= 10;
        j++;
      }
      state.fraction = fraction;
      i = j - 1;
      continue;
    }
    if (code === 65 || code === 97 || code === 80 || code === 112) {
      // AM / PM
      const next = i + 1 < end ? text.charCodeAt(i + 1) | 32 : 0;
      if (next !== 109) return -1;
      state.ampm = (code | 32) === 97 ? 1 : 2;
      i++;
      continue;
    }
    if (code === 90 || code === 122) {
      state.hasOffset = true;
      continue;
    }
    if ((code === 43 || code === 45) && count >= 5 && state.separators.includes(":")) {
      // UTC offset ±hh:mm or ±hhmm
      const sign = code === 43 ? 1 : -1;
      const rest = text.slice(i + 1, end).replace(":", "");
      if (!/^\d{2,4}$/.test(rest)) return -1;
      const hours = Number(rest.slice(0, 2));
      const minutes = rest.length > 2 ? Number(rest.slice(2)) : 0;
      state.offsetMinutes = sign * (hours * 60 + minutes);
      state.hasOffset = true;
      break;
    }
    if (code === 58 || code === 46 || code === 47 || code === 45 || code === 32 || code === 84 || code === 116 || code === 44) {
      state.separators += String.fromCharCode(code === 116 ? 84 : code);
      continue;
    }
    return -1;
  }
  if (current >= 0) {
    if (count >= out.length) return -1;
    out[count++] = current;
  }
  return count;
}

function digitsAt(text: string, at: number, count: number): number {
  let value = 0;
  for (let i = 0; i < count; i++) {
    const d = text.charCodeAt(at + i) - 48;
    if (d < 0 || d > 9) return NaN;
    value = value * 10 + d;
  }
  return value;
}

/** "YYYY-MM-DD HH:MM:SS" or with a T: the layout nearly every logger writes, read without scanning. */
function fixedIsoSeconds(text: string, at: number): number {
  if (text.charCodeAt(at + 4) !== 45 || text.charCodeAt(at + 7) !== 45 || text.charCodeAt(at + 13) !== 58 || text.charCodeAt(at + 16) !== 58) return NaN;
  const middle = text.charCodeAt(at + 10);
  if (middle !== 32 && middle !== 84 && middle !== 116) return NaN;
  return dateSeconds(digitsAt(text, at, 4), digitsAt(text, at + 5, 2), digitsAt(text, at + 8, 2), digitsAt(text, at + 11, 2), digitsAt(text, at + 14, 2), digitsAt(text, at + 17, 2));
}

const scanState = { ampm: 0, offsetMinutes: 0, hasOffset: false, fraction: 0, separators: "" };

function hourWithAmPm(hour: number, ampm: number): number {
  if (ampm === 0) return hour;
  if (hour < 1 || hour > 12) return NaN;
  if (ampm === 1) return hour === 12 ? 0 : hour;
  return hour === 12 ? 12 : hour + 12;
}

const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

function isLeapYear(year: number): boolean {
  return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
}

/** Seconds since 1970-01-01 of a calendar date and clock time (proleptic Gregorian, no time zone). */
function dateSeconds(year: number, month: number, day: number, hour: number, minute: number, second: number): number {
  if (year < 100) year += 2000;
  if (month < 1 || month > 12 || day < 1 || hour > 24 || minute > 59 || second > 60) return NaN;
  const monthDays = month === 2 && isLeapYear(year) ? 29 : DAYS_IN_MONTH[month - 1];
  if (day > monthDays) return NaN;
  // Days from civil date (H. Hinnant's algorithm).
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yearOfEra = y - era * 400;
  const dayOfYear = Math.floor((153 * (month + (month > 2 ? -3 : 9)) + 2) / 5) + day - 1;
  const dayOfEra = yearOfEra * 365 + Math.floor(yearOfEra / 4) - Math.floor(yearOfEra / 100) + dayOfYear;
  const days = era * 146097 + dayOfEra - 719468;
  return days * 86400 + hour * 3600 + minute * 60 + second;
}

/**
 * Parses one time cell in text[start,end) as seconds. For absolute formats the scale is
 * seconds since 1970 on the file's own clock (no time zone unless the cell has one).
 * Returns NaN when the cell does not match the format.
 */
export function parseTimeCell(text: string, start: number, end: number, format: TimeFormat): number {
  if (format === "elapsed-seconds") return NaN; // handled by the number parser
  if (format === "iso" && end - start === 19) {
    const fast = fixedIsoSeconds(text, start);
    if (fast === fast) return fast;
  }
  const g = DIGIT_GROUPS;
  const count = scanGroups(text, start, end, g, scanState);
  if (count < 0) return NaN;
  const s = scanState;
  if (format === "clock") {
    if (count < 2 || count > 3 || (s.ampm === 0 && g[0] > 99)) return NaN;
    if (!/^::? ?$/.test(s.separators)) return NaN;
    const hour = s.ampm ? hourWithAmPm(g[0], s.ampm) : g[0];
    return hour * 3600 + g[1] * 60 + (count === 3 ? g[2] : 0) + s.fraction;
  }
  if (count < 5) return NaN;
  let seconds: number;
  const secondsPart = count >= 6 ? g[5] : 0;
  if (format === "iso") {
    if (!/^--[T ]::?$/.test(s.separators)) return NaN;
    if (s.ampm) return NaN;
    seconds = dateSeconds(g[0], g[1], g[2], g[3], g[4], secondsPart);
    if (s.hasOffset) seconds -= s.offsetMinutes * 60;
  } else {
    if (!/^([./-])\1 ::? ?$/.test(s.separators)) return NaN;
    const wantsAmPm = format === "mdy-ampm" || format === "dmy-ampm";
    if (wantsAmPm !== (s.ampm !== 0)) return NaN;
    const hour = hourWithAmPm(g[3], s.ampm);
    const dayFirst = format === "dmy" || format === "dmy-ampm";
    seconds = dayFirst ? dateSeconds(g[2], g[1], g[0], hour, g[4], secondsPart) : dateSeconds(g[2], g[0], g[1], hour, g[4], secondsPart);
  }
  return seconds + s.fraction;
}

export function cellHasOffset(text: string): boolean {
  scanGroups(text, 0, text.length, DIGIT_GROUPS, scanState);
  return scanState.hasOffset;
}

const ISO_RE = /^\s*\d{4}-\d{1,2}-\d{1,2}[Tt ]\d{1,2}:\d{2}(:\d{2}([.,]\d+)?)?\s*(Z|z|[+-]\d{2}:?\d{2})?\s*$/;
const DATE_TIME_RE = /^\s*(\d{1,2})([./-])(\d{1,2})\2(\d{2}|\d{4})\s+(\d{1,2}):\d{2}(:\d{2}([.,]\d+)?)?\s*([AaPp][Mm])?\s*$/;
const CLOCK_RE = /^\s*\d{1,2}:\d{2}(:\d{2}([.,]\d+)?)?\s*([AaPp][Mm])?\s*$/;

export type TimeFormatGuess = { format: TimeFormat; unsure: string[] } | null;

/** Guesses the date-time format of a column from sample cells; null if they are not date-times or clock times. */
export function guessTimeFormat(cells: string[]): TimeFormatGuess {
  const filled = cells.filter((c) => c.trim() !== "");
  if (filled.length === 0) return null;
  // A stray cell (a typo, a comment) must not hide the column: the reader reports it by row later.
  const nonEmpty = filled.filter((c) => ISO_RE.test(c) || CLOCK_RE.test(c) || DATE_TIME_RE.test(c));
  if (nonEmpty.length === 0 || nonEmpty.length < Math.ceil(filled.length * 0.6)) return null;
  if (nonEmpty.every((c) => ISO_RE.test(c))) return { format: "iso", unsure: [] };
  if (nonEmpty.every((c) => CLOCK_RE.test(c))) return { format: "clock", unsure: [] };
  const matches = nonEmpty.map((c) => DATE_TIME_RE.exec(c));
  if (!matches.every((m) => m !== null)) return null;
  const ms = matches as RegExpExecArray[];
  const separator = ms[0][2];
  const ampm = ms.some((m) => m[8] !== undefined);
  if (ampm && !ms.every((m) => m[8] !== undefined)) return null;
  const firstMax = Math.max(...ms.map((m) => Number(m[1])));
  const secondMax = Math.max(...ms.map((m) => Number(m[3])));
  const unsure: string[] = [];
  let dayFirst: boolean;
  if (firstMax > 12 && secondMax <= 12) dayFirst = true;
  else if (secondMax > 12 && firstMax <= 12) dayFirst = false;
  else if (separator === ".") dayFirst = true;
  else if (ampm) dayFirst = false;
  else {
    dayFirst = true;
    unsure.push(`dates such as "${nonEmpty[0].trim()}" could be day/month or month/day; read as day/month/year`);
  }
  if (separator === "/" && ampm && dayFirst) unsure.push("a 12-hour clock with day/month/year dates is unusual");
  const format: TimeFormat = dayFirst ? (ampm ? "dmy-ampm" : "dmy") : ampm ? "mdy-ampm" : "mdy";
  return { format, unsure };
}

/** Header words that name a time column. */
export const TIME_HEADER_RE = /(^|[^a-z])(time|date|datetime|timestamp|zeit|datum|uhrzeit|elapsed|seconds|secs?|tid|heure|hora|tempo)([^a-z]|$)/i;

/** Reads the unit of an elapsed-time header: seconds by default. */
export function elapsedScaleFromHeader(header: string): { scale: number; unit: string } {
  const h = header.toLowerCase();
  if (/(\(|\[|\s|_)(min|minutes?)(\)|\]|\s|$)/.test(h) || /\bminutes?\b/.test(h)) return { scale: 60, unit: "min" };
  if (/(\(|\[|\s|_)(h|hours?|hr)(\)|\]|\s|$)/.test(h)) return { scale: 3600, unit: "h" };
  if (/(\(|\[|\s|_)ms(\)|\]|\s|$)/.test(h)) return { scale: 0.001, unit: "ms" };
  return { scale: 1, unit: "s" };
}

function pad(n: number, width = 2): string {
  return String(n).padStart(width, "0");
}

/** ISO text of a parsed absolute time; with Z only when the file's cells carried an offset. */
export function isoFromSeconds(seconds: number, withOffset: boolean): string {
  const d = new Date(Math.round(seconds * 1000));
  const ms = d.getUTCMilliseconds();
  const base = `${d.getUTCFullYear()}-${pad(d.getUTCMonth() + 1)}-${pad(d.getUTCDate())}T${pad(d.getUTCHours())}:${pad(d.getUTCMinutes())}:${pad(d.getUTCSeconds())}${ms ? "." + pad(ms, 3) : ""}`;
  return withOffset ? base + "Z" : base;
}

import type { Recording } from "../logger-files/types";
import { CHECK_LABELS } from "./checks";
import { GAP_FACTOR, type AcceptanceLimits, type Check, type Diagnosis, type RecordGap } from "./types";
import { round, seconds } from "./words";
import { plural, agree } from "@/lib/domain";

/** Slack for comparing intervals, s: times parsed from text carry float noise (0.1 s steps sum to 0.30000000000000004). */
export const TIME_TOLERANCE_S = 1e-6;

/** How fast the logger recorded, and the longest interval the plateau may hold. */
export type Pace = { samplingIntervalS: number; maxIntervalS: number };

/** The median of the intervals between samples (repeated times left out), s. */
export function medianIntervalS(timesS: ArrayLike<number>): number {
  const intervals = new Float64Array(Math.max(0, timesS.length - 1));
  let count = 0;
  for (let i = 1; i < timesS.length; i++) {
    const interval = timesS[i] - timesS[i - 1];
    if (interval > 0) intervals[count++] = interval;
  }
  const positive = intervals.subarray(0, count).sort();
  return positive[Math.floor(count / 2)] ?? 0;
}

/** The typical interval, and the gap limit: GAP_FACTOR × it, or the profile's maximum when that is shorter. */
export function recordPace(timesS: ArrayLike<number>, limits: AcceptanceLimits): Pace {
  const samplingIntervalS = medianIntervalS(timesS);
  return { samplingIntervalS, maxIntervalS: Math.min(GAP_FACTOR * samplingIntervalS, limits.maxSampleIntervalS ?? Infinity) };
}

/**
 * Around a missing reading at index i: the channel's last reading before it and its next reading
 * after it (the run's own ends when the record starts or ends blank).
 */
export function missingSpan(values: ArrayLike<number>, i: number): { before: number; after: number } {
  let before = i;
  while (before > 0 && values[before] !== values[before]) before--;
  let after = i;
  while (after < values.length - 1 && values[after] !== values[after]) after++;
  return { before, after };
}

export function countMissing(values: ArrayLike<number>): number {
  let missing = 0;
  for (let i = 0; i < values.length; i++) if (values[i] !== values[i]) missing++;
  return missing;
}

export type GapScan = { gaps: RecordGap[]; longestS: number };

/**
 * The gaps in samples [from, to]: intervals between rows over the limit (channel null), and runs of
 * blank cells of one channel whose readings on either side lie further apart than the limit.
 * longestS is the longest interval any channel went without a reading there.
 */
export function findGaps(recording: Recording, from: number, to: number, maxIntervalS: number): GapScan {
  const { timesS } = recording;
  const gaps: RecordGap[] = [];
  let longestS = 0;
  const note = (before: number, after: number, channel: string | null) => {
    const interval = timesS[after] - timesS[before];
    if (interval > longestS) longestS = interval;
    if (interval > maxIntervalS + TIME_TOLERANCE_S) {
      gaps.push({ start: round(timesS[before], 3), end: round(timesS[after], 3), durationS: round(interval, 3), channel });
    }
  };
  for (let i = from + 1; i <= to; i++) note(i - 1, i, null);
  for (const channel of [...recording.temperatures, recording.pressure]) {
    for (let i = from; i <= to; i++) {
      if (channel.values[i] === channel.values[i]) continue;
      const { before, after } = missingSpan(channel.values, i);
      note(before, after, channel.header);
      i = after;
    }
  }
  gaps.sort((a, b) => a.start - b.start);
  return { gaps, longestS };
}

/** A note on long intervals outside the judged span [from, to]: they do not fail the record, but the record says so. */
export function gapsOutsideNote(timesS: ArrayLike<number>, from: number, to: number, maxIntervalS: number): string | null {
  let count = 0;
  let longest = 0;
  let longestAt = 0;
  for (let i = 1; i < timesS.length; i++) {
    if (i > from && i <= to) continue;
    const interval = timesS[i] - timesS[i - 1];
    if (!(interval > maxIntervalS + TIME_TOLERANCE_S)) continue;
    count++;
    if (interval > longest) [longest, longestAt] = [interval, timesS[i - 1]];
  }
  if (count === 0) return null;
  return (
    `${plural(count, "interval")} between samples outside the plateau ${agree(count, "is", "are")} longer than ${seconds(round(maxIntervalS, 3))} ` +
    `(the longest ${seconds(round(longest, 1))} from ${seconds(round(longestAt, 1))}); they do not affect the checks`
  );
}

export function checkRecordComplete(scan: GapScan | null, pace: Pace, basis: string): { check: Check; diagnoses: Diagnosis[] } {
  const diagnoses: Diagnosis[] = [];
  const passed = scan !== null && scan.gaps.length === 0;
  if (scan && !passed) {
    const listed = scan.gaps.map((g) => `${g.channel === null ? "no sample" : `no reading of "${g.channel}"`} from ${seconds(g.start)} to ${seconds(g.end)}`);
    diagnoses.push({
      checkId: "record-complete",
      text:
        `During the plateau the record has ${scan.gaps.length === 1 ? "a gap" : `${scan.gaps.length} gaps`} longer than ${seconds(round(pace.maxIntervalS, 3))}: ${listed.join("; ")}. ` +
        `What happened then cannot be shown, so the hold is not counted across ${scan.gaps.length === 1 ? "it" : "them"}. ` +
        "Look at the logger's memory and battery, the probe's connection and the export settings.",
    });
  }
  const check: Check = {
    id: "record-complete",
    label: CHECK_LABELS["record-complete"],
    passed,
    measured: scan === null ? null : round(scan.longestS, 3),
    limit: round(pace.maxIntervalS, 3),
    comparison: "at-most",
    unit: "s",
    basis,
  };
  return { check, diagnoses };
}

/** Shown beside the equilibration check when the logger was too slow for it. */
export function tooSlowToShowEquilibration(pace: Pace, maxEquilibrationS: number, measuredS: number | null): string {
  const shown = measuredS === null ? "" : ` (the samples show ${seconds(round(measuredS, 1))})`;
  return (
    `The logger recorded every ${seconds(round(pace.samplingIntervalS, 3))}; an equilibration time of at most ${seconds(maxEquilibrationS)} cannot be shown at that interval${shown}. ` +
    `Set the logger to record at least every ${seconds(maxEquilibrationS)} and repeat the test.`
  );
}

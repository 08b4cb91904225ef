/**
 * A logger file replaced after a cycle's first analysis (issue 10: corrections leave a trace). The report states it
 * with the first file's hash; when the new recording starts at another time or carries other channels, the reviewer
 * must acknowledge the differences when signing.
 */

/** What an analysis read from its file that tells one recording from another. */
export type RecordingFacts = { fileName: string; sha256: string; startedAt: string | null; channels: string[] };

export type FileReplacement = {
  first: { fileName: string; sha256: string };
  current: { fileName: string; sha256: string };
  /** plain sentences; empty when the new file starts at the same time with the same channels */
  differences: string[];
};

/** The channel headers an analysis result names (temperatures and pressure), whatever kind of analysis it is. */
export function recordedChannels(result: unknown): string[] {
  const r = (result ?? {}) as { channels?: Array<{ header?: unknown }>; pressureChannel?: unknown };
  const headers = (r.channels ?? []).map((c) => c.header).filter((h): h is string => typeof h === "string");
  if (typeof r.pressureChannel === "string" && r.pressureChannel) headers.push(r.pressureChannel);
  return [...new Set(headers)];
}

/** When the recording started according to the analysis (null for elapsed-time files). */
export function recordedStart(result: unknown): string | null {
  const start = (result as { record?: { startedAt?: unknown } } | null)?.record?.startedAt;
  return typeof start === "string" ? start : null;
}

const quoted = (names: string[]) => names.map((n) => `"${n}"`).join(", ");

/** Null when the current file is the first one (same bytes); otherwise the replacement and how the recordings differ. */
export function describeReplacement(first: RecordingFacts, current: RecordingFacts): FileReplacement | null {
  if (first.sha256 === current.sha256) return null;
  const differences: string[] = [];
  const firstStart = first.startedAt ? Date.parse(first.startedAt) : null;
  const currentStart = current.startedAt ? Date.parse(current.startedAt) : null;
  if (firstStart !== currentStart) {
    differences.push(`The recording starts at ${current.startedAt ?? "an unstated time"}; the first file's started at ${first.startedAt ?? "an unstated time"}.`);
  }
  const added = current.channels.filter((c) => !first.channels.includes(c));
  const missing = first.channels.filter((c) => !current.channels.includes(c));
  if (added.length > 0 || missing.length > 0) {
    const parts = [added.length ? `new channels ${quoted(added)}` : "", missing.length ? `channels of the first file missing: ${quoted(missing)}` : ""].filter(Boolean);
    differences.push(`The channels differ from the first file's: ${parts.join("; ")}.`);
  }
  return { first: { fileName: first.fileName, sha256: first.sha256 }, current: { fileName: current.fileName, sha256: current.sha256 }, differences };
}

/**
 * What the record brings and how it was read (issue 9 rule 12), in the words the record page and
 * the PDF both print: sampling interval, gaps, missing readings, pressure reference, atmosphere.
 * Analyses stored by engine 1.x carry none of it; they say so rather than invent a value.
 */
import type { AnalysisResult, ChannelSummary, RecordGap } from "@/lib/analysis/types";
import type { AtmosphereUsed, PressureReference } from "@/lib/logger-files/types";
import { plural } from "@/lib/domain";

export const NOT_RECORDED = "not recorded by this engine version";

/** A figure: "30 s", "0.5 s", "1 min 30 s" is left to the caller; here seconds with up to 3 decimals. */
const seconds = (s: number) => `${Number(s.toFixed(3)).toLocaleString("en-GB")} s`;
const kpaText = (kpa: number) => `${Number(kpa.toFixed(3))} kPa`;

const REFERENCE_SOURCES: Record<PressureReference["source"], string> = {
  header: "from the pressure column's header marker",
  user: "confirmed by the user at intake",
  option: "set by the analyze command's option",
  assumed: "assumed: the pressure column's header names neither absolute nor gauge; a gauge file read as absolute fails, it never passes",
};

/** "Absolute, from the pressure column's header marker"; caution when nobody said which. */
export function describePressureReference(reference: PressureReference | undefined): { text: string; caution: boolean } {
  if (!reference) return { text: NOT_RECORDED, caution: false };
  const kind = reference.kind === "gauge" ? "Gauge" : "Absolute";
  return { text: `${kind}, ${REFERENCE_SOURCES[reference.source]}`, caution: reference.source === "assumed" };
}

const ATMOSPHERE_SOURCES: Record<AtmosphereUsed["source"], string> = {
  site: "from the site settings",
  mapping: "from the file's mapping",
  option: "from the analyze command's option",
  standard: "the standard atmosphere at sea level",
};

/** "100.8 kPa, from the site settings"; with absolute readings it says the value was not needed. */
export function describeAtmosphere(atmosphere: AtmosphereUsed | undefined, reference: PressureReference | undefined): string {
  if (!atmosphere) return NOT_RECORDED;
  const text = `${kpaText(atmosphere.kpa)}, ${ATMOSPHERE_SOURCES[atmosphere.source]}`;
  return reference?.kind === "absolute" ? `${text} (not needed: the readings are absolute)` : text;
}

/** "every 1 s (median); at most 3 s between samples inside the plateau" */
export function describeSampling(analysis: Pick<AnalysisResult, "input" | "record">): string {
  const input = analysis.input;
  if (!input) return `every ${seconds(analysis.record.medianSampleIntervalS)} (median); longest interval allowed ${NOT_RECORDED}`;
  return `every ${seconds(input.samplingInterval)} (median); at most ${seconds(input.maxIntervalS)} between samples inside the plateau`;
}

export type GapLine = { from: string; to: string; duration: string; what: string };

/** The gaps inside the plateau period, each with its times as the caller prints them (elapsed · clock). */
export function gapLines(gaps: RecordGap[], at: (s: number) => string): GapLine[] {
  return gaps.map((g) => ({ from: at(g.start), to: at(g.end), duration: seconds(g.durationS), what: g.channel === null ? "no sample of any channel" : `no reading of ${g.channel}` }));
}

/** One sentence on the gaps: "none inside the plateau period", or how many. */
export function describeGaps(analysis: Pick<AnalysisResult, "input">): string {
  const gaps = analysis.input?.gaps;
  if (!gaps) return NOT_RECORDED;
  if (gaps.length === 0) return "none inside the plateau period";
  return `${gaps.length} inside the plateau period: the hold is not counted across ${gaps.length === 1 ? "it" : "them"}`;
}

/** Blank cells in the whole record: the temperature channels' and the pressure column's. */
export function describeMissing(analysis: Pick<AnalysisResult, "input" | "channels">): string {
  const input = analysis.input;
  if (!input || analysis.channels.some((c) => c.missing === undefined)) return NOT_RECORDED;
  const temperature = analysis.channels.reduce((n, c) => n + c.missing, 0);
  if (temperature === 0 && input.pressureMissing === 0) return "none";
  const count = (n: number) => plural(n, "reading");
  return `${count(temperature)} of the temperature channels, ${count(input.pressureMissing)} of the pressure (per channel in the channel table)`;
}

/** A channel's missing count for the channel table; "—" when the engine did not record it. */
export function missingCell(channel: Pick<ChannelSummary, "missing">): string {
  return channel.missing === undefined ? "—" : channel.missing.toLocaleString("en-GB");
}

/** "Reference (drain)", "Free space", "Load" */
export function channelRoleLabel(role: ChannelSummary["role"]): string {
  return role === "reference" ? "Reference (drain)" : role === "free-space" ? "Free space" : "Load";
}

/** The record's input facts as label–value rows, for the page's and the PDF's "record and reading" block. */
export function recordInputRows(analysis: Pick<AnalysisResult, "input" | "record" | "channels">): Array<{ label: string; value: string; caution?: boolean }> {
  const reference = describePressureReference(analysis.input?.pressureReference);
  return [
    { label: "Sampling interval", value: describeSampling(analysis) },
    { label: "Gaps", value: describeGaps(analysis) },
    { label: "Missing readings", value: describeMissing(analysis) },
    { label: "Pressure reference", value: reference.text, caution: reference.caution },
    { label: "Atmospheric pressure used", value: describeAtmosphere(analysis.input?.atmosphere, analysis.input?.pressureReference) },
  ];
}

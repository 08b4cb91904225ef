/**
 * Pure helpers behind the cycle record's time chart (uPlot): time axis, traces, zoom windows and
 * the chart in words. SeriesResponse in, numbers and labels out; no DOM, no uPlot at run time.
 * The phase-diagram view has its own model in phase-model.ts.
 */
import type { SeriesResponse } from "./contracts";
import type { AnalysisResult } from "@/lib/analysis/types";
import { hasZone, plural } from "@/lib/domain";

// ---------------------------------------------------------------------------------------------
// Time axis

/** Seconds since the first sample as m:ss (under an hour) or h:mm:ss; tenths when asked. */
export function formatElapsed(seconds: number, options: { forceHours?: boolean; tenths?: boolean } = {}): string {
  if (!Number.isFinite(seconds)) return "—";
  const sign = seconds < 0 ? "−" : "";
  const scale = options.tenths ? 10 : 1;
  const totalUnits = Math.round(Math.abs(seconds) * scale);
  const whole = Math.floor(totalUnits / scale);
  const fraction = totalUnits - whole * scale;
  const h = Math.floor(whole / 3600);
  const m = Math.floor((whole - h * 3600) / 60);
  const s = whole - h * 3600 - m * 60;
  const secs = String(s).padStart(2, "0") + (options.tenths ? `.${fraction}` : "");
  if (h > 0 || options.forceHours) return `${sign}${h}:${String(m).padStart(2, "0")}:${secs}`;
  return `${sign}${String(m).padStart(2, "0")}:${secs}`;
}

/** One clock style for a whole record: h:mm:ss throughout once it lasts an hour or more. */
export function elapsedFormatter(recordDurationS: number): (seconds: number) => string {
  const forceHours = recordDurationS >= 3600;
  return (seconds) => formatElapsed(seconds, { forceHours });
}

/** Tick labels for a visible span: tenths of a second only when the span is under half a minute. */
export function elapsedTickLabels(ticks: number[], spanS: number, recordLongerThanAnHour = false): string[] {
  const tenths = spanS < 30 && ticks.some((t) => Math.abs(t - Math.round(t)) > 1e-6);
  const forceHours = recordLongerThanAnHour || ticks.some((t) => Math.abs(t) >= 3600);
  return ticks.map((t) => formatElapsed(t, { tenths, forceHours }));
}

export { hasZone } from "@/lib/domain";

/**
 * The wall-clock time of a sample in the site's time zone, or null without a start time. A start
 * time without a zone is the logger's own clock and is shown as it is, not shifted.
 */
export function clockTimeAt(startedAt: string | null, seconds: number, timeZone: string): string | null {
  if (!startedAt || !Number.isFinite(seconds)) return null;
  const zoned = hasZone(startedAt);
  const start = new Date(zoned ? startedAt : `${startedAt.trim()}Z`).getTime();
  if (Number.isNaN(start)) return null;
  return new Intl.DateTimeFormat("en-GB", { hour: "2-digit", minute: "2-digit", second: "2-digit", hourCycle: "h23", timeZone: zoned ? timeZone : "UTC" }).format(new Date(start + seconds * 1000));
}

// ---------------------------------------------------------------------------------------------
// Time chart: traces and data

export type TraceSpec = {
  /** index into SeriesResponse.channels */
  channelIndex: number;
  label: string;
  header: string;
  kind: SeriesResponse["channels"][number]["kind"];
  role: SeriesResponse["channels"][number]["role"];
  unit: string;
  scale: "temperature" | "pressure";
  /** the reference (drain) channel: drawn heavier */
  emphasis: boolean;
  dashed: boolean;
  /** the n-th load channel (0-based), for picking a colour; null for the others */
  loadIndex: number | null;
};

const ROLE_ORDER: Record<TraceSpec["role"], number> = { reference: 0, saturation: 1, load: 2, pressure: 3 };

/** One trace per channel: reference first, then the saturation temperature, the load channels, and pressure last. */
export function chartTraces(series: SeriesResponse): TraceSpec[] {
  const ordered = series.channels
    .map((channel, channelIndex) => ({ channel, channelIndex }))
    .sort((a, b) => ROLE_ORDER[a.channel.role] - ROLE_ORDER[b.channel.role] || a.channelIndex - b.channelIndex);
  let loads = 0;
  return ordered.map(({ channel, channelIndex }) => {
    const isLoad = channel.role === "load";
    const shown = displayedHeader(channel.header, channel.kind);
    const label = channel.role === "saturation" ? "Saturation temperature from pressure" : channel.role === "reference" ? `${shown} (reference)` : shown;
    return {
      channelIndex,
      label,
      header: channel.header,
      kind: channel.kind,
      role: channel.role,
      unit: channel.unit,
      scale: channel.kind === "pressure" ? "pressure" : "temperature",
      emphasis: channel.role === "reference",
      dashed: channel.role === "saturation",
      loadIndex: isLoad ? loads++ : null,
    };
  });
}

/**
 * A channel's name for the chart. The API converts every value to °C or kPa abs, so a header that
 * names another unit ("Chamber (bar g)", "Probe (°F)") says what the plotted numbers are.
 */
export function displayedHeader(header: string, kind: SeriesResponse["channels"][number]["kind"]): string {
  if (kind === "pressure") return /kpa\s*(abs|a)\b/i.test(header) ? header : `${header}, as kPa abs`;
  if (kind === "temperature") return /°\s*F|deg\s*F|\(\s*F\s*\)|\(\s*K\s*\)|fahrenheit|kelvin/i.test(header) ? `${header}, as °C` : header;
  return header;
}

/** uPlot's aligned data: the time axis, then one array per trace in the traces' order. */
export function alignedData(series: SeriesResponse, traces: TraceSpec[]): Array<Array<number | null>> {
  return [series.timesS, ...traces.map((t) => series.channels[t.channelIndex].values)];
}

export function resolutionNote(series: SeriesResponse): string {
  const shown = series.timesS.length;
  if (series.fullResolution) {
    if (shown === series.totalSamples) return `Full resolution: all ${shown.toLocaleString("en-GB")} samples of the record.`;
    return `Full resolution: every one of the ${shown.toLocaleString("en-GB")} samples in this window.`;
  }
  return `Downsampled to ${shown.toLocaleString("en-GB")} points of ${series.totalSamples.toLocaleString("en-GB")} samples, keeping each interval's highest and lowest value. Zoom in for full resolution.`;
}

export type TimeWindow = { from: number; to: number };

/** A zoomed view is worth fetching again when it is noticeably narrower than the whole record. */
export function isZoomed(view: TimeWindow, record: TimeWindow): boolean {
  const span = record.to - record.from;
  if (!(span > 0)) return false;
  return view.from > record.from + span * 0.005 || view.to < record.to - span * 0.005;
}

/**
 * The window to ask the series API for: the view plus a quarter of its width either side (so a
 * small pan needs no new request), clamped to the record and rounded so that nearby views share
 * one request.
 */
export function windowToFetch(view: TimeWindow, record: TimeWindow, fullResolutionSpanS = Infinity): TimeWindow {
  const span = Math.max(view.to - view.from, 1e-3);
  const step = span >= 600 ? 10 : span >= 60 ? 1 : 0.1;
  // Keep the margin small enough that a view which fits at full resolution still does.
  const margin = span <= fullResolutionSpanS ? Math.min(span / 4, Math.max(0, (fullResolutionSpanS * 0.98 - span) / 2 - step)) : span / 4;
  const from = Math.max(record.from, Math.floor((view.from - margin) / step) * step);
  const to = Math.min(record.to, Math.ceil((view.to + margin) / step) * step);
  return { from: round(from), to: round(to) };
}

/** The widest window the series API returns at full resolution for `points`, from the record's sampling density. */
export function fullResolutionSpan(totalSamples: number, record: TimeWindow, points: number): number {
  const duration = record.to - record.from;
  if (!(totalSamples > 1 && duration > 0)) return Infinity;
  return (points * duration) / (totalSamples - 1);
}

/** Whether data fetched for `window` covers the whole `view`. */
export function windowCovers(window: TimeWindow, view: TimeWindow): boolean {
  const tolerance = 1e-6 * Math.max(1, Math.abs(view.to));
  return window.from <= view.from + tolerance && window.to >= view.to - tolerance;
}

/** Zoom around the centre of the view by a factor (< 1 zooms in), kept inside the record. */
export function zoomWindow(view: TimeWindow, factor: number, record: TimeWindow, minSpanS = 2): TimeWindow {
  const centre = (view.from + view.to) / 2;
  const recordSpan = record.to - record.from;
  const span = Math.min(Math.max((view.to - view.from) * factor, Math.min(minSpanS, recordSpan)), recordSpan);
  return clampWindow({ from: centre - span / 2, to: centre + span / 2 }, record);
}

/** Move the view by a fraction of its width (negative = earlier), kept inside the record. */
export function panWindow(view: TimeWindow, fraction: number, record: TimeWindow): TimeWindow {
  const shift = (view.to - view.from) * fraction;
  return clampWindow({ from: view.from + shift, to: view.to + shift }, record);
}

function clampWindow(view: TimeWindow, record: TimeWindow): TimeWindow {
  const span = Math.min(view.to - view.from, record.to - record.from);
  let from = view.from;
  if (from < record.from) from = record.from;
  if (from + span > record.to) from = record.to - span;
  return { from, to: from + span };
}

/**
 * Points of the whole-record view: the record page's time chart and phase diagram ask for it, it is the series API's
 * default, and each analysis stores it (lib/cycles/series.ts seriesOverviewOf) so the first chart reads no samples.
 */
export const OVERVIEW_POINTS = 2400;

export function seriesUrl(cycleId: string, options: { points: number; window?: TimeWindow | null }): string {
  const params = new URLSearchParams();
  if (options.window) {
    params.set("from", String(options.window.from));
    params.set("to", String(options.window.to));
  }
  params.set("points", String(options.points));
  return `/api/cycles/${encodeURIComponent(cycleId)}/series?${params.toString()}`;
}

function round(v: number): number {
  return Math.round(v * 1000) / 1000;
}

// ---------------------------------------------------------------------------------------------
// Text summary of the time chart, for screen readers and for anyone who prefers words

export function describeTimeChart(analysis: AnalysisResult, detail: { sterilizationTempC: number; bandK: number }): string {
  const parts: string[] = [];
  const ts = detail.sterilizationTempC;
  const at = elapsedFormatter(analysis.record.durationS);
  parts.push(
    `The record runs ${at(analysis.record.durationS)} with ${analysis.record.samples.toLocaleString("en-GB")} samples about every ${formatNumberShort(analysis.record.medianSampleIntervalS)} s.`,
  );
  if (!analysis.plateau) {
    parts.push(`The reference channel ${analysis.referenceChannel} never reached the sterilization temperature of ${ts} °C, so no plateau was found.`);
  } else {
    parts.push(
      `The plateau starts at ${at(analysis.plateau.start)} when ${analysis.referenceChannel} reaches ${ts} °C and ends at ${at(analysis.plateau.end)}; the sterilization band is ${ts} to ${ts + detail.bandK} °C.`,
    );
    const hold = analysis.saturationTemperatureDuringHold;
    if (hold) {
      parts.push(`During holding the saturation temperature computed from chamber pressure was ${hold.min.toFixed(1)} to ${hold.max.toFixed(1)} °C.`);
    }
  }
  const flags = analysis.saturation.flags;
  if (flags.length === 0) {
    if (analysis.plateau) parts.push("No saturation flag: the reference stayed within the limit of saturated steam throughout the plateau.");
  } else {
    parts.push(
      `${plural(flags.length, "saturation flag")}: ` +
        flags
          .map(
            (f) =>
              `${f.kind === "below" ? "colder than saturation (air or non-condensable gas)" : "hotter than saturation (superheat)"} from ${at(f.start)} to ${at(f.end)}, worst ${signedTenths(f.worst)} K`,
          )
          .join("; ") +
        ".",
    );
  }
  return parts.join(" ");
}

function formatNumberShort(v: number): string {
  return Number.isInteger(v) ? String(v) : v.toFixed(1);
}

/** A figure with its sign (a true minus) and one decimal: "+0.2", "−2.4". */
export function signedTenths(v: number): string {
  return `${v > 0 ? "+" : v < 0 ? "−" : ""}${Math.abs(v).toFixed(1)}`;
}

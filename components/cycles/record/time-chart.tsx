"use client";

import "uplot/dist/uPlot.min.css";
import { useCallback, useEffect, useId, useMemo, useRef, useState } from "react";
import uPlot from "uplot";
import type { SeriesResponse } from "@/lib/cycles/contracts";
import {
  alignedData,
  chartTraces,
  clockTimeAt,
  elapsedTickLabels,
  formatElapsed,
  fullResolutionSpan,
  isZoomed,
  panWindow,
  resolutionNote,
  windowCovers,
  windowToFetch,
  zoomWindow,
  type TimeWindow,
  type TraceSpec,
} from "@/lib/cycles/chart-model";
import { TIME_STEPS_S } from "@/lib/charts/scale";
import { CHART, loadColour } from "./chart-colors";
import { OVERVIEW_POINTS, WINDOW_POINTS, useSeries } from "./series-fetch";

const HEIGHT = 420;

type Props = {
  cycleId: string;
  cycleNumber: string;
  timeZone: string;
  /** the chart in words (describeTimeChart), computed on the server from the analysis */
  summary: string;
};

export function TimeChart({ cycleId, cycleNumber, timeZone, summary }: Props) {
  const summaryId = useId();
  const noteId = useId();
  const [view, setView] = useState<TimeWindow | null>(null);
  const [fetchWindow, setFetchWindow] = useState<TimeWindow | null>(null);
  const overview = useSeries(cycleId, null, OVERVIEW_POINTS);
  const zoomed = useSeries(cycleId, fetchWindow, WINDOW_POINTS, fetchWindow !== null);

  const record = overview.data?.window ?? null;
  const shown: SeriesResponse | undefined =
    view && zoomed.data && windowCovers(zoomed.data.window, view) ? zoomed.data : overview.data;
  const loadingWindow = view !== null && shown === overview.data && zoomed.isLoading;

  const fullSpan = overview.data ? fullResolutionSpan(overview.data.totalSamples, overview.data.window, WINDOW_POINTS) : Infinity;
  // A record small enough to arrive whole needs no further requests when zoomed.
  const overviewIsComplete = overview.data?.fullResolution === true;
  const onViewChange = useCallback(
    (next: TimeWindow, whole: TimeWindow) => {
      if (!isZoomed(next, whole)) {
        setView(null);
        setFetchWindow(null);
        return;
      }
      setView(next);
      if (overviewIsComplete) return;
      setFetchWindow((current) => {
        if (!current || !windowCovers(current, next)) return windowToFetch(next, whole, fullSpan);
        const currentSpan = current.to - current.from;
        const nextSpan = next.to - next.from;
        const resolutionStillRight = currentSpan <= fullSpan || nextSpan > fullSpan;
        return resolutionStillRight && currentSpan < nextSpan * 3 ? current : windowToFetch(next, whole, fullSpan);
      });
    },
    [fullSpan, overviewIsComplete],
  );

  if (overview.error) {
    return (
      <div role="alert" className="rounded-md border border-fail-500/30 bg-fail-50 px-4 py-3 text-sm text-fail-700">
        <p>{overview.error.message}</p>
        <button type="button" className="btn-secondary mt-2" onClick={() => overview.mutate()}>Try again</button>
      </div>
    );
  }
  if (!overview.data || !record) {
    return (
      <div className="flex h-[420px] items-center justify-center rounded-md bg-paper-sunk text-sm text-ink-muted" aria-busy="true">
        Loading the chart data…
      </div>
    );
  }
  return (
    <figure className="m-0" data-testid="time-chart">
      <ChartCanvas
        series={overview.data}
        shown={shown ?? overview.data}
        view={view}
        record={record}
        timeZone={timeZone}
        label={`Time chart of cycle ${cycleNumber}: every temperature channel, chamber pressure and the saturation temperature computed from it, over time since the first sample`}
        describedBy={`${summaryId} ${noteId}`}
        onViewChange={onViewChange}
      />
      <p id={noteId} className="mt-2 text-xs text-ink-muted" aria-live="polite" data-testid="resolution-note">
        {loadingWindow ? "Loading this window at full resolution…" : resolutionNote(shown ?? overview.data)}
        {zoomed.error && view ? ` The zoomed window could not be loaded (${zoomed.error.message}); showing the downsampled view.` : ""}
      </p>
      <figcaption id={summaryId} className="mt-2 text-sm text-ink-soft">{summary}</figcaption>
    </figure>
  );
}

type CanvasProps = {
  /** the whole-record series: defines traces, plateau, band and flags */
  series: SeriesResponse;
  /** the data to draw now: the whole record or a zoomed window */
  shown: SeriesResponse;
  view: TimeWindow | null;
  record: TimeWindow;
  timeZone: string;
  label: string;
  describedBy: string;
  onViewChange: (view: TimeWindow, record: TimeWindow) => void;
};

function ChartCanvas({ series, shown, view, record, timeZone, label, describedBy, onViewChange }: CanvasProps) {
  const plotRef = useRef<HTMLDivElement>(null);
  const legendRef = useRef<HTMLDivElement>(null);
  const chartRef = useRef<uPlot | null>(null);
  const programmatic = useRef(false);
  const viewRef = useRef<TimeWindow | null>(view);
  const onViewChangeRef = useRef(onViewChange);
  const [currentView, setCurrentView] = useState<TimeWindow>(record);
  viewRef.current = view;
  onViewChangeRef.current = onViewChange;

  const traces = useMemo(() => chartTraces(series), [series]);

  // Build the chart once per set of traces; zoomed data arrives through setData below.
  useEffect(() => {
    const plotEl = plotRef.current;
    const legendEl = legendRef.current;
    if (!plotEl || !legendEl) return;
    let debounce: ReturnType<typeof setTimeout> | undefined;
    const opts = chartOptions({
      series,
      traces,
      width: Math.max(plotEl.clientWidth, 240),
      timeZone,
      legendEl,
      onScale(u) {
        const min = u.scales.x.min;
        const max = u.scales.x.max;
        if (min == null || max == null) return;
        setCurrentView({ from: min, to: max });
        if (programmatic.current) return;
        clearTimeout(debounce);
        debounce = setTimeout(() => onViewChangeRef.current({ from: min, to: max }, record), 180);
      },
      record,
    });
    const u = new uPlot(opts, alignedData(series, traces) as uPlot.AlignedData, plotEl);
    chartRef.current = u;
    makeLegendKeyboardFriendly(u, legendEl);

    const resize = new ResizeObserver(() => {
      const width = Math.max(plotEl.clientWidth, 240);
      if (Math.abs(width - u.width) > 1) u.setSize({ width, height: HEIGHT });
    });
    resize.observe(plotEl);
    return () => {
      clearTimeout(debounce);
      resize.disconnect();
      u.destroy();
      chartRef.current = null;
      legendEl.replaceChildren();
    };
  }, [series, traces, timeZone, record]);

  // New data (a zoomed window at full resolution, or back to the whole record).
  useEffect(() => {
    const u = chartRef.current;
    if (!u) return;
    programmatic.current = true;
    try {
      u.setData(alignedData(shown, traces) as uPlot.AlignedData, true);
      const v = viewRef.current ?? record;
      u.setScale("x", { min: v.from, max: v.to });
    } finally {
      programmatic.current = false;
    }
  }, [shown, traces, record]);

  const setX = (w: TimeWindow) => chartRef.current?.setScale("x", { min: w.from, max: w.to });
  const zoomedNow = isZoomed(currentView, record);
  const plateau = series.plateau;

  return (
    <div>
      <div className="mb-2 flex flex-wrap items-center gap-2 text-sm" role="toolbar" aria-label="Chart zoom and pan">
        <button type="button" className="btn-secondary px-2.5 py-1" onClick={() => setX(zoomWindow(currentView, 0.5, record))}>Zoom in</button>
        <button type="button" className="btn-secondary px-2.5 py-1" onClick={() => setX(zoomWindow(currentView, 2, record))} disabled={!zoomedNow}>Zoom out</button>
        <button type="button" className="btn-secondary px-2.5 py-1" onClick={() => setX(panWindow(currentView, -0.5, record))} disabled={!zoomedNow || currentView.from <= record.from} aria-label="Pan earlier">← Earlier</button>
        <button type="button" className="btn-secondary px-2.5 py-1" onClick={() => setX(panWindow(currentView, 0.5, record))} disabled={!zoomedNow || currentView.to >= record.to} aria-label="Pan later">Later →</button>
        {plateau && (
          <button
            type="button"
            className="btn-secondary px-2.5 py-1"
            onClick={() => {
              const pad = Math.max((plateau.end - plateau.start) * 0.15, 5);
              setX({ from: Math.max(record.from, plateau.start - pad), to: Math.min(record.to, plateau.end + pad) });
            }}
          >
            Zoom to plateau
          </button>
        )}
        <button type="button" className="btn-primary px-2.5 py-1" onClick={() => setX(record)} disabled={!zoomedNow} data-testid="reset-zoom">Reset zoom</button>
        <span className="ml-auto text-xs text-ink-muted">
          Showing {formatElapsed(currentView.from, { forceHours: record.to >= 3600 })} – {formatElapsed(currentView.to, { forceHours: record.to >= 3600 })}. Drag across the chart to zoom, Shift-drag to pan, double-click to reset.
        </span>
      </div>
      <div ref={plotRef} role="img" aria-label={label} aria-describedby={describedBy} className="w-full" data-testid="time-chart-plot" />
      <div
        ref={legendRef}
        className="mt-1 [&_.u-legend]:text-left [&_.u-legend]:text-xs [&_.u-legend_th]:cursor-pointer [&_.u-legend_th]:font-normal [&_.u-legend_.u-off]:opacity-40 [&_.u-legend_.u-off_.u-label]:line-through [&_.u-legend_th:focus-visible]:outline-2 [&_.u-legend_th:focus-visible]:outline-steam-500 [&_.u-legend_.u-value]:font-mono [&_.u-legend_.u-value]:tabular-nums"
        data-testid="time-chart-legend"
      />
      <p className="mt-1 text-xs text-ink-muted">Click a channel in the legend (or Tab to it and press Enter) to hide or show it; the values are those under the cursor.</p>
    </div>
  );
}

function traceColour(trace: TraceSpec): string {
  if (trace.role === "reference") return CHART.ink;
  if (trace.role === "saturation") return CHART.saturation;
  if (trace.role === "pressure") return CHART.pressure;
  return loadColour(trace.loadIndex ?? 0);
}

function chartOptions({
  series,
  traces,
  width,
  timeZone,
  legendEl,
  onScale,
  record,
}: {
  series: SeriesResponse;
  traces: TraceSpec[];
  width: number;
  timeZone: string;
  legendEl: HTMLElement;
  onScale: (u: uPlot) => void;
  record: TimeWindow;
}): uPlot.Options {
  const startedAt = series.startedAt;
  const plateau = series.plateau;
  const flags = series.flags;
  const band = series.band;

  const hours = record.to - record.from >= 3600;
  const elapsed = (v: number, tenths = false) => formatElapsed(v, { forceHours: hours, tenths });
  const timeValue = (_u: uPlot, v: number | null) => {
    if (v == null) return "—";
    const clock = clockTimeAt(startedAt, v, timeZone);
    const since = elapsed(v, !Number.isInteger(v));
    return clock ? `${since} (clock ${clock})` : since;
  };

  return {
    width,
    height: HEIGHT,
    padding: [18, 8, 0, 8],
    legend: { show: true, live: true, mount: (_u, el) => legendEl.appendChild(el) },
    cursor: {
      drag: { x: true, y: false, setScale: true },
      focus: { prox: 16 },
      bind: {
        mousedown: (u, _target, handler) => (e: MouseEvent) => {
          if (e.shiftKey && e.button === 0) {
            startPan(u, e, record);
            return null;
          }
          return handler(e);
        },
        // uPlot's own double-click fits the data in hand, which may be a zoomed window: go back to the whole record
        dblclick: (u) => () => {
          u.setScale("x", { min: record.from, max: record.to });
          return null;
        },
      },
    },
    focus: { alpha: 0.35 },
    scales: {
      x: { time: false },
      temperature: { auto: true },
      pressure: { auto: true },
    },
    axes: [
      {
        stroke: CHART.inkMuted,
        grid: { stroke: CHART.grid },
        ticks: { stroke: CHART.line },
        incrs: [...TIME_STEPS_S],
        space: 70,
        values: (u, splits) => elapsedTickLabels(splits, (u.scales.x.max ?? 0) - (u.scales.x.min ?? 0), hours),
        label: startedAt && width >= 520 ? "Time since the first sample (clock time in the legend)" : "Time since the first sample",
        labelSize: 20,
        font: "11px system-ui, sans-serif",
        labelFont: "12px system-ui, sans-serif",
      },
      {
        scale: "temperature",
        stroke: CHART.inkMuted,
        grid: { stroke: CHART.grid },
        ticks: { stroke: CHART.line },
        values: (_u, splits) => splits.map((v) => `${Number(v.toFixed(2))}`),
        label: "Temperature (°C)",
        labelSize: 20,
        size: 52,
        font: "11px system-ui, sans-serif",
        labelFont: "12px system-ui, sans-serif",
      },
      {
        scale: "pressure",
        side: 1,
        stroke: CHART.pressure,
        grid: { show: false },
        ticks: { stroke: CHART.line },
        values: (_u, splits) => splits.map((v) => `${Number(v.toFixed(1))}`),
        label: "Chamber pressure (kPa abs)",
        labelSize: 20,
        size: 56,
        font: "11px system-ui, sans-serif",
        labelFont: "12px system-ui, sans-serif",
      },
    ],
    series: [
      { label: "Time", value: timeValue },
      ...traces.map((t): uPlot.Series => ({
        label: t.label,
        scale: t.scale,
        stroke: traceColour(t),
        width: t.emphasis ? 2.5 : t.role === "pressure" ? 1.75 : 1.25,
        dash: t.dashed ? [7, 4] : undefined,
        spanGaps: false,
        points: { show: false },
        value: (_u, v) => (v == null ? "—" : t.scale === "pressure" ? `${v.toFixed(1)} kPa` : `${v.toFixed(2)} °C`),
      })),
    ],
    hooks: {
      setScale: [
        (u, key) => {
          if (key === "x") onScale(u);
        },
      ],
      drawClear: [
        (u) => {
          const { ctx } = u;
          const { left, top, width, height } = u.bbox;
          ctx.save();
          ctx.beginPath();
          ctx.rect(left, top, width, height);
          ctx.clip();
          const yHigh = u.valToPos(band.high, "temperature", true);
          const yLow = u.valToPos(band.low, "temperature", true);
          ctx.fillStyle = CHART.bandFill;
          ctx.fillRect(left, Math.min(yHigh, yLow), width, Math.abs(yLow - yHigh));
          for (const f of flags) {
            const x0 = u.valToPos(f.start, "x", true);
            const x1 = u.valToPos(f.end, "x", true);
            ctx.fillStyle = f.kind === "below" ? CHART.airFill : CHART.superheatFill;
            ctx.fillRect(x0, top, Math.max(x1 - x0, 2 * devicePixelRatio), height);
          }
          ctx.restore();
        },
      ],
      draw: [
        (u) => {
          const { ctx } = u;
          const { left, top, width, height } = u.bbox;
          const px = devicePixelRatio;
          ctx.save();
          ctx.beginPath();
          ctx.rect(left, top - 16 * px, width, height + 16 * px);
          ctx.clip();
          ctx.font = `${11 * px}px system-ui, sans-serif`;
          ctx.textBaseline = "bottom";

          // Band edges
          ctx.strokeStyle = CHART.bandEdge;
          ctx.lineWidth = px;
          ctx.setLineDash([4 * px, 3 * px]);
          for (const v of [band.low, band.high]) {
            const y = Math.round(u.valToPos(v, "temperature", true)) + 0.5;
            if (y < top || y > top + height) continue;
            ctx.beginPath();
            ctx.moveTo(left, y);
            ctx.lineTo(left + width, y);
            ctx.stroke();
          }
          const yBand = u.valToPos(band.high, "temperature", true);
          if (yBand > top + 12 * px && yBand < top + height) {
            ctx.fillStyle = CHART.onLine;
            ctx.textAlign = "right";
            const long = `Sterilization band ${fmt(band.low)}–${fmt(band.high)} °C`;
            ctx.fillText(ctx.measureText(long).width < width * 0.5 ? long : "band", left + width - 6 * px, yBand - 2 * px);
          }

          // Plateau start and end
          ctx.setLineDash([]);
          if (plateau) {
            ctx.strokeStyle = CHART.plateau;
            ctx.fillStyle = CHART.plateau;
            ctx.lineWidth = 1.5 * px;
            // Start label before its line, end label after it, so that the plateau between stays clear.
            const marks: Array<[number, string, CanvasTextAlign]> = [
              [plateau.start, `Plateau start ${elapsed(plateau.start)}`, "right"],
              [plateau.end, `Plateau end ${elapsed(plateau.end)}`, "left"],
            ];
            const xs = marks.map(([t]) => Math.round(u.valToPos(t, "x", true)) + 0.5);
            for (const x of xs) {
              if (x < left || x > left + width) continue;
              ctx.beginPath();
              ctx.moveTo(x, top);
              ctx.lineTo(x, top + height);
              ctx.stroke();
            }
            const visible = xs.map((x) => x >= left && x <= left + width);
            const gap = 4 * px;
            // Each label on its preferred side, flipped when it would leave the plot; one joint label when they would collide.
            const placed = marks.map(([, text, align], i) => {
              const w = ctx.measureText(text).width;
              const fitsLeft = xs[i] - gap - w >= left;
              const fitsRight = xs[i] + gap + w <= left + width;
              const side: CanvasTextAlign = align === "right" ? (fitsLeft ? "right" : "left") : fitsRight ? "left" : "right";
              const from = side === "right" ? xs[i] - gap - w : xs[i] + gap;
              return { text, side, from, to: from + w, x: xs[i] };
            });
            const collide = visible[0] && visible[1] && placed[0].to + gap > placed[1].from;
            if (collide) {
              const text = `Plateau ${elapsed(plateau.start)}–${elapsed(plateau.end)}`;
              const w = ctx.measureText(text).width;
              const centre = Math.min(Math.max((xs[0] + xs[1]) / 2, left + w / 2 + 2 * px), left + width - w / 2 - 2 * px);
              ctx.textAlign = "center";
              ctx.fillText(text, centre, top - 3 * px);
            } else {
              placed.forEach((p, i) => {
                if (!visible[i]) return;
                ctx.textAlign = p.side;
                ctx.fillText(p.text, p.x + (p.side === "left" ? gap : -gap), top - 3 * px);
              });
            }
          }

          // Flag labels: words as well as tints
          for (const f of flags) {
            const x0 = u.valToPos(f.start, "x", true);
            const x1 = u.valToPos(f.end, "x", true);
            if (x1 < left || x0 > left + width) continue;
            const text = f.kind === "below" ? "air / non-condensable gas" : "superheat";
            ctx.fillStyle = f.kind === "below" ? CHART.airEdge : CHART.superheatEdge;
            ctx.textAlign = "center";
            const mid = (Math.max(x0, left) + Math.min(x1, left + width)) / 2;
            const textWidth = ctx.measureText(text).width;
            const shortText = f.kind === "below" ? "air" : "superheat";
            ctx.fillText(textWidth < x1 - x0 ? text : shortText, mid, top + 16 * px);
          }
          ctx.restore();
        },
      ],
    },
  };
}

function fmt(v: number): string {
  return Number.isInteger(v) ? String(v) : v.toFixed(1);
}

function startPan(u: uPlot, down: MouseEvent, record: TimeWindow) {
  const min0 = u.scales.x.min ?? record.from;
  const max0 = u.scales.x.max ?? record.to;
  const widthPx = u.over.clientWidth || 1;
  const x0 = down.clientX;
  down.preventDefault();
  const move = (e: MouseEvent) => {
    const shift = (-(e.clientX - x0) / widthPx) * (max0 - min0);
    const next = panWindow({ from: min0, to: max0 }, shift / (max0 - min0), record);
    u.setScale("x", { min: next.from, max: next.to });
  };
  const up = () => {
    window.removeEventListener("mousemove", move);
    window.removeEventListener("mouseup", up);
  };
  window.addEventListener("mousemove", move);
  window.addEventListener("mouseup", up);
}

/** uPlot's legend toggles on click only; let keyboard users reach and toggle each entry too. */
function makeLegendKeyboardFriendly(u: uPlot, legendEl: HTMLElement) {
  const rows = legendEl.querySelectorAll<HTMLTableRowElement>("tr.u-series");
  rows.forEach((row, i) => {
    if (i === 0) return;
    const th = row.querySelector("th");
    if (!th) return;
    th.tabIndex = 0;
    th.setAttribute("role", "button");
    th.setAttribute("aria-pressed", String(u.series[i]?.show !== false));
    th.setAttribute("title", "Show or hide this channel");
    th.addEventListener("keydown", (e) => {
      if (e.key === "Enter" || e.key === " ") {
        e.preventDefault();
        th.dispatchEvent(new MouseEvent("click", { bubbles: true, button: 0 }));
        th.setAttribute("aria-pressed", String(u.series[i]?.show !== false));
      }
    });
    th.addEventListener("click", () => th.setAttribute("aria-pressed", String(u.series[i]?.show !== false)));
  });
}

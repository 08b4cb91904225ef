"use client";

import "uplot/dist/uPlot.min.css";
import { useCallback, useEffect, useId, useLayoutEffect, useMemo, useRef, useState } from "react";
import uPlot from "uplot";
import type { SeriesResponse } from "@/lib/cycles/contracts";
import { alignedData, chartTraces, formatElapsed, fullResolutionSpan, isZoomed, panWindow, resolutionNote, windowCovers, windowToFetch, zoomWindow, type TimeWindow } from "@/lib/cycles/chart-model";
import { CHART_HEIGHT_PX, chartOptions, makeLegendKeyboardFriendly } from "./time-chart-options";
import { OVERVIEW_POINTS, WINDOW_POINTS, useSeries } from "./series-fetch";

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
  const shown: SeriesResponse | undefined = view && zoomed.data && windowCovers(zoomed.data.window, view) ? zoomed.data : overview.data;
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
        <button type="button" className="btn-secondary mt-2" onClick={() => overview.mutate()}>
          Try again
        </button>
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
      <figcaption id={summaryId} className="mt-2 text-sm text-ink-soft">
        {summary}
      </figcaption>
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
  // The uPlot hooks read the latest view and callback without rebuilding the chart.
  useLayoutEffect(() => {
    viewRef.current = view;
    onViewChangeRef.current = onViewChange;
  });

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
      if (Math.abs(width - u.width) > 1) u.setSize({ width, height: CHART_HEIGHT_PX });
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
        <button type="button" className="btn-secondary px-2.5 py-1" onClick={() => setX(zoomWindow(currentView, 0.5, record))}>
          Zoom in
        </button>
        <button type="button" className="btn-secondary px-2.5 py-1" onClick={() => setX(zoomWindow(currentView, 2, record))} disabled={!zoomedNow}>
          Zoom out
        </button>
        <button
          type="button"
          className="btn-secondary px-2.5 py-1"
          onClick={() => setX(panWindow(currentView, -0.5, record))}
          disabled={!zoomedNow || currentView.from <= record.from}
          aria-label="Pan earlier"
        >
          ← Earlier
        </button>
        <button
          type="button"
          className="btn-secondary px-2.5 py-1"
          onClick={() => setX(panWindow(currentView, 0.5, record))}
          disabled={!zoomedNow || currentView.to >= record.to}
          aria-label="Pan later"
        >
          Later →
        </button>
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
        <button type="button" className="btn-primary px-2.5 py-1" onClick={() => setX(record)} disabled={!zoomedNow} data-testid="reset-zoom">
          Reset zoom
        </button>
        <span className="ml-auto text-xs text-ink-muted">
          Showing {formatElapsed(currentView.from, { forceHours: record.to >= 3600 })} – {formatElapsed(currentView.to, { forceHours: record.to >= 3600 })}. Drag across the chart to zoom, Shift-drag
          to pan, double-click to reset.
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

/** uPlot's options for the record page's time chart, and its canvas drawing of band, plateau and flags. */
import type uPlot from "uplot";
import type { SeriesResponse } from "@/lib/cycles/contracts";
import { clockTimeAt, elapsedTickLabels, formatElapsed, panWindow, type TimeWindow, type TraceSpec } from "@/lib/cycles/chart-model";
import { TIME_STEPS_S } from "@/lib/charts/scale";
import { CHART, loadColour } from "./chart-colors";

export const CHART_HEIGHT_PX = 420;

type Band = SeriesResponse["band"];
type Flags = SeriesResponse["flags"];
type Plateau = NonNullable<SeriesResponse["plateau"]>;
type Elapsed = (seconds: number, tenths?: boolean) => string;

function traceColour(trace: TraceSpec): string {
  if (trace.role === "reference") return CHART.ink;
  if (trace.role === "saturation") return CHART.saturation;
  if (trace.role === "pressure") return CHART.pressure;
  return loadColour(trace.loadIndex ?? 0);
}

function axes(startedAt: string | null, width: number, hours: boolean): uPlot.Axis[] {
  return [
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
  ];
}

function traceSeries(traces: TraceSpec[]): uPlot.Series[] {
  return traces.map((t): uPlot.Series => ({
    label: t.label,
    scale: t.scale,
    stroke: traceColour(t),
    width: t.emphasis ? 2.5 : t.role === "pressure" ? 1.75 : 1.25,
    dash: t.dashed ? [7, 4] : undefined,
    spanGaps: false,
    points: { show: false },
    value: (_u, v) => (v == null ? "—" : t.scale === "pressure" ? `${v.toFixed(1)} kPa` : `${v.toFixed(2)} °C`),
  }));
}

function cursor(record: TimeWindow): uPlot.Cursor {
  return {
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
  };
}

export function chartOptions({
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
  const { startedAt, plateau, flags, band } = series;
  const hours = record.to - record.from >= 3600;
  const elapsed: Elapsed = (v, tenths = false) => formatElapsed(v, { forceHours: hours, tenths });
  const timeValue = (_u: uPlot, v: number | null) => {
    if (v == null) return "—";
    const clock = clockTimeAt(startedAt, v, timeZone);
    const since = elapsed(v, !Number.isInteger(v));
    return clock ? `${since} (clock ${clock})` : since;
  };

  return {
    width,
    height: CHART_HEIGHT_PX,
    padding: [18, 8, 0, 8],
    legend: { show: true, live: true, mount: (_u, el) => legendEl.appendChild(el) },
    cursor: cursor(record),
    focus: { alpha: 0.35 },
    scales: {
      x: { time: false },
      temperature: { auto: true },
      pressure: { auto: true },
    },
    axes: axes(startedAt, width, hours),
    series: [{ label: "Time", value: timeValue }, ...traceSeries(traces)],
    hooks: {
      setScale: [
        (u, key) => {
          if (key === "x") onScale(u);
        },
      ],
      drawClear: [(u) => fillBandAndFlags(u, band, flags)],
      draw: [(u) => drawMarks(u, band, plateau, flags, elapsed)],
    },
  };
}

/** Under the traces: the band tinted, and each saturation flag's period tinted by its kind. */
function fillBandAndFlags(u: uPlot, band: Band, flags: Flags) {
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
}

/** Over the traces: band edges, plateau start and end, and the flags in words as well as tints. */
function drawMarks(u: uPlot, band: Band, plateau: Plateau | null, flags: Flags, elapsed: Elapsed) {
  const { ctx } = u;
  const { left, top, width, height } = u.bbox;
  const px = devicePixelRatio;
  ctx.save();
  ctx.beginPath();
  ctx.rect(left, top - 16 * px, width, height + 16 * px);
  ctx.clip();
  ctx.font = `${11 * px}px system-ui, sans-serif`;
  ctx.textBaseline = "bottom";
  drawBandEdges(u, band);
  ctx.setLineDash([]);
  if (plateau) drawPlateau(u, plateau, elapsed);
  drawFlagLabels(u, flags);
  ctx.restore();
}

function drawBandEdges(u: uPlot, band: Band) {
  const { ctx } = u;
  const { left, top, width, height } = u.bbox;
  const px = devicePixelRatio;
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
}

function drawPlateau(u: uPlot, plateau: Plateau, elapsed: Elapsed) {
  const { ctx } = u;
  const { left, top, width, height } = u.bbox;
  const px = devicePixelRatio;
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

function drawFlagLabels(u: uPlot, flags: Flags) {
  const { ctx } = u;
  const { left, top, width } = u.bbox;
  const px = devicePixelRatio;
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
export function makeLegendKeyboardFriendly(u: uPlot, legendEl: HTMLElement) {
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

import { ClipPath, Defs, G, Line, Path, Rect, Svg } from "@react-pdf/renderer";
import type { SeriesResponse } from "@/lib/cycles/contracts";
import { extent, linePath, niceTicks, scaleLinear, timeTicks } from "@/lib/charts/scale";
import { SvgLabel } from "./svg";
import { colour, loadChannelStyle, seriesStyle } from "./theme";
import { fixed } from "./text";

export type TimeChartProps = {
  id: string;
  series: SeriesResponse;
  width: number;
  height: number;
  fromS: number;
  toS: number;
  /** fixed temperature range (e.g. around the band); otherwise fitted to the data */
  temperatureDomain?: [number, number];
  showPressure: boolean;
  /** label plateau start and end at the top of the plot */
  labelPlateau: boolean;
  timeAxisNote?: string;
};

const MARGIN = { top: 12, bottom: 30, left: 36 };

/** A time tick as the report prints it: m:ss, whole minutes, or hours, after the axis's step. */
function timeTickLabel(seconds: number, stepS: number): string {
  if (stepS >= 3600) return `${Math.round(seconds / 3600)} h`;
  if (stepS >= 60) {
    const minutes = Math.round(seconds / 60);
    return minutes >= 120 ? `${Math.floor(minutes / 60)} h ${String(minutes % 60).padStart(2, "0")}` : `${minutes}`;
  }
  const m = Math.floor(seconds / 60);
  const s = Math.round(seconds - m * 60);
  return `${m}:${String(s).padStart(2, "0")}`;
}

function timeAxisUnit(stepS: number): string {
  if (stepS >= 3600) return "h";
  if (stepS >= 60) return "min";
  return "min:s";
}

/** "plateau start" and "plateau end" beside their lines, or one "plateau" where the two would collide. */
function PlateauLabels({ xStart, xEnd, left, right, y }: { xStart: number; xEnd: number; left: number; right: number; y: number }) {
  const inside = (v: number) => v >= left - 0.5 && v <= right + 0.5;
  // Each label sits outside its line; they only meet when pushed in from a plot edge.
  const startLabelRight = Math.max(xStart - 2, left + 44);
  const endLabelLeft = Math.min(xEnd + 2, right - 40);
  if (inside(xStart) && inside(xEnd) && startLabelRight > endLabelLeft - 3) {
    const mid = Math.min(Math.max((xStart + xEnd) / 2, left + 14), right - 14);
    return (
      <SvgLabel x={mid} y={y} anchor="middle" fill={colour.brass700} weight={600}>
        plateau
      </SvgLabel>
    );
  }
  return (
    <G>
      {inside(xStart) ? (
        <SvgLabel x={startLabelRight} y={y} anchor="end" fill={colour.brass700} weight={600}>
          plateau start
        </SvgLabel>
      ) : null}
      {inside(xEnd) ? (
        <SvgLabel x={endLabelLeft} y={y} anchor="start" fill={colour.brass700} weight={600}>
          plateau end
        </SvgLabel>
      ) : null}
    </G>
  );
}

/** The cycle against time: temperatures and saturation temperature on the left axis, pressure on the right. */
export function TimeChart({ id, series, width, height, fromS, toS, temperatureDomain, showPressure, labelPlateau, timeAxisNote }: TimeChartProps) {
  const right = showPressure ? 40 : 12;
  const plot = { x: MARGIN.left, y: MARGIN.top, w: width - MARGIN.left - right, h: height - MARGIN.top - MARGIN.bottom };
  const span: [number, number] = toS > fromS ? [fromS, toS] : [fromS, fromS + 1];
  const x = scaleLinear(span, [plot.x, plot.x + plot.w]);

  const temperatureChannels = series.channels.filter((c) => c.kind !== "pressure");
  const pressureChannel = series.channels.find((c) => c.kind === "pressure");
  const fitted = extent(temperatureChannels.map((c) => c.values)) ?? [0, 140];
  const tTicks = temperatureDomain ? niceTicks(temperatureDomain[0], temperatureDomain[1], 6) : niceTicks(Math.min(fitted[0], series.band.low), Math.max(fitted[1], series.band.high), 7);
  const tDomain: [number, number] = temperatureDomain ?? [tTicks.min, tTicks.max];
  const yT = scaleLinear(tDomain, [plot.y + plot.h, plot.y]);

  const pFitted = pressureChannel ? extent([pressureChannel.values]) : null;
  const pTicks = niceTicks(0, pFitted ? pFitted[1] : 1, Math.max(3, tTicks.ticks.length - 1));
  const yP = scaleLinear([pTicks.min, pTicks.max], [plot.y + plot.h, plot.y]);

  const time = timeTicks(span[0], span[1], Math.max(4, Math.round(plot.w / 60)));
  const clamp = (v: number, lo: number, hi: number) => Math.min(Math.max(v, lo), hi);
  const yBandTop = clamp(yT(series.band.high), plot.y, plot.y + plot.h);
  const yBandLow = clamp(yT(series.band.low), plot.y, plot.y + plot.h);
  const inSpan = (s: number) => s >= span[0] && s <= span[1];
  const plateau = series.plateau;

  let loadIndex = 0;
  const loadPaths = series.channels.flatMap((c) => {
    if (c.role !== "load") return [];
    const style = loadChannelStyle(loadIndex++);
    return [<Path key={`load-${c.header}`} d={linePath(series.timesS, c.values, x, yT)} stroke={style.stroke} strokeWidth={seriesStyle.load.width} strokeDasharray={style.dash} fill="none" />];
  });
  const saturation = series.channels.find((c) => c.role === "saturation");
  const reference = series.channels.find((c) => c.role === "reference");
  const clipId = `clip-${id}`;

  return (
    <Svg width={width} height={height} viewBox={`0 0 ${width} ${height}`}>
      <Defs>
        <ClipPath id={clipId}>
          <Rect x={plot.x} y={plot.y} width={plot.w} height={plot.h} />
        </ClipPath>
      </Defs>
      <Rect x={plot.x} y={plot.y} width={plot.w} height={plot.h} fill={colour.paperRaised} />
      {yBandLow - yBandTop > 0.2 ? <Rect x={plot.x} y={yBandTop} width={plot.w} height={yBandLow - yBandTop} fill={colour.pass50} /> : null}
      {series.flags.map((flag, i) => {
        const from = clamp(x(flag.start), plot.x, plot.x + plot.w);
        const to = clamp(x(flag.end), plot.x, plot.x + plot.w);
        if (to - from <= 0 && !inSpan(flag.start)) return null;
        const w = Math.max(to - from, 1.2);
        return (
          <G key={`flag-${i}`}>
            <Rect x={from} y={plot.y} width={w} height={plot.h} fill={colour.fail50} />
            <Rect x={from} y={plot.y} width={w} height={3} fill={colour.fail500} />
          </G>
        );
      })}
      {tTicks.ticks
        .filter((t) => t >= tDomain[0] - 1e-9 && t <= tDomain[1] + 1e-9)
        .map((t) => (
          <G key={`t-${t}`}>
            <Line x1={plot.x} x2={plot.x + plot.w} y1={yT(t)} y2={yT(t)} stroke={colour.inkLine} strokeWidth={0.35} />
            <Line x1={plot.x - 3} x2={plot.x} y1={yT(t)} y2={yT(t)} stroke={colour.inkMuted} strokeWidth={0.5} />
            <SvgLabel x={plot.x - 5} y={yT(t) + 2.2} anchor="end">
              {fixed(t, tTicks.step < 1 ? 1 : 0)}
            </SvgLabel>
          </G>
        ))}
      {time.ticks.map((t) => (
        <G key={`x-${t}`}>
          <Line x1={x(t)} x2={x(t)} y1={plot.y} y2={plot.y + plot.h} stroke={colour.inkLine} strokeWidth={0.25} />
          <Line x1={x(t)} x2={x(t)} y1={plot.y + plot.h} y2={plot.y + plot.h + 3} stroke={colour.inkMuted} strokeWidth={0.5} />
          <SvgLabel x={x(t)} y={plot.y + plot.h + 10} anchor="middle">
            {timeTickLabel(t, time.stepS)}
          </SvgLabel>
        </G>
      ))}
      {yBandLow - yBandTop > 0.2 ? (
        <G>
          <Line x1={plot.x} x2={plot.x + plot.w} y1={yBandTop} y2={yBandTop} stroke={colour.pass500} strokeWidth={0.5} strokeDasharray="3 2" />
          <Line x1={plot.x} x2={plot.x + plot.w} y1={yBandLow} y2={yBandLow} stroke={colour.pass500} strokeWidth={0.5} strokeDasharray="3 2" />
        </G>
      ) : null}
      <G clipPath={`url(#${clipId})`}>
        {loadPaths}
        {showPressure && pressureChannel ? (
          <Path
            d={linePath(series.timesS, pressureChannel.values, x, yP)}
            stroke={seriesStyle.pressure.stroke}
            strokeWidth={seriesStyle.pressure.width}
            strokeDasharray={seriesStyle.pressure.dash}
            fill="none"
          />
        ) : null}
        {saturation ? (
          <Path
            d={linePath(series.timesS, saturation.values, x, yT)}
            stroke={seriesStyle.saturation.stroke}
            strokeWidth={seriesStyle.saturation.width}
            strokeDasharray={seriesStyle.saturation.dash}
            fill="none"
          />
        ) : null}
        {reference ? <Path d={linePath(series.timesS, reference.values, x, yT)} stroke={seriesStyle.reference.stroke} strokeWidth={seriesStyle.reference.width} fill="none" /> : null}
      </G>
      {plateau
        ? (
            [
              ["start", plateau.start],
              ["end", plateau.end],
            ] as const
          )
            .filter(([, s]) => inSpan(s))
            .map(([name, s]) => <Line key={`plateau-${name}`} x1={x(s)} x2={x(s)} y1={plot.y} y2={plot.y + plot.h} stroke={colour.brass600} strokeWidth={0.7} strokeDasharray="2 1.5" />)
        : null}
      {plateau && labelPlateau ? <PlateauLabels xStart={x(plateau.start)} xEnd={x(plateau.end)} left={plot.x} right={plot.x + plot.w} y={plot.y - 3} /> : null}
      <Rect x={plot.x} y={plot.y} width={plot.w} height={plot.h} fill="none" stroke={colour.inkFaint} strokeWidth={0.6} />
      {showPressure
        ? pTicks.ticks.map((p) => (
            <G key={`p-${p}`}>
              <Line x1={plot.x + plot.w} x2={plot.x + plot.w + 3} y1={yP(p)} y2={yP(p)} stroke={seriesStyle.pressure.stroke} strokeWidth={0.5} />
              <SvgLabel x={plot.x + plot.w + 5} y={yP(p) + 2.2} fill={colour.caution700}>
                {fixed(p, 0)}
              </SvgLabel>
            </G>
          ))
        : null}
      <SvgLabel x={9} y={plot.y + plot.h / 2} anchor="middle" rotate={-90} fill={colour.inkSoft} weight={500} size={6.8}>
        Temperature (°C)
      </SvgLabel>
      {showPressure ? (
        <SvgLabel x={width - 5} y={plot.y + plot.h / 2} anchor="middle" rotate={90} fill={colour.caution700} weight={500} size={6.8}>
          Chamber pressure (kPa abs)
        </SvgLabel>
      ) : null}
      <SvgLabel x={plot.x + plot.w / 2} y={height - 6} anchor="middle" fill={colour.inkSoft} weight={500} size={6.8}>
        {`Time since the first sample (${timeAxisUnit(time.stepS)})${timeAxisNote ? `  ·  ${timeAxisNote}` : ""}`}
      </SvgLabel>
    </Svg>
  );
}

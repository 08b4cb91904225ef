import { Circle, ClipPath, Defs, G, Line, Path, Rect, Svg } from "@react-pdf/renderer";
import type { SeriesResponse } from "@/lib/cycles/contracts";
import { linearTicks, logTicks, pointsPath } from "@/lib/charts/scale";
import { formatPressureTick, phaseRange, phaseSamples, phaseScales, plateauSamples, saturationCurveInRange, toleranceBand, type PhaseSample, type PlateauSample } from "@/lib/cycles/phase-model";
import { SvgLabel } from "./svg";
import { colour } from "./theme";

export type PhaseChartProps = {
  /** samples taken as they were logged (not min/max buckets), so each temperature has its own pressure */
  series: SeriesResponse;
  width: number;
  height: number;
  sterilizationTempC: number;
  bandK: number;
  saturationLimitK: number;
};

const MARGIN = { top: 8, right: 8, bottom: 26, left: 34 };
const SIDE_COLOUR: Record<PlateauSample["side"], string> = {
  "on-line": colour.pass500,
  "liquid-side": colour.steam700,
  "vapour-side": colour.fail500,
};
const r = (v: number) => Math.round(v * 100) / 100;

/** Pressure (log) against temperature: water's liquid–vapour line and the cycle's path across it. */
export function PhaseChart({ series, width, height, sterilizationTempC, bandK, saturationLimitK }: PhaseChartProps) {
  const plot = { x: MARGIN.left, y: MARGIN.top, w: width - MARGIN.left - MARGIN.right, h: height - MARGIN.top - MARGIN.bottom };
  const samples: PhaseSample[] = phaseSamples(series);
  const range = phaseRange("cycle", { samples, sterilizationTempC, bandK });
  const { x, y } = phaseScales(range, { left: plot.x, top: plot.y, width: plot.w, height: plot.h });
  const curve = saturationCurveInRange(range, 140);
  const tolerance = toleranceBand(range, saturationLimitK, 100);
  const plateau = plateauSamples(samples, series.plateau, saturationLimitK);

  const curvePath = pointsPath(
    curve.map((p) => [p.temperatureC, p.pressureKpa]),
    x,
    y,
  );
  const tolerancePath = tolerance.colder.length > 1 ? pointsPath([...tolerance.colder, ...[...tolerance.hotter].reverse()], x, y, { close: true }) : "";
  const inPressureRange = (s: PhaseSample) => s.pressureKpa >= range.pMinKpa && s.pressureKpa <= range.pMaxKpa;
  const pathD = pointsPath(
    samples.map((s) => (inPressureRange(s) ? [s.temperatureC, s.pressureKpa] : null)),
    x,
    y,
  );
  const tTicks = linearTicks(range.tMinC, range.tMaxC, 5);
  const pTicks = logTicks(range.pMinKpa, range.pMaxKpa);
  const clipId = "clip-phase";
  const dotEvery = Math.max(1, Math.ceil(plateau.length / 90));

  return (
    <Svg width={width} height={height} viewBox={`0 0 ${width} ${height}`}>
      <Defs>
        <ClipPath id={clipId}>
          <Rect x={plot.x} y={plot.y} width={plot.w} height={plot.h} />
        </ClipPath>
      </Defs>
      <Rect x={plot.x} y={plot.y} width={plot.w} height={plot.h} fill={colour.paperRaised} />
      {pTicks.map((t) => (
        <G key={`p-${t.value}`}>
          <Line x1={plot.x} x2={plot.x + plot.w} y1={y(t.value)} y2={y(t.value)} stroke={colour.inkLine} strokeWidth={t.major ? 0.4 : 0.2} />
          <Line x1={plot.x - 3} x2={plot.x} y1={y(t.value)} y2={y(t.value)} stroke={colour.inkMuted} strokeWidth={0.5} />
          <SvgLabel x={plot.x - 5} y={y(t.value) + 2.2} anchor="end" size={6}>
            {formatPressureTick(t.value)}
          </SvgLabel>
        </G>
      ))}
      {tTicks.map((t) => (
        <G key={`t-${t}`}>
          <Line x1={x(t)} x2={x(t)} y1={plot.y} y2={plot.y + plot.h} stroke={colour.inkLine} strokeWidth={0.25} />
          <Line x1={x(t)} x2={x(t)} y1={plot.y + plot.h} y2={plot.y + plot.h + 3} stroke={colour.inkMuted} strokeWidth={0.5} />
          <SvgLabel x={x(t)} y={plot.y + plot.h + 10} anchor="middle" size={6}>
            {String(t)}
          </SvgLabel>
        </G>
      ))}
      <G clipPath={`url(#${clipId})`}>
        {tolerancePath ? <Path d={tolerancePath} fill={colour.pass50} stroke="none" /> : null}
        {curvePath ? <Path d={curvePath} stroke={colour.steam600} strokeWidth={1.1} fill="none" /> : null}
        {pathD ? <Path d={pathD} stroke={colour.inkFaint} strokeWidth={0.6} fill="none" /> : null}
        {plateau
          .filter((_, i) => i % dotEvery === 0)
          .map((s, i) => (
            <Circle key={`s-${i}`} cx={r(x(s.temperatureC))} cy={r(y(s.pressureKpa))} r={1.8} fill={SIDE_COLOUR[s.side]} stroke={colour.paperRaised} strokeWidth={0.3} />
          ))}
      </G>
      <Rect x={plot.x} y={plot.y} width={plot.w} height={plot.h} fill="none" stroke={colour.inkFaint} strokeWidth={0.6} />
      <SvgLabel x={plot.x + 5} y={plot.y + 11} weight={600} fill={colour.steam700} size={6.8}>
        LIQUID
      </SvgLabel>
      <SvgLabel x={plot.x + 5} y={plot.y + 19} size={5.6}>
        (colder than saturated steam: air)
      </SvgLabel>
      <SvgLabel x={plot.x + plot.w - 5} y={plot.y + plot.h - 13} anchor="end" weight={600} fill={colour.fail700} size={6.8}>
        VAPOUR
      </SvgLabel>
      <SvgLabel x={plot.x + plot.w - 5} y={plot.y + plot.h - 5} anchor="end" size={5.6}>
        (hotter than saturated steam: superheat)
      </SvgLabel>
      <SvgLabel x={9} y={plot.y + plot.h / 2} anchor="middle" rotate={-90} fill={colour.inkSoft} weight={500} size={6.5}>
        Chamber pressure (kPa abs, log)
      </SvgLabel>
      <SvgLabel x={plot.x + plot.w / 2} y={height - 6} anchor="middle" fill={colour.inkSoft} weight={500} size={6.5}>
        {`Reference temperature (°C)`}
      </SvgLabel>
    </Svg>
  );
}

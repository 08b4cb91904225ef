"use client";

import { useId, useMemo, useRef, useState } from "react";
import { CRITICAL_POINT, TRIPLE_POINT } from "@/lib/steam";
import { formatPressure, formatTemperature } from "@/lib/domain";
import {
  classifySample,
  countSides,
  describePlateauPosition,
  formatPressureTick,
  phaseLandmarks,
  phaseRange,
  phaseRegions,
  phaseSamples,
  phaseScales,
  plateauSamples,
  saturationCurveInRange,
  thin,
  toleranceBand,
  type PhaseSide,
  type PhaseView,
  type PlateauSample,
} from "@/lib/cycles/phase-model";
import { formatElapsed } from "@/lib/cycles/chart-model";
import { linearTicks, logTicks, pointsPath } from "@/lib/charts/scale";
import { CHART } from "./chart-colors";
import { OVERVIEW_POINTS, WINDOW_POINTS, useSeries } from "./series-fetch";

const W = 760;
const H = 470;
const BOX = { left: 66, top: 16, width: W - 66 - 18, height: H - 16 - 54 };
const MAX_DOTS = 3000;

const VIEWS: Array<{ id: PhaseView; label: string }> = [
  { id: "sterilization", label: "Sterilization region" },
  { id: "plateau", label: "Plateau close-up" },
  { id: "cycle", label: "Whole cycle" },
  { id: "full", label: "Triple point to critical point" },
];

const SIDE_STYLE: Record<PhaseSide, { colour: string; label: string }> = {
  "on-line": { colour: CHART.onLine, label: "on the line (saturated steam)" },
  "liquid-side": { colour: CHART.liquidSide, label: "liquid side: colder than saturation (air or non-condensable gas)" },
  "vapour-side": { colour: CHART.vapourSide, label: "vapour side: hotter than saturation (superheat)" },
};

type Props = {
  cycleId: string;
  cycleNumber: string;
  plateau: { start: number; end: number } | null;
  sterilizationTempC: number;
  bandK: number;
  saturationLimitK: number;
  referenceChannel: string;
  pressureChannel: string;
};

export function PhaseDiagram({ cycleId, cycleNumber, plateau, sterilizationTempC, bandK, saturationLimitK, referenceChannel, pressureChannel }: Props) {
  const titleId = useId();
  const descId = useId();
  const clipId = useId().replace(/:/g, "");
  const [view, setView] = useState<PhaseView>("sterilization");
  const [hover, setHover] = useState<PlateauSample | null>(null);
  const svgRef = useRef<SVGSVGElement>(null);
  const overview = useSeries(cycleId, null, OVERVIEW_POINTS);
  const plateauWindow = useMemo(() => (plateau ? { from: plateau.start, to: plateau.end } : null), [plateau]);
  const plateauSeries = useSeries(cycleId, plateauWindow, WINDOW_POINTS, plateauWindow !== null);

  const path = useMemo(() => (overview.data ? phaseSamples(overview.data) : []), [overview.data]);
  const plateauPoints = useMemo(() => {
    const source = plateauSeries.data ?? overview.data;
    return source ? plateauSamples(phaseSamples(source), plateau, saturationLimitK) : [];
  }, [plateauSeries.data, overview.data, plateau, saturationLimitK]);

  const range = useMemo(
    () => phaseRange(view, { samples: path, sterilizationTempC, bandK, plateau: plateauPoints, limitK: saturationLimitK }),
    [view, path, sterilizationTempC, bandK, plateauPoints, saturationLimitK],
  );
  const { x, y } = useMemo(() => phaseScales(range, BOX), [range]);
  const curve = useMemo(() => saturationCurveInRange(range, view === "full" ? 320 : 180), [range, view]);
  const regions = useMemo(() => phaseRegions(range, curve), [range, curve]);
  const tolerance = useMemo(() => toleranceBand(range, saturationLimitK), [range, saturationLimitK]);
  const landmarks = useMemo(() => phaseLandmarks(range), [range]);
  const xTicks = useMemo(() => linearTicks(range.tMinC, range.tMaxC, 9), [range]);
  const yTicks = useMemo(() => logTicks(range.pMinKpa, range.pMaxKpa), [range]);
  const dots = useMemo(() => thin(plateauPoints, MAX_DOTS), [plateauPoints]);
  const counts = countSides(plateauPoints);
  const sentence = plateau ? describePlateauPosition(plateauPoints, saturationLimitK) : "No plateau was found, so no samples are highlighted.";

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

  const polygon = (pts: Array<[number, number]>) => pts.map(([t, p]) => `${x(t).toFixed(1)},${y(p).toFixed(1)}`).join(" ");
  const tolerancePolygon = [...tolerance.colder, ...[...tolerance.hotter].reverse()];
  const lineLabel = curveLabelPlacement(curve, x, y);
  const liquidLabel = regionLabel(range, "liquid");
  const vapourLabel = regionLabel(range, "vapour");
  const bandLeft = x(sterilizationTempC);
  const bandRight = x(sterilizationTempC + bandK);

  function onPointerMove(e: React.PointerEvent<SVGSVGElement>) {
    const svg = svgRef.current;
    if (!svg || dots.length === 0) return;
    const rect = svg.getBoundingClientRect();
    const px = ((e.clientX - rect.left) / rect.width) * W;
    const py = ((e.clientY - rect.top) / rect.height) * H;
    let best: PlateauSample | null = null;
    let bestD = 14 * 14;
    for (const d of dots) {
      const dx = x(d.temperatureC) - px;
      const dy = y(d.pressureKpa) - py;
      const dist = dx * dx + dy * dy;
      if (dist < bestD) {
        bestD = dist;
        best = d;
      }
    }
    setHover(best);
  }

  return (
    <figure className="m-0" data-testid="phase-diagram">
      <div className="mb-2 flex flex-wrap items-center gap-2 text-sm" role="group" aria-label="Phase-diagram range">
        {VIEWS.filter((v) => v.id !== "plateau" || plateau).map((v) => (
          <button key={v.id} type="button" aria-pressed={view === v.id} onClick={() => setView(v.id)} className={view === v.id ? "btn-primary px-2.5 py-1" : "btn-secondary px-2.5 py-1"}>
            {v.label}
          </button>
        ))}
        <span className="ml-auto text-xs text-ink-muted" aria-live="polite">
          {hover
            ? `${formatElapsed(hover.timeS, { forceHours: (overview.data?.window.to ?? 0) >= 3600 })} · ${formatTemperature(hover.temperatureC)} · ${formatPressure(hover.pressureKpa, { reference: "abs" })} · ${hover.deviationK >= 0 ? "+" : "−"}${Math.abs(hover.deviationK).toFixed(2)} K from saturation`
            : plateau
              ? "Point at a plateau sample to read it."
              : ""}
        </span>
      </div>
      <div className="overflow-x-auto" role="region" aria-label="Phase diagram, scrolls sideways on a narrow screen" tabIndex={0}>
        <svg
          ref={svgRef}
          viewBox={`0 0 ${W} ${H}`}
          className="h-auto w-full min-w-[560px] select-none"
          role="img"
          aria-labelledby={titleId}
          aria-describedby={descId}
          onPointerMove={onPointerMove}
          onPointerLeave={() => setHover(null)}
          fontFamily="system-ui, sans-serif"
        >
          <title
            id={titleId}
          >{`Cycle ${cycleNumber} on the water phase diagram: ${referenceChannel} against ${pressureChannel}, pressure on a logarithmic axis, over the IF97 liquid–vapour line`}</title>
          <defs>
            <clipPath id={clipId}>
              <rect x={BOX.left} y={BOX.top} width={BOX.width} height={BOX.height} />
            </clipPath>
          </defs>
          <rect x={BOX.left} y={BOX.top} width={BOX.width} height={BOX.height} fill={CHART.raised} stroke={CHART.line} />
          <g clipPath={`url(#${clipId})`}>
            {regions && (
              <>
                <polygon points={polygon(regions.liquid)} fill="rgba(31,122,133,0.07)" />
                <polygon points={polygon(regions.vapour)} fill="rgba(161,92,0,0.06)" />
                {regions.solid && <polygon points={polygon(regions.solid)} fill="rgba(101,109,118,0.08)" />}
                {regions.supercritical && <polygon points={polygon(regions.supercritical)} fill="rgba(109,63,160,0.06)" />}
              </>
            )}
            {/* grid */}
            {xTicks.map((t) => (
              <line key={`gx${t}`} x1={x(t)} x2={x(t)} y1={BOX.top} y2={BOX.top + BOX.height} stroke={CHART.grid} />
            ))}
            {yTicks.map((t) => (
              <line key={`gy${t.value}`} x1={BOX.left} x2={BOX.left + BOX.width} y1={y(t.value)} y2={y(t.value)} stroke={t.major ? "rgba(31,35,40,0.16)" : CHART.grid} />
            ))}
            {/* sterilization band */}
            {bandRight > BOX.left && bandLeft < BOX.left + BOX.width && (
              <g>
                <rect x={bandLeft} y={BOX.top} width={Math.max(bandRight - bandLeft, 1)} height={BOX.height} fill={CHART.bandFill} />
                <text x={(bandLeft + bandRight) / 2} y={BOX.top + BOX.height - 6} textAnchor="middle" fontSize={10} fill={CHART.onLine}>
                  band
                </text>
              </g>
            )}
            {/* ± limit around the line */}
            {tolerancePolygon.length > 2 && <polygon points={polygon(tolerancePolygon)} fill="rgba(29,122,77,0.12)" stroke="rgba(29,122,77,0.35)" strokeDasharray="3 3" strokeWidth={0.8} />}
            {/* the liquid–vapour line */}
            <path
              d={pointsPath(
                curve.map((c) => [c.temperatureC, c.pressureKpa]),
                x,
                y,
              )}
              fill="none"
              stroke={CHART.ink}
              strokeWidth={2.2}
            />
            {regions?.solid && <line x1={x(TRIPLE_POINT.temperatureC)} x2={x(TRIPLE_POINT.temperatureC)} y1={y(TRIPLE_POINT.pressureKpa)} y2={BOX.top} stroke={CHART.inkMuted} strokeDasharray="4 3" />}
            {regions?.supercritical && (
              <>
                <line x1={x(CRITICAL_POINT.temperatureC)} x2={x(CRITICAL_POINT.temperatureC)} y1={y(CRITICAL_POINT.pressureKpa)} y2={BOX.top} stroke={CHART.inkMuted} strokeDasharray="4 3" />
                <line
                  x1={x(CRITICAL_POINT.temperatureC)}
                  x2={BOX.left + BOX.width}
                  y1={y(CRITICAL_POINT.pressureKpa)}
                  y2={y(CRITICAL_POINT.pressureKpa)}
                  stroke={CHART.inkMuted}
                  strokeDasharray="4 3"
                />
              </>
            )}
            {/* the cycle's path */}
            <path
              d={pointsPath(
                path.map((s) => [s.temperatureC, s.pressureKpa]),
                x,
                y,
              )}
              fill="none"
              stroke={CHART.path}
              strokeWidth={1.3}
              strokeLinejoin="round"
            />
            {path.length > 0 && (
              <g>
                <circle cx={x(path[0].temperatureC)} cy={y(path[0].pressureKpa)} r={3.5} fill={CHART.raised} stroke={CHART.inkSoft} />
                <text x={x(path[0].temperatureC) + 6} y={y(path[0].pressureKpa) - 5} fontSize={10} fill={CHART.inkSoft} stroke={CHART.raised} strokeWidth={3} paintOrder="stroke">
                  start
                </text>
              </g>
            )}
            {/* plateau samples */}
            {dots.map((d, i) => (
              <Marker key={i} side={d.side} cx={x(d.temperatureC)} cy={y(d.pressureKpa)} />
            ))}
            {hover && <circle cx={x(hover.temperatureC)} cy={y(hover.pressureKpa)} r={6} fill="none" stroke={CHART.ink} strokeWidth={1.5} />}
            {/* names */}
            {lineLabel && (
              <text
                x={lineLabel.x}
                y={lineLabel.y}
                fontSize={11}
                fill={CHART.ink}
                textAnchor="middle"
                transform={`rotate(${lineLabel.angle} ${lineLabel.x} ${lineLabel.y})`}
                fontWeight={600}
                stroke={CHART.raised}
                strokeWidth={3}
                paintOrder="stroke"
              >
                liquid–vapour line (IF97)
              </text>
            )}
            {liquidLabel && (
              <text x={x(liquidLabel.t)} y={y(liquidLabel.p)} fontSize={13} fill={CHART.airEdge} fontWeight={600}>
                LIQUID side
                <tspan x={x(liquidLabel.t)} dy={15} fontSize={10} fontWeight={400}>
                  higher pressure than saturation at that temperature;
                </tspan>
                <tspan x={x(liquidLabel.t)} dy={13} fontSize={10} fontWeight={400}>
                  steam with air in it reads here
                </tspan>
              </text>
            )}
            {vapourLabel && (
              <text x={x(vapourLabel.t)} y={y(vapourLabel.p)} fontSize={13} fill={CHART.superheatEdge} fontWeight={600} textAnchor="end">
                VAPOUR side
                <tspan x={x(vapourLabel.t)} dy={15} fontSize={10} fontWeight={400} textAnchor="end">
                  lower pressure than saturation;
                </tspan>
                <tspan x={x(vapourLabel.t)} dy={13} fontSize={10} fontWeight={400} textAnchor="end">
                  superheated steam reads here
                </tspan>
              </text>
            )}
            {regions?.solid && (
              <text x={(BOX.left + x(TRIPLE_POINT.temperatureC)) / 2} y={BOX.top + 18} fontSize={10} fill={CHART.inkMuted} textAnchor="middle">
                ice
              </text>
            )}
            {regions?.supercritical && (
              <text x={(x(CRITICAL_POINT.temperatureC) + BOX.left + BOX.width) / 2} y={BOX.top + 18} fontSize={10} fill={CHART.inkMuted} textAnchor="middle">
                supercritical
              </text>
            )}
            {landmarks.map((l) => {
              const cx = x(l.temperatureC);
              const cy = y(l.pressureKpa);
              const right = cx < BOX.left + BOX.width * 0.7;
              return (
                <g key={l.id}>
                  <circle cx={cx} cy={cy} r={4.5} fill={CHART.raised} stroke={CHART.ink} strokeWidth={1.5} />
                  <text
                    x={cx + (right ? 9 : -9)}
                    y={cy + (l.id === "critical" ? -9 : 15)}
                    fontSize={10.5}
                    fill={CHART.ink}
                    textAnchor={right ? "start" : "end"}
                    stroke={CHART.raised}
                    strokeWidth={3}
                    paintOrder="stroke"
                  >
                    {`${l.label} (${formatLandmark(l.temperatureC)} °C, ${formatPressureTick(l.pressureKpa)}${l.pressureKpa >= 1000 ? "" : " kPa"})`}
                  </text>
                </g>
              );
            })}
          </g>
          {/* axes */}
          {xTicks.map((t) => (
            <text key={`tx${t}`} x={x(t)} y={BOX.top + BOX.height + 16} fontSize={11} fill={CHART.inkMuted} textAnchor="middle">
              {Number(t.toFixed(2))}
            </text>
          ))}
          {yTicks.map((t) =>
            t.major || yTicks.length <= 12 ? (
              <text key={`ty${t.value}`} x={BOX.left - 6} y={y(t.value) + 4} fontSize={11} fill={t.major ? CHART.ink : CHART.inkMuted} textAnchor="end">
                {formatPressureTick(t.value)}
              </text>
            ) : null,
          )}
          <text x={BOX.left + BOX.width / 2} y={H - 10} fontSize={12} fill={CHART.inkSoft} textAnchor="middle">
            {`Temperature (°C) — ${referenceChannel}`}
          </text>
          <text x={16} y={BOX.top + BOX.height / 2} fontSize={12} fill={CHART.inkSoft} textAnchor="middle" transform={`rotate(-90 16 ${BOX.top + BOX.height / 2})`}>
            Chamber pressure (kPa abs, log scale)
          </text>
        </svg>
      </div>
      <ul className="mt-2 flex flex-wrap gap-x-5 gap-y-1 text-xs text-ink-soft" aria-label="Key">
        <li className="flex items-center gap-1.5">
          <KeySwatch>
            <line x1={1} x2={15} y1={8} y2={8} stroke={CHART.ink} strokeWidth={2.2} />
          </KeySwatch>
          liquid–vapour line (IAPWS-IF97)
        </li>
        <li className="flex items-center gap-1.5">
          <KeySwatch>
            <rect x={1} y={3} width={14} height={10} fill="rgba(29,122,77,0.12)" stroke="rgba(29,122,77,0.35)" strokeDasharray="3 3" />
          </KeySwatch>
          within ±{saturationLimitK} K of saturation (the limit)
        </li>
        <li className="flex items-center gap-1.5">
          <KeySwatch>
            <line x1={1} x2={15} y1={8} y2={8} stroke={CHART.path} strokeWidth={1.5} />
          </KeySwatch>
          the cycle&apos;s path{overview.data && !overview.data.fullResolution ? " (downsampled)" : ""}
        </li>
        {(Object.keys(SIDE_STYLE) as PhaseSide[]).map((side) => (
          <li key={side} className="flex items-start gap-1.5">
            <KeySwatch>
              <Marker side={side} cx={8} cy={8} />
            </KeySwatch>
            <span>
              plateau sample {SIDE_STYLE[side].label}: <span className="font-semibold tabular-nums">{counts[side]}</span>
            </span>
          </li>
        ))}
      </ul>
      <figcaption id={descId} className="mt-2 text-sm text-ink-soft" data-testid="phase-diagram-summary">
        {overview.isLoading ? "Loading the cycle's path…" : sentence}
        {plateauSeries.data && !plateauSeries.data.fullResolution ? " The plateau is long, so its samples are shown downsampled." : ""} A thermometer in steam with air or another non-condensable gas
        reads colder than saturated steam at the chamber&apos;s total pressure, so its points fall on the liquid side of the line; superheated steam falls on the vapour side.
      </figcaption>
    </figure>
  );
}

function Marker({ side, cx, cy }: { side: PhaseSide; cx: number; cy: number }) {
  const colour = SIDE_STYLE[side].colour;
  if (side === "liquid-side") {
    // triangle pointing up: towards higher pressure
    return <polygon points={`${cx},${cy - 4.2} ${cx - 4},${cy + 3} ${cx + 4},${cy + 3}`} fill={colour} fillOpacity={0.85} />;
  }
  if (side === "vapour-side") {
    return <rect x={cx - 3.2} y={cy - 3.2} width={6.4} height={6.4} fill={colour} fillOpacity={0.85} transform={`rotate(45 ${cx} ${cy})`} />;
  }
  return <circle cx={cx} cy={cy} r={2.8} fill={colour} fillOpacity={0.7} />;
}

function KeySwatch({ children }: { children: React.ReactNode }) {
  return (
    <svg width={16} height={16} viewBox="0 0 16 16" aria-hidden="true">
      {children}
    </svg>
  );
}

function formatLandmark(v: number): string {
  return v < 1 ? v.toFixed(2) : v.toFixed(v < 200 ? 2 : 1);
}

/** Where to write the line's name: on the line, a little past the middle, turned along it. */
function curveLabelPlacement(curve: Array<{ temperatureC: number; pressureKpa: number }>, x: (t: number) => number, y: (p: number) => number) {
  if (curve.length < 10) return null;
  const i = Math.floor(curve.length * 0.62);
  const a = curve[i - 3];
  const b = curve[i + 3];
  const ax = x(a.temperatureC);
  const ay = y(a.pressureKpa);
  const bx = x(b.temperatureC);
  const by = y(b.pressureKpa);
  const angle = (Math.atan2(by - ay, bx - ax) * 180) / Math.PI;
  const mx = (ax + bx) / 2;
  const my = (ay + by) / 2;
  // nudge the text off the line towards the liquid side
  const nx = Math.sin((angle * Math.PI) / 180) * 8;
  const ny = -Math.cos((angle * Math.PI) / 180) * 8;
  return { x: mx + nx, y: my + ny, angle };
}

/** A spot well inside one side for its name, checked against the line itself. */
function regionLabel(range: { tMinC: number; tMaxC: number; pMinKpa: number; pMaxKpa: number }, side: "liquid" | "vapour") {
  const tSpan = range.tMaxC - range.tMinC;
  const logMin = Math.log10(range.pMinKpa);
  const logSpan = Math.log10(range.pMaxKpa) - logMin;
  const t = side === "liquid" ? Math.max(range.tMinC, TRIPLE_POINT.temperatureC) + tSpan * 0.03 : range.tMaxC - tSpan * 0.03;
  const p = 10 ** (logMin + logSpan * (side === "liquid" ? 0.9 : 0.2));
  const c = classifySample(t, p, 0);
  if (!c) return null;
  const want = side === "liquid" ? "liquid-side" : "vapour-side";
  return c.side === want ? { t, p } : null;
}

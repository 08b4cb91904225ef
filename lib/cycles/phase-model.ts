/**
 * Pure helpers behind the cycle record's phase diagram (web and PDF): the cycle's samples placed on
 * water's pressure–temperature plane against the IF97 liquid–vapour line, pressure on a log axis.
 */
import type { SeriesResponse } from "./contracts";
import { scaleLinear, scaleLog, type Scale } from "@/lib/charts/scale";
import { CRITICAL_POINT, STANDARD_ATMOSPHERE_KPA, TRIPLE_POINT, saturationLine, saturationPressureKpa, saturationTemperatureC } from "@/lib/steam";
import { signedTenths } from "./chart-model";

export type PhaseView = "sterilization" | "plateau" | "cycle" | "full";
export type PhaseRange = { tMinC: number; tMaxC: number; pMinKpa: number; pMaxKpa: number };
export type PhaseSide = "on-line" | "liquid-side" | "vapour-side";
export type PhaseSample = { timeS: number; temperatureC: number; pressureKpa: number };
export type PlateauSample = PhaseSample & { deviationK: number; side: PhaseSide };

/** The whole liquid–vapour line, triple point to critical point, with a margin. */
export const FULL_PHASE_RANGE: PhaseRange = { tMinC: -20, tMaxC: 440, pMinKpa: 0.3, pMaxKpa: 50_000 };

/**
 * Deviation of a thermometer reading from saturated steam at the measured pressure. A steam–air
 * mixture reads colder than Tsat(total pressure): its point lies at higher pressure than the line
 * at that temperature, the liquid side; superheated steam lies on the vapour side.
 */
export function classifySample(temperatureC: number, pressureKpa: number, limitK: number): { deviationK: number; side: PhaseSide } | null {
  if (!Number.isFinite(temperatureC) || !(pressureKpa >= TRIPLE_POINT.pressureKpa && pressureKpa <= CRITICAL_POINT.pressureKpa)) return null;
  const deviationK = temperatureC - saturationTemperatureC(pressureKpa);
  const side: PhaseSide = deviationK < -limitK ? "liquid-side" : deviationK > limitK ? "vapour-side" : "on-line";
  return { deviationK, side };
}

/**
 * The reference temperature and chamber pressure paired sample by sample, skipping gaps. A
 * downsampled series keeps each interval's extremes per channel, so its n-th temperature and n-th
 * pressure need not come from one instant: there each interval's two points become their mean.
 */
export function phaseSamples(series: SeriesResponse): PhaseSample[] {
  const reference = series.channels.find((c) => c.role === "reference") ?? series.channels.find((c) => c.kind === "temperature");
  const pressure = series.channels.find((c) => c.kind === "pressure");
  if (!reference || !pressure) return [];
  const out: PhaseSample[] = [];
  const ok = (t: number | null, p: number | null): t is number => t !== null && p !== null && Number.isFinite(t) && p > 0;
  if (series.fullResolution) {
    for (let i = 0; i < series.timesS.length; i++) {
      const t = reference.values[i];
      const p = pressure.values[i];
      if (ok(t, p)) out.push({ timeS: series.timesS[i], temperatureC: t, pressureKpa: p as number });
    }
    return out;
  }
  for (let i = 0; i + 1 < series.timesS.length; i += 2) {
    const t0 = reference.values[i];
    const t1 = reference.values[i + 1];
    const p0 = pressure.values[i];
    const p1 = pressure.values[i + 1];
    if (!ok(t0, p0) || !ok(t1, p1)) continue;
    out.push({ timeS: (series.timesS[i] + series.timesS[i + 1]) / 2, temperatureC: (t0 + t1) / 2, pressureKpa: Math.sqrt((p0 as number) * (p1 as number)) });
  }
  return out;
}

export function plateauSamples(samples: PhaseSample[], plateau: { start: number; end: number } | null, limitK: number): PlateauSample[] {
  if (!plateau) return [];
  const out: PlateauSample[] = [];
  for (const s of samples) {
    if (s.timeS < plateau.start || s.timeS > plateau.end) continue;
    const c = classifySample(s.temperatureC, s.pressureKpa, limitK);
    if (c) out.push({ ...s, ...c });
  }
  return out;
}

export type SideCounts = Record<PhaseSide, number>;

export function countSides(samples: PlateauSample[]): SideCounts {
  const counts: SideCounts = { "on-line": 0, "liquid-side": 0, "vapour-side": 0 };
  for (const s of samples) counts[s.side]++;
  return counts;
}

/** A sentence on where the plateau sat relative to the line, for the chart's caption and screen readers. */
export function describePlateauPosition(samples: PlateauSample[], limitK: number): string {
  if (samples.length === 0) return "No plateau samples to place on the diagram.";
  const counts = countSides(samples);
  const n = samples.length;
  const lowest = Math.min(...samples.map((s) => s.deviationK));
  const highest = Math.max(...samples.map((s) => s.deviationK));
  const range = `Reference minus saturation temperature ranged from ${signedTenths(lowest)} to ${signedTenths(highest)} K (limit ±${limitK} K).`;
  if (counts["on-line"] === n) return `All ${n} plateau samples sit on the liquid–vapour line, within ±${limitK} K: saturated steam. ${range}`;
  const parts: string[] = [];
  if (counts["on-line"]) parts.push(`${counts["on-line"]} on the line`);
  if (counts["liquid-side"]) parts.push(`${counts["liquid-side"]} on the liquid side, colder than saturated steam at that pressure (air or non-condensable gas)`);
  if (counts["vapour-side"]) parts.push(`${counts["vapour-side"]} on the vapour side, hotter than saturated steam at that pressure (superheat)`);
  return `Of ${n} plateau samples: ${parts.join("; ")}. ${range}`;
}

/** The view's ranges. The sterilization view is fixed around the usual bands, the cycle view fits the path. */
export function phaseRange(view: PhaseView, options: { samples: PhaseSample[]; sterilizationTempC: number; bandK: number; plateau?: PhaseSample[]; limitK?: number }): PhaseRange {
  if (view === "full") return FULL_PHASE_RANGE;
  if (view === "plateau") {
    const pts = (options.plateau ?? []).filter((s) => s.pressureKpa >= TRIPLE_POINT.pressureKpa && s.pressureKpa <= CRITICAL_POINT.pressureKpa);
    if (pts.length === 0) return phaseRange("sterilization", options);
    const limit = options.limitK ?? 2;
    let tMin = options.sterilizationTempC;
    let tMax = options.sterilizationTempC + options.bandK;
    let pMin = Infinity;
    let pMax = -Infinity;
    for (const s of pts) {
      tMin = Math.min(tMin, s.temperatureC, safeTsat(s.pressureKpa) - limit);
      tMax = Math.max(tMax, s.temperatureC, safeTsat(s.pressureKpa) + limit);
      pMin = Math.min(pMin, s.pressureKpa);
      pMax = Math.max(pMax, s.pressureKpa);
    }
    // the line across the whole temperature span must be in sight too
    pMin = Math.min(pMin, safePsat(tMin));
    pMax = Math.max(pMax, safePsat(tMax));
    const tPad = Math.max((tMax - tMin) * 0.08, 0.5);
    return { tMinC: tMin - tPad, tMaxC: tMax + tPad, pMinKpa: pMin / 1.04, pMaxKpa: pMax * 1.04 };
  }
  if (view === "sterilization") {
    const tMinC = Math.min(90, options.sterilizationTempC - 25);
    const tMaxC = Math.max(145, options.sterilizationTempC + options.bandK + 8);
    return {
      tMinC,
      tMaxC,
      pMinKpa: Math.min(50, safePsat(tMinC) * 0.8),
      pMaxKpa: Math.max(450, safePsat(tMaxC) * 1.05),
    };
  }
  const inRange = options.samples.filter((s) => s.pressureKpa >= TRIPLE_POINT.pressureKpa && s.pressureKpa <= CRITICAL_POINT.pressureKpa);
  if (inRange.length === 0) return phaseRange("sterilization", options);
  let tMin = Infinity;
  let tMax = -Infinity;
  let pMin = Infinity;
  let pMax = -Infinity;
  for (const s of inRange) {
    tMin = Math.min(tMin, s.temperatureC);
    tMax = Math.max(tMax, s.temperatureC);
    pMin = Math.min(pMin, s.pressureKpa);
    pMax = Math.max(pMax, s.pressureKpa);
  }
  // Include the line's own extent over the path's pressures, so the line is always in sight.
  tMin = Math.min(tMin, safeTsat(pMin));
  tMax = Math.max(tMax, safeTsat(pMax), options.sterilizationTempC + options.bandK);
  const tPad = Math.max((tMax - tMin) * 0.06, 2);
  return {
    tMinC: Math.floor((tMin - tPad) / 5) * 5,
    tMaxC: Math.ceil((tMax + tPad) / 5) * 5,
    pMinKpa: Math.max(pMin / 1.4, TRIPLE_POINT.pressureKpa / 2),
    pMaxKpa: Math.min(pMax * 1.4, CRITICAL_POINT.pressureKpa * 2),
  };
}

function safePsat(tC: number): number {
  return saturationPressureKpa(Math.min(Math.max(tC, TRIPLE_POINT.temperatureC), CRITICAL_POINT.temperatureC));
}

function safeTsat(pKpa: number): number {
  return saturationTemperatureC(Math.min(Math.max(pKpa, TRIPLE_POINT.pressureKpa), CRITICAL_POINT.pressureKpa));
}

/** Points of the IF97 liquid–vapour line that fall inside the range (temperature ascending). */
export function saturationCurveInRange(range: PhaseRange, points = 160): Array<{ temperatureC: number; pressureKpa: number }> {
  const fromC = Math.max(TRIPLE_POINT.temperatureC, range.tMinC, safeTsat(Math.max(range.pMinKpa, TRIPLE_POINT.pressureKpa)));
  const toC = Math.min(CRITICAL_POINT.temperatureC, range.tMaxC, safeTsat(Math.min(range.pMaxKpa, CRITICAL_POINT.pressureKpa)));
  if (!(fromC < toC)) return [];
  const line = saturationLine(points, fromC, toC);
  return line.temperatureC.map((temperatureC, i) => ({ temperatureC, pressureKpa: line.pressureKpa[i] }));
}

/** The line shifted by ±limit in temperature: the band inside which a sample counts as saturated. */
export function toleranceBand(range: PhaseRange, limitK: number, points = 120): { colder: Array<[number, number]>; hotter: Array<[number, number]> } {
  const pFrom = Math.max(range.pMinKpa, TRIPLE_POINT.pressureKpa);
  const pTo = Math.min(range.pMaxKpa, CRITICAL_POINT.pressureKpa);
  const colder: Array<[number, number]> = [];
  const hotter: Array<[number, number]> = [];
  if (!(pFrom < pTo)) return { colder, hotter };
  for (let i = 0; i < points; i++) {
    const p = Math.exp(Math.log(pFrom) + ((Math.log(pTo) - Math.log(pFrom)) * i) / (points - 1));
    const t = saturationTemperatureC(Math.min(p, CRITICAL_POINT.pressureKpa));
    colder.push([t - limitK, p]);
    hotter.push([t + limitK, p]);
  }
  return { colder, hotter };
}

export type Landmark = { id: "triple" | "boiling" | "critical"; label: string; temperatureC: number; pressureKpa: number };

export function phaseLandmarks(range: PhaseRange): Landmark[] {
  const all: Landmark[] = [
    { id: "triple", label: "Triple point", temperatureC: TRIPLE_POINT.temperatureC, pressureKpa: TRIPLE_POINT.pressureKpa },
    {
      id: "boiling",
      label: "Boiling at 1 atm",
      temperatureC: saturationTemperatureC(STANDARD_ATMOSPHERE_KPA),
      pressureKpa: STANDARD_ATMOSPHERE_KPA,
    },
    { id: "critical", label: "Critical point", temperatureC: CRITICAL_POINT.temperatureC, pressureKpa: CRITICAL_POINT.pressureKpa },
  ];
  return all.filter((l) => inRange(range, l.temperatureC, l.pressureKpa));
}

function inRange(range: PhaseRange, temperatureC: number, pressureKpa: number): boolean {
  return temperatureC >= range.tMinC && temperatureC <= range.tMaxC && pressureKpa >= range.pMinKpa && pressureKpa <= range.pMaxKpa;
}

export function formatPressureTick(kpa: number): string {
  if (kpa >= 1000) return `${Number((kpa / 1000).toPrecision(3))} MPa`;
  if (kpa >= 1) return `${Number(kpa.toPrecision(3))}`;
  return `${Number(kpa.toPrecision(2))}`;
}

/** Maps the range onto a plot box: x linear in °C, y logarithmic in kPa (up is higher pressure). */
export function phaseScales(range: PhaseRange, box: { left: number; top: number; width: number; height: number }): { x: Scale; y: Scale } {
  return {
    x: scaleLinear([range.tMinC, range.tMaxC], [box.left, box.left + box.width]),
    y: scaleLog([range.pMinKpa, range.pMaxKpa], [box.top + box.height, box.top]),
  };
}

/** Keeps at most `max` items, evenly spread, always keeping the first and last. */
export function thin<T>(items: T[], max: number): T[] {
  if (items.length <= max || max < 2) return items;
  const out: T[] = [];
  for (let i = 0; i < max; i++) out.push(items[Math.round((i * (items.length - 1)) / (max - 1))]);
  return out;
}

export type PhaseRegions = {
  liquid: Array<[number, number]>;
  vapour: Array<[number, number]>;
  /** left of the (nearly upright) melting line through the triple point, where shown */
  solid: Array<[number, number]> | null;
  /** above the critical point, where shown */
  supercritical: Array<[number, number]> | null;
};

/**
 * Polygons (temperature °C, pressure kPa) of the liquid and vapour sides within the range, bounded
 * by the liquid–vapour line. The melting line is drawn upright at the triple-point temperature:
 * over this chart's pressures it moves by less than a tenth of a kelvin.
 */
export function phaseRegions(range: PhaseRange, curve: Array<{ temperatureC: number; pressureKpa: number }>): PhaseRegions | null {
  if (curve.length < 2) return null;
  const { tMinC, tMaxC, pMinKpa, pMaxKpa } = range;
  const line: Array<[number, number]> = curve.map((c) => [c.temperatureC, c.pressureKpa]);
  const [sT, sP] = line[0];
  const [eT, eP] = line[line.length - 1];
  const near = (a: number, b: number) => Math.abs(a - b) <= 1e-6 * Math.max(1, Math.abs(b));
  const nearP = (a: number, b: number) => Math.abs(Math.log(a / b)) <= 1e-6;
  const startsAtTriple = near(sT, TRIPLE_POINT.temperatureC) && sT > tMinC && sP > pMinKpa;
  const endsAtCritical = near(eT, CRITICAL_POINT.temperatureC) && eT < tMaxC && eP < pMaxKpa;

  const liquid: Array<[number, number]> = [...line];
  const vapour: Array<[number, number]> = [...line];
  // the far end of the line
  if (endsAtCritical) {
    liquid.push([eT, pMaxKpa]);
    vapour.push([tMaxC, eP]);
  } else if (nearP(eP, pMaxKpa)) {
    vapour.push([tMaxC, pMaxKpa]);
  } else {
    liquid.push([tMaxC, pMaxKpa]);
  }
  vapour.push([tMaxC, pMinKpa]);
  // the near end of the line
  if (startsAtTriple) {
    liquid.push([sT, pMaxKpa]);
    vapour.push([tMinC, pMinKpa], [tMinC, sP]);
  } else {
    liquid.push([tMinC, pMaxKpa]);
    if (nearP(sP, pMinKpa)) liquid.push([tMinC, pMinKpa]);
    else vapour.push([tMinC, pMinKpa]);
  }
  return {
    liquid,
    vapour,
    solid: startsAtTriple
      ? [
          [tMinC, sP],
          [tMinC, pMaxKpa],
          [sT, pMaxKpa],
          [sT, sP],
        ]
      : null,
    supercritical: endsAtCritical
      ? [
          [eT, eP],
          [eT, pMaxKpa],
          [tMaxC, pMaxKpa],
          [tMaxC, eP],
        ]
      : null,
  };
}

/** Whether a point lies inside a polygon (ray casting in log-pressure space, as drawn). */
export function insidePolygon(polygon: Array<[number, number]>, temperatureC: number, pressureKpa: number): boolean {
  const y = Math.log(pressureKpa);
  let inside = false;
  for (let i = 0, j = polygon.length - 1; i < polygon.length; j = i++) {
    const [xi, pi] = polygon[i];
    const [xj, pj] = polygon[j];
    const yi = Math.log(pi);
    const yj = Math.log(pj);
    if (yi > y !== yj > y && temperatureC < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

import { STANDARD_ATMOSPHERE_KPA } from "../steam";
import { seededRandom, type SimulatedCycle } from "./cycle";

export type SimulateLeakTestOptions = {
  /** the chamber's true leak rate during the hold, kPa/min */
  leakRateKpaPerMin: number;
  /** the deepest vacuum the pump reaches, kPa abs (EN 285 asks for below 7) */
  vacuumKpa?: number;
  /** condensate evaporating after the valves close: the rise it adds, settling within a few minutes, kPa */
  condensateRiseKpa?: number;
  /** how long the record runs after the valves close, s; 15 min are the wait and the test (default 17 min) */
  recordAfterCloseS?: number;
  sampleIntervalS?: number;
  /** standard deviation of the pressure sensor's noise, kPa */
  noiseKpa?: number;
  /** add a chamber temperature column (a leak-test file needs none) */
  withTemperature?: boolean;
  seed?: number;
  startedAt?: Date;
  atmosphereKpa?: number;
};

/** Seconds from the start of the record to the moment the valves close, in every simulated leak test. */
export const SIMULATED_CLOSE_S = 360;

/**
 * An air leakage (vacuum leak) test as a logger sees it (DOMAIN.md §2.5): a minute at atmosphere,
 * evacuation to the deep vacuum, valves closed at SIMULATED_CLOSE_S, the pressure then rising by the
 * leak (plus condensate, if any), and air admitted at the end. For the demo and for tests.
 */
export function simulateLeakTest(options: SimulateLeakTestOptions): SimulatedCycle {
  const dt = options.sampleIntervalS ?? 2;
  const atmosphere = options.atmosphereKpa ?? STANDARD_ATMOSPHERE_KPA;
  const vacuum = options.vacuumKpa ?? 4.5;
  const rise = options.condensateRiseKpa ?? 0;
  const after = options.recordAfterCloseS ?? 1020;
  const noise = options.noiseKpa ?? 0.004;
  const random = seededRandom(options.seed ?? 7);
  const closeS = SIMULATED_CLOSE_S;
  const ventS = 60;
  const count = Math.floor((closeS + after + ventS) / dt) + 1;
  const timesS = new Float64Array(count);
  const pressure = new Float64Array(count);
  const chamberC = new Float64Array(count);
  let heldKpa = vacuum;
  for (let i = 0; i < count; i++) {
    const t = i * dt;
    timesS[i] = t;
    let p: number;
    if (t <= 60) p = atmosphere;
    else if (t <= closeS) p = vacuum + (atmosphere - vacuum) * Math.exp((-7 * (t - 60)) / (closeS - 60)) - (atmosphere - vacuum) * Math.exp(-7) * ((t - 60) / (closeS - 60));
    else if (t <= closeS + after) p = vacuum + rise * (1 - Math.exp(-(t - closeS) / 60)) + (options.leakRateKpaPerMin * (t - closeS)) / 60;
    else p = heldKpa + ((atmosphere - heldKpa) * (t - closeS - after)) / ventS;
    if (t <= closeS + after) heldKpa = p;
    // The sensor's noise, never below the true deep vacuum at valve closure so that t1 stays where the valves closed.
    const jitter = t > 60 && t !== closeS ? noise * (random() - 0.5) * 2 : 0;
    pressure[i] = Math.max(p + jitter, t === closeS ? vacuum : vacuum + 1e-3);
    chamberC[i] = 40 + 0.002 * (random() - 0.5);
  }
  const channels: SimulatedCycle["channels"] = [{ header: "Chamber pressure", kind: "pressure", values: pressure }];
  if (options.withTemperature) channels.unshift({ header: "Chamber", kind: "temperature", values: chamberC });
  return { startedAt: options.startedAt ?? new Date(Date.UTC(2025, 2, 3, 6, 0, 0)), timesS, channels };
}

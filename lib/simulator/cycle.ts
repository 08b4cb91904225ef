import { STANDARD_ATMOSPHERE_KPA, saturationPressureKpa, saturationTemperatureC } from "../steam";

export type Scenario = "pass" | "air" | "superheat" | "short-hold" | "slow-equilibration" | "never-reaches";
export const SCENARIOS: readonly Scenario[] = ["pass", "air", "superheat", "short-hold", "slow-equilibration", "never-reaches"];

export type SimulatedChannel = { header: string; kind: "temperature" | "pressure"; values: Float64Array };
export type SimulatedCycle = { startedAt: Date; timesS: Float64Array; channels: SimulatedChannel[] };

export type SimulateCycleOptions = {
  scenario: Scenario;
  sterilizationTempC: number;
  holdingTimeS: number;
  /** load probes besides the drain reference; default 6 */
  probeCount?: number;
  sampleIntervalS?: number;
  seed?: number;
  startedAt?: Date;
  atmosphereKpa?: number;
};

/** Small seeded generator (mulberry32) so that every run of a scenario gives the same file. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function gaussian(random: () => number): number {
  const u = Math.max(random(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random());
}

type Segment =
  | { kind: "idle"; durationS: number }
  | { kind: "evacuate"; durationS: number; toKpa: number }
  | { kind: "admit"; durationS: number; toKpa: number }
  | { kind: "heat"; durationS: number; toC: number }
  | { kind: "hold"; durationS: number; atC: number }
  | { kind: "exhaust"; durationS: number; toKpa: number }
  | { kind: "dry"; durationS: number; atKpa: number }
  | { kind: "vent"; durationS: number; toKpa: number };

type CyclePlan = { segments: Segment[]; scenario: Scenario; sterilizationTempC: number; holdingTimeS: number };

function planCycle(scenario: Scenario, sterilizationTempC: number, holdingTimeS: number, atmosphereKpa: number, idleS: number): CyclePlan {
  const controlC = scenario === "never-reaches" ? sterilizationTempC - 1.6 : scenario === "superheat" ? sterilizationTempC + 0.3 : sterilizationTempC + 1.3;
  const holdS = scenario === "short-hold" ? Math.round(holdingTimeS * 0.6) : scenario === "slow-equilibration" ? holdingTimeS + 160 : holdingTimeS + 40;
  const segments: Segment[] = [{ kind: "idle", durationS: idleS }];
  for (let pulse = 0; pulse < 3; pulse++) {
    segments.push({ kind: "evacuate", durationS: 110, toKpa: 7 });
    segments.push({ kind: "admit", durationS: 50, toKpa: pulse < 2 ? 150 : atmosphereKpa + 20 });
  }
  segments.push({ kind: "heat", durationS: 100, toC: controlC });
  segments.push({ kind: "hold", durationS: holdS, atC: controlC });
  segments.push({ kind: "exhaust", durationS: 80, toKpa: 12 });
  segments.push({ kind: "dry", durationS: 300, atKpa: 6 });
  segments.push({ kind: "vent", durationS: 60, toKpa: atmosphereKpa });
  return { segments, scenario, sterilizationTempC, holdingTimeS };
}

function durationOf(plan: CyclePlan): number {
  return plan.segments.reduce((sum, s) => sum + s.durationS, 0);
}

type ModelState = {
  pressureKpa: number;
  drainC: number;
  probesC: Float64Array;
  /** time constants of the load probes during steam phases, s */
  probeTauS: Float64Array;
};

/** Steps the chamber model through a cycle plan, writing samples from sampleOffset on; returns the next offset. */
function runCycle(
  plan: CyclePlan,
  state: ModelState,
  random: () => number,
  dtS: number,
  atmosphereKpa: number,
  out: { pressure: Float64Array; drain: Float64Array; probes: Float64Array[] },
  sampleOffset: number,
  maxSamples: number,
): number {
  const ts = plan.sterilizationTempC;
  const jacketC = ts - 15;
  let index = sampleOffset;
  let holdElapsed = 0;
  for (const segment of plan.segments) {
    const steps = Math.max(1, Math.round(segment.durationS / dtS));
    const startKpa = state.pressureKpa;
    const startSteamC = saturationTemperatureC(Math.max(startKpa, 1));
    for (let k = 1; k <= steps; k++) {
      if (index >= maxSamples) return index;
      const f = k / steps;
      let steam = false;
      let pressure: number;
      let steamC = 0;
      let offsetDrainC = 0;
      let offsetLoadC = 0;
      switch (segment.kind) {
        case "idle":
          pressure = atmosphereKpa;
          break;
        case "evacuate":
          pressure = segment.toKpa + (startKpa - segment.toKpa) * Math.exp(-5 * f);
          break;
        case "exhaust":
          // The exhaust valve opens gradually, so the drain can follow the falling saturation temperature.
          pressure = f < 0.5 ? startKpa - (startKpa - segment.toKpa) * 1.6 * f * f : segment.toKpa + (startKpa - 0.4 * (startKpa - segment.toKpa) - segment.toKpa) * Math.exp(-6 * (f - 0.5));
          steam = true;
          break;
        case "admit":
        case "vent":
          pressure = startKpa + (segment.toKpa - startKpa) * f;
          steam = segment.kind === "admit";
          break;
        case "heat": {
          // Steam temperature rises steadily, then eases into the set point.
          const eased = 1 - (1 - f) * (1 - f);
          steamC = startSteamC + (segment.toC - startSteamC) * eased;
          pressure = saturationPressureKpa(steamC);
          steam = true;
          break;
        }
        case "hold":
          holdElapsed += dtS;
          steamC = segment.atC + 0.15 * Math.sin(holdElapsed / 23);
          pressure = saturationPressureKpa(steamC);
          steam = true;
          if (plan.scenario === "air" && holdElapsed > 60 && holdElapsed <= 120) {
            // Air in the chamber: the controller keeps the drain temperature, so the total pressure climbs.
            const airFraction = 0.11;
            pressure = pressure / (1 - airFraction);
          }
          if (plan.scenario === "superheat" && holdElapsed <= 50) {
            offsetDrainC = 2.4;
            offsetLoadC = 0.9;
          }
          break;
        case "dry":
          pressure = segment.atKpa;
          break;
      }
      pressure += 0.08 * gaussian(random);
      state.pressureKpa = pressure;
      const tsatC = saturationTemperatureC(Math.max(pressure, 0.7));
      if (steam) {
        const chamberC = segment.kind === "heat" || segment.kind === "hold" ? steamC : tsatC;
        state.drainC += (chamberC + offsetDrainC - state.drainC) * Math.min(1, dtS / 2);
        for (let p = 0; p < state.probesC.length; p++) {
          const tau = state.probeTauS[p];
          state.probesC[p] += (chamberC + offsetLoadC + (0.25 * (p % 3)) / 3 - state.probesC[p]) * Math.min(1, dtS / tau);
        }
      } else {
        const targetC = 0.5 * tsatC + 0.5 * jacketC;
        state.drainC += (targetC - state.drainC) * Math.min(1, dtS / 15);
        for (let p = 0; p < state.probesC.length; p++) {
          state.probesC[p] += (targetC - state.probesC[p]) * Math.min(1, dtS / 90);
        }
      }
      out.pressure[index] = pressure;
      out.drain[index] = state.drainC + 0.03 * gaussian(random);
      for (let p = 0; p < state.probesC.length; p++) out.probes[p][index] = state.probesC[p] + 0.03 * gaussian(random);
      index++;
    }
  }
  return index;
}

function newState(probeCount: number, scenario: Scenario, random: () => number, atmosphereKpa: number): ModelState {
  const probeTauS = new Float64Array(probeCount);
  for (let p = 0; p < probeCount; p++) probeTauS[p] = 2.5 + 2 * random();
  if (scenario === "slow-equilibration" && probeCount > 0) probeTauS[Math.min(2, probeCount - 1)] = 45;
  const probesC = new Float64Array(probeCount).fill(22);
  return { pressureKpa: atmosphereKpa, drainC: 60, probesC, probeTauS };
}

function checkOptions(o: { sterilizationTempC: number; holdingTimeS: number; sampleIntervalS: number; probeCount: number }): void {
  if (!(o.sterilizationTempC >= 105 && o.sterilizationTempC <= 140)) throw new RangeError(`The simulator covers sterilization temperatures from 105 to 140 °C, not ${o.sterilizationTempC}`);
  if (!(o.holdingTimeS > 0 && o.holdingTimeS <= 7200)) throw new RangeError(`Holding time ${o.holdingTimeS} s is outside 1 s to 2 h`);
  if (!(o.sampleIntervalS > 0 && o.sampleIntervalS <= 10)) throw new RangeError(`Sample interval ${o.sampleIntervalS} s is outside 0–10 s`);
  if (!(Number.isInteger(o.probeCount) && o.probeCount >= 1 && o.probeCount <= 64)) throw new RangeError(`Probe count ${o.probeCount} is not between 1 and 64`);
}

function channelsFrom(out: { pressure: Float64Array; drain: Float64Array; probes: Float64Array[] }, count: number): SimulatedChannel[] {
  return [
    { header: "Drain (°C)", kind: "temperature", values: out.drain.slice(0, count) },
    ...out.probes.map((values, p) => ({ header: `Pack ${p + 1} (°C)`, kind: "temperature" as const, values: values.slice(0, count) })),
    { header: "Chamber (kPa abs)", kind: "pressure", values: out.pressure.slice(0, count) },
  ];
}

/** One pre-vacuum cycle: three vacuum/steam pulses, heat-up, plateau, exhaust, drying and venting. */
export function simulateCycle(options: SimulateCycleOptions): SimulatedCycle {
  const probeCount = options.probeCount ?? 6;
  const sampleIntervalS = options.sampleIntervalS ?? 1;
  const atmosphereKpa = options.atmosphereKpa ?? STANDARD_ATMOSPHERE_KPA;
  checkOptions({ ...options, probeCount, sampleIntervalS });
  const random = seededRandom(options.seed ?? 1);
  const plan = planCycle(options.scenario, options.sterilizationTempC, options.holdingTimeS, atmosphereKpa, 60);
  const samples = Math.ceil(durationOf(plan) / sampleIntervalS) + plan.segments.length;
  const out = { pressure: new Float64Array(samples), drain: new Float64Array(samples), probes: Array.from({ length: probeCount }, () => new Float64Array(samples)) };
  const state = newState(probeCount, options.scenario, random, atmosphereKpa);
  const count = runCycle(plan, state, random, sampleIntervalS, atmosphereKpa, out, 0, samples);
  const timesS = new Float64Array(count);
  for (let i = 0; i < count; i++) timesS[i] = i * sampleIntervalS;
  return { startedAt: options.startedAt ?? new Date(Date.UTC(2025, 2, 3, 7, 30, 0)), timesS, channels: channelsFrom(out, count) };
}

export type SimulateDayOptions = {
  sterilizationTempC?: number;
  holdingTimeS?: number;
  /** temperature channels in all (drain + load probes); default 16 */
  temperatureChannels?: number;
  samples?: number;
  sampleIntervalS?: number;
  /** scenarios used in turn, cycle after cycle; default all "pass" */
  scenarios?: Scenario[];
  idleS?: number;
  seed?: number;
  startedAt?: Date;
  atmosphereKpa?: number;
};

/** A day of back-to-back cycles (86 400 one-second samples by default) for the benchmark and long charts. */
export function simulateDay(options: SimulateDayOptions = {}): SimulatedCycle {
  const sterilizationTempC = options.sterilizationTempC ?? 134;
  const holdingTimeS = options.holdingTimeS ?? 180;
  const sampleIntervalS = options.sampleIntervalS ?? 1;
  const probeCount = (options.temperatureChannels ?? 16) - 1;
  const samples = options.samples ?? 86400;
  const atmosphereKpa = options.atmosphereKpa ?? STANDARD_ATMOSPHERE_KPA;
  const scenarios = options.scenarios ?? ["pass"];
  checkOptions({ sterilizationTempC, holdingTimeS, sampleIntervalS, probeCount });
  const random = seededRandom(options.seed ?? 7);
  const out = { pressure: new Float64Array(samples), drain: new Float64Array(samples), probes: Array.from({ length: probeCount }, () => new Float64Array(samples)) };
  let index = 0;
  let cycle = 0;
  while (index < samples) {
    const scenario = scenarios[cycle % scenarios.length];
    const state = newState(probeCount, scenario, random, atmosphereKpa);
    if (index > 0) {
      state.drainC = out.drain[index - 1];
      for (let p = 0; p < probeCount; p++) state.probesC[p] = out.probes[p][index - 1];
      state.pressureKpa = out.pressure[index - 1];
    }
    const plan = planCycle(scenario, sterilizationTempC, holdingTimeS, atmosphereKpa, options.idleS ?? 600);
    index = runCycle(plan, state, random, sampleIntervalS, atmosphereKpa, out, index, samples);
    cycle++;
  }
  const timesS = new Float64Array(samples);
  for (let i = 0; i < samples; i++) timesS[i] = i * sampleIntervalS;
  return { startedAt: options.startedAt ?? new Date(Date.UTC(2025, 2, 3, 0, 0, 0)), timesS, channels: channelsFrom(out, samples) };
}

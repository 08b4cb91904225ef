import type { Recording } from "../logger-files/types";
import { SteamRangeError, saturationTemperatureC } from "../steam";
import { lethalityMinutes } from "./f0";
import {
  AnalysisError,
  type AcceptanceLimits,
  type AnalysisResult,
  type ChannelSummary,
  type Check,
  type CheckId,
  type Diagnosis,
  type SaturationFlag,
} from "./types";

// How each failed check reads in the one-line summary (the labels name the passing condition).
const FAILURE_WORDS: Partial<Record<CheckId, string>> = {
  "plateau-reached": "the reference did not reach the sterilization temperature",
  "equilibration-time": "equilibration took too long",
  "holding-time": "the holding time was too short",
  band: "a temperature left the sterilization band during holding",
  spread: "the channels differed too much during holding",
  saturation: "the reference did not follow saturated steam",
};

export const ENGINE_VERSION = "papin-analysis 1.0.0";

/**
 * A new plateau can only start once the reference has fallen this far below Ts (as at exhaust),
 * so a brief dip during holding does not count as a second cycle.
 */
export const PLATEAU_REARM_K = 10;

type PlateauSpan = { startIndex: number; regionEndIndex: number };

const round = (value: number, digits = 3) => {
  const f = 10 ** digits;
  return Math.round(value * f) / f;
};
const fmt = (value: number, digits = 1) => value.toFixed(digits);
const seconds = (value: number) => `${fmt(value, Number.isInteger(value) ? 0 : 1)} s`;

function validateLimits(limits: AcceptanceLimits): void {
  const entries: Array<[keyof AcceptanceLimits, boolean]> = [
    ["sterilizationTempC", limits.sterilizationTempC > 0 && limits.sterilizationTempC < 374],
    ["holdingTimeS", limits.holdingTimeS > 0],
    ["bandK", limits.bandK > 0],
    ["maxEquilibrationS", limits.maxEquilibrationS >= 0],
    ["maxSpreadK", limits.maxSpreadK > 0],
    ["saturationLimitK", limits.saturationLimitK > 0],
    ["f0ReferenceC", Number.isFinite(limits.f0ReferenceC)],
    ["f0ZK", limits.f0ZK > 0],
  ];
  for (const [name, ok] of entries) {
    if (!ok || !Number.isFinite(limits[name])) throw new AnalysisError(`The acceptance limit ${name} = ${limits[name]} is not a usable value`);
  }
}

function validateRecording(recording: Recording): void {
  const n = recording.timesS.length;
  if (n < 2) throw new AnalysisError("The recording needs at least two samples");
  if (recording.temperatures.length === 0) throw new AnalysisError("The recording has no temperature channel");
  for (const channel of recording.temperatures) {
    if (channel.values.length !== n) throw new AnalysisError(`Channel "${channel.header}" has ${channel.values.length} samples where the time axis has ${n}`);
  }
  if (recording.pressure.values.length !== n) throw new AnalysisError(`The pressure channel has ${recording.pressure.values.length} samples where the time axis has ${n}`);
  if (!(recording.referenceIndex >= 0 && recording.referenceIndex < recording.temperatures.length)) {
    throw new AnalysisError(`Reference index ${recording.referenceIndex} does not name a temperature channel`);
  }
}

/** Plateau starts: the reference reaching Ts, each after it had fallen PLATEAU_REARM_K below. */
export function findPlateaus(reference: ArrayLike<number>, sterilizationTempC: number): PlateauSpan[] {
  const spans: PlateauSpan[] = [];
  const rearmBelow = sterilizationTempC - PLATEAU_REARM_K;
  let open: PlateauSpan | null = null;
  for (let i = 0; i < reference.length; i++) {
    const t = reference[i];
    if (open === null) {
      if (t >= sterilizationTempC) open = { startIndex: i, regionEndIndex: reference.length - 1 };
    } else if (t < rearmBelow) {
      open.regionEndIndex = i - 1;
      spans.push(open);
      open = null;
    }
  }
  if (open) spans.push(open);
  return spans;
}

function describeDuration(s: number): string {
  if (s < 120) return seconds(s);
  const minutes = Math.floor(s / 60);
  const rest = Math.round(s - minutes * 60);
  return rest === 0 ? `${minutes} min` : `${minutes} min ${rest} s`;
}

function flagDiagnosis(kind: "below" | "above", worst: number, start: number, end: number, reference: string): string {
  const span = `From ${seconds(start)} to ${seconds(end)}`;
  if (kind === "below") {
    return (
      `${span} "${reference}" read up to ${fmt(Math.abs(worst))} K colder than saturated steam at the chamber pressure: ` +
      "part of that pressure was air or another non-condensable gas, which shields the load from steam. " +
      "Look at air removal (vacuum depth and number of pulses, the vacuum pump), at leaks (door seal, valves, sensor glands: run an air-leakage test) " +
      "and at non-condensable gases in the steam supply."
    );
  }
  return (
    `${span} "${reference}" read up to ${fmt(Math.abs(worst))} K hotter than saturated steam at the chamber pressure: the steam was superheated, ` +
    "and superheated steam sterilizes like hot air, far less well. Look at the jacket (hotter than the chamber), " +
    "at a large pressure drop across the steam supply's reducing valve, at over-dry supply steam, and at over-dried textiles taking up moisture."
  );
}

/** Analyses one plateau of a recording against the acceptance limits (DESIGN.md "The analysis"). */
export function analyzeRecording(recording: Recording, limits: AcceptanceLimits, options: { plateau?: number } = {}): AnalysisResult {
  validateLimits(limits);
  validateRecording(recording);
  const { timesS, temperatures, pressure, referenceIndex } = recording;
  const n = timesS.length;
  const ts = limits.sterilizationTempC;
  const reference = temperatures[referenceIndex].values;
  const referenceHeader = temperatures[referenceIndex].header;
  const bandTop = ts + limits.bandK;

  const f0: Record<string, number> = {};
  const f0Values = temperatures.map((c) => lethalityMinutes(timesS, c.values, limits.f0ReferenceC, limits.f0ZK));
  temperatures.forEach((c, k) => (f0[c.header] = round(f0Values[k], 4)));

  const intervals: number[] = [];
  const step = Math.max(1, Math.floor(n / 1000));
  for (let i = step; i < n; i += step) intervals.push(timesS[i] - timesS[i - 1]);
  intervals.sort((a, b) => a - b);
  const record = {
    startedAt: recording.startedAt,
    samples: n,
    durationS: round(timesS[n - 1] - timesS[0], 3),
    medianSampleIntervalS: round(intervals[Math.floor(intervals.length / 2)] ?? 0, 3),
  };

  const plateaus = findPlateaus(reference, ts);
  const wanted = options.plateau ?? 0;
  if (!Number.isInteger(wanted) || wanted < 0) throw new AnalysisError(`Plateau ${wanted} is not a valid plateau number`);
  if (plateaus.length > 0 && wanted >= plateaus.length) {
    throw new AnalysisError(
      `The record holds ${plateaus.length} plateau${plateaus.length === 1 ? "" : "s"}; plateau ${wanted + 1} does not exist`,
    );
  }

  const checks: Check[] = [];
  const diagnoses: Diagnosis[] = [];
  const basisProfile = "acceptance profile";
  const addCheck = (check: Check) => checks.push(check);

  let maxReference = -Infinity;
  let maxReferenceAt = 0;
  for (let i = 0; i < n; i++) {
    if (reference[i] > maxReference) {
      maxReference = reference[i];
      maxReferenceAt = timesS[i];
    }
  }

  const emptyChannels = (arrivals: Array<number | null>, startS: number | null): ChannelSummary[] =>
    temperatures.map((c, k) => ({
      header: c.header,
      role: k === referenceIndex ? "reference" : "load",
      minDuringHold: null,
      maxDuringHold: null,
      meanDuringHold: null,
      f0: round(f0Values[k], 4),
      firstArrival: arrivals[k] ?? null,
      arrivalAfterPlateauStart: arrivals[k] !== null && arrivals[k] !== undefined && startS !== null ? round((arrivals[k] as number) - startS, 3) : null,
    }));

  const plateauCheck: Check = {
    id: "plateau-reached",
    label: "Reference reaches the sterilization temperature",
    passed: plateaus.length > 0,
    measured: round(maxReference, 3),
    limit: ts,
    comparison: "at-least",
    unit: "°C",
    basis: `${basisProfile}: sterilization temperature ${ts} °C, the lower limit of the band`,
  };
  addCheck(plateauCheck);

  const equilibrationBasis = `${basisProfile}: at most ${limits.maxEquilibrationS} s (EN 285 sets 15 s for chambers up to 800 l, 30 s above)`;
  const holdingBasis = `${basisProfile}: at least ${limits.holdingTimeS} s at or above ${ts} °C (EN 285 minimums: 15 min at 121 °C, 10 min at 126 °C, 3 min at 134 °C)`;
  const bandBasis = `${basisProfile}: band ${ts} to ${round(bandTop, 3)} °C, Ts + ${limits.bandK} K (EN 285 band width 3 K)`;
  const spreadBasis = `${basisProfile}: at most ${limits.maxSpreadK} K between channels at any instant during holding (EN 285)`;
  const saturationBasis = `${basisProfile}: reference within ±${limits.saturationLimitK} K of the saturation temperature at the chamber pressure (IAPWS-IF97) throughout the plateau (EN 285)`;

  if (plateaus.length === 0) {
    diagnoses.push({
      checkId: "plateau-reached",
      text:
        `"${referenceHeader}" never reached ${ts} °C (highest ${fmt(maxReference, 2)} °C at ${seconds(maxReferenceAt)}), so there was no plateau. ` +
        "Look at the controller's set point, the steam supply pressure, the chamber pressure reached and the drain temperature sensor.",
    });
    for (const [id, label, unit, comparison, limit, basis] of [
      ["equilibration-time", "Equilibration time", "s", "at-most", limits.maxEquilibrationS, equilibrationBasis],
      ["holding-time", "Holding time", "s", "at-least", limits.holdingTimeS, holdingBasis],
      ["band", "All temperatures within the band during holding", "°C", "at-most", bandTop, bandBasis],
      ["spread", "Spread between channels during holding", "K", "at-most", limits.maxSpreadK, spreadBasis],
      ["saturation", "Reference agrees with saturated steam", "K", "at-most", limits.saturationLimitK, saturationBasis],
    ] as const) {
      addCheck({ id, label, passed: false, measured: null, limit: round(limit, 3), comparison, unit, basis });
    }
    return {
      engineVersion: ENGINE_VERSION,
      verdict: "fail",
      summary: `Fail: the reference never reached ${ts} °C (highest ${fmt(maxReference, 2)} °C).`,
      plateau: null,
      plateausFound: 0,
      plateauIndex: null,
      equilibrationTime: null,
      holdingTime: null,
      saturation: { maxDeviation: null, lowestDeviation: null, highestDeviation: null, flags: [] },
      f0,
      checks,
      referenceChannel: referenceHeader,
      pressureChannel: pressure.header,
      channels: emptyChannels([], null),
      saturationTemperatureDuringHold: null,
      diagnoses,
      limits: { ...limits },
      record,
    };
  }

  const span = plateaus[wanted];
  const s = span.startIndex;
  const regionEnd = span.regionEndIndex;
  const startS = timesS[s];

  // Equilibration: each channel's first arrival at Ts within this plateau.
  const arrivalIndex = temperatures.map((c) => {
    for (let i = s; i <= regionEnd; i++) if (c.values[i] >= ts) return i;
    return -1;
  });
  const arrivals = arrivalIndex.map((i) => (i >= 0 ? timesS[i] : null));
  const missing = temperatures.filter((_, k) => arrivalIndex[k] < 0);
  let equilibrationTime: number | null = null;
  let holdingTime: number | null = null;
  let holdStart = -1;
  let holdEnd = -1;
  let plateauEndIndex: number;
  let lastReferenceHigh = s;
  for (let i = s; i <= regionEnd; i++) if (reference[i] >= ts) lastReferenceHigh = i;

  if (missing.length === 0) {
    holdStart = Math.max(...arrivalIndex);
    equilibrationTime = timesS[holdStart] - startS;
    holdEnd = holdStart;
    outer: for (let i = holdStart + 1; i <= regionEnd; i++) {
      for (const c of temperatures) if (!(c.values[i] >= ts)) break outer;
      holdEnd = i;
    }
    holdingTime = timesS[holdEnd] - timesS[holdStart];
    plateauEndIndex = holdEnd;
  } else {
    plateauEndIndex = lastReferenceHigh;
  }

  // Equilibration check
  if (equilibrationTime === null) {
    const names = missing.map((c) => {
      let max = -Infinity;
      for (let i = s; i <= regionEnd; i++) max = Math.max(max, c.values[i]);
      return `"${c.header}" (highest ${fmt(max, 2)} °C)`;
    });
    diagnoses.push({
      checkId: "equilibration-time",
      text:
        `${names.join(", ")} never reached ${ts} °C during the plateau, so the load never equilibrated and there was no holding time. ` +
        "Steam did not penetrate the load: look at air removal, the load's size and wrapping, and the probes' placement.",
    });
  } else if (equilibrationTime > limits.maxEquilibrationS) {
    const slowest = temperatures[arrivalIndex.indexOf(holdStart)];
    diagnoses.push({
      checkId: "equilibration-time",
      text:
        `"${slowest.header}" reached ${ts} °C ${seconds(round(equilibrationTime, 1))} after the reference (limit ${seconds(limits.maxEquilibrationS)}): ` +
        "steam reached that point of the load slowly. Look at residual air in the load (air removal), a load too dense or wrapped too tightly, and condensate pooling.",
    });
  }
  addCheck({
    id: "equilibration-time",
    label: "Equilibration time",
    passed: equilibrationTime !== null && equilibrationTime <= limits.maxEquilibrationS,
    measured: equilibrationTime === null ? null : round(equilibrationTime, 3),
    limit: limits.maxEquilibrationS,
    comparison: "at-most",
    unit: "s",
    basis: equilibrationBasis,
  });

  // Holding
  const holdingPassed = holdingTime !== null && holdingTime >= limits.holdingTimeS;
  if (holdingTime !== null && !holdingPassed) {
    let cause: string;
    const next = holdEnd + 1;
    if (next <= regionEnd) {
      const dipped = temperatures.filter((c) => !(c.values[next] >= ts));
      const referenceStillUp = dipped.every((c) => c !== temperatures[referenceIndex]);
      cause =
        `The hold ended at ${seconds(timesS[next])} when ${dipped.map((c) => `"${c.header}" fell to ${fmt(c.values[next], 2)} °C`).join(", ")}` +
        (referenceStillUp ? " while the reference was still up: a cold spot in the load or a dip in the steam supply." : ".");
    } else if (regionEnd === n - 1) {
      cause = "The record ends while the temperatures are still up: the logger may have stopped too early.";
    } else {
      cause = "The cycle moved on to exhaust before the holding time was complete.";
    }
    diagnoses.push({
      checkId: "holding-time",
      text:
        `All channels stayed at or above ${ts} °C for ${describeDuration(round(holdingTime, 1))}, short of the ${describeDuration(limits.holdingTimeS)} required. ${cause} ` +
        "Check the controller's holding time and set point.",
    });
  }
  addCheck({
    id: "holding-time",
    label: "Holding time",
    passed: holdingPassed,
    measured: holdingTime === null ? null : round(holdingTime, 3),
    limit: limits.holdingTimeS,
    comparison: "at-least",
    unit: "s",
    basis: holdingBasis,
  });

  // Band, spread and channel figures over holding.
  const channels = emptyChannels(arrivals, startS);
  let maxDuringHold: number | null = null;
  let maxSpread: number | null = null;
  let maxSpreadAt = 0;
  let hottest = "";
  let saturationDuringHold: AnalysisResult["saturationTemperatureDuringHold"] = null;
  if (holdStart >= 0) {
    temperatures.forEach((c, k) => {
      let min = Infinity;
      let max = -Infinity;
      let sum = 0;
      for (let i = holdStart; i <= holdEnd; i++) {
        const v = c.values[i];
        if (v < min) min = v;
        if (v > max) max = v;
        sum += v;
      }
      channels[k].minDuringHold = round(min, 3);
      channels[k].maxDuringHold = round(max, 3);
      channels[k].meanDuringHold = round(sum / (holdEnd - holdStart + 1), 3);
      if (maxDuringHold === null || max > maxDuringHold) {
        maxDuringHold = max;
        hottest = c.header;
      }
    });
    maxSpread = 0;
    for (let i = holdStart; i <= holdEnd; i++) {
      let min = Infinity;
      let max = -Infinity;
      for (const c of temperatures) {
        const v = c.values[i];
        if (v < min) min = v;
        if (v > max) max = v;
      }
      if (max - min > maxSpread) {
        maxSpread = max - min;
        maxSpreadAt = timesS[i];
      }
    }
  }
  const bandPassed = maxDuringHold !== null && maxDuringHold <= bandTop + 1e-9;
  if (maxDuringHold !== null && !bandPassed) {
    diagnoses.push({
      checkId: "band",
      text:
        `"${hottest}" reached ${fmt(maxDuringHold, 2)} °C during holding, above the band's top of ${fmt(bandTop, 2)} °C: ` +
        "look at the controller's set point and overshoot, and for superheat from the jacket or the supply.",
    });
  }
  addCheck({
    id: "band",
    label: "All temperatures within the band during holding",
    passed: bandPassed,
    measured: maxDuringHold === null ? null : round(maxDuringHold, 3),
    limit: round(bandTop, 3),
    comparison: "at-most",
    unit: "°C",
    basis: bandBasis,
  });
  const spreadPassed = maxSpread !== null && maxSpread <= limits.maxSpreadK + 1e-9;
  if (maxSpread !== null && !spreadPassed) {
    diagnoses.push({
      checkId: "spread",
      text:
        `At ${seconds(maxSpreadAt)} the channels differed by ${fmt(maxSpread, 2)} K (limit ${limits.maxSpreadK} K): the load heated unevenly. ` +
        "Look at air pockets or slow penetration in the load, superheat near the walls, and each probe's calibration.",
    });
  }
  addCheck({
    id: "spread",
    label: "Spread between channels during holding",
    passed: spreadPassed,
    measured: maxSpread === null ? null : round(maxSpread, 3),
    limit: limits.maxSpreadK,
    comparison: "at-most",
    unit: "K",
    basis: spreadBasis,
  });

  // Saturation over the plateau: reference against Tsat(chamber pressure).
  const flags: SaturationFlag[] = [];
  let largest = 0;
  let lowest = Infinity;
  let highest = -Infinity;
  let satMin = Infinity;
  let satMax = -Infinity;
  let satSum = 0;
  let open: { startIndex: number; endIndex: number; kind: "below" | "above"; worst: number } | null = null;
  const closeFlag = () => {
    if (!open) return;
    const start = timesS[open.startIndex];
    const end = timesS[open.endIndex];
    flags.push({
      start: round(start, 3),
      end: round(end, 3),
      durationS: round(end - start, 3),
      kind: open.kind,
      worst: round(open.worst, 3),
      diagnosis: flagDiagnosis(open.kind, open.worst, start, end, referenceHeader),
    });
    open = null;
  };
  for (let i = s; i <= plateauEndIndex; i++) {
    let tsat: number;
    try {
      tsat = saturationTemperatureC(pressure.values[i]);
    } catch (error) {
      if (error instanceof SteamRangeError) {
        throw new AnalysisError(
          `Chamber pressure at ${seconds(timesS[i])} during the plateau: ${error.message}. Check the pressure unit and the gauge/absolute setting`,
        );
      }
      throw error;
    }
    if (i >= holdStart && i <= holdEnd && holdStart >= 0) {
      if (tsat < satMin) satMin = tsat;
      if (tsat > satMax) satMax = tsat;
      satSum += tsat;
    }
    const deviation = reference[i] - tsat;
    if (Math.abs(deviation) > largest) largest = Math.abs(deviation);
    if (deviation < lowest) lowest = deviation;
    if (deviation > highest) highest = deviation;
    const kind = deviation < -limits.saturationLimitK ? "below" : deviation > limits.saturationLimitK ? "above" : null;
    if (open && open.kind !== kind) closeFlag();
    if (kind) {
      if (!open) open = { startIndex: i, endIndex: i, kind, worst: deviation };
      open.endIndex = i;
      if (Math.abs(deviation) > Math.abs(open.worst)) open.worst = deviation;
    }
  }
  closeFlag();
  if (holdStart >= 0) {
    saturationDuringHold = { min: round(satMin, 3), max: round(satMax, 3), mean: round(satSum / (holdEnd - holdStart + 1), 3) };
  }
  for (const flag of flags) diagnoses.push({ checkId: "saturation", text: flag.diagnosis });
  addCheck({
    id: "saturation",
    label: "Reference agrees with saturated steam",
    passed: flags.length === 0,
    measured: round(largest, 3),
    limit: limits.saturationLimitK,
    comparison: "at-most",
    unit: "K",
    basis: saturationBasis,
  });

  const verdict = checks.every((c) => c.passed) ? "pass" : "fail";
  const failed = checks.filter((c) => !c.passed).map((c) => FAILURE_WORDS[c.id] ?? c.label.toLowerCase());
  const summary =
    verdict === "pass"
      ? `Pass: plateau from ${seconds(round(startS, 1))}, equilibration ${seconds(round(equilibrationTime ?? 0, 1))}, holding ${describeDuration(round(holdingTime ?? 0, 1))}; ` +
        `every channel stayed within ${ts}–${round(bandTop, 3)} °C and the reference followed saturated steam within ${fmt(largest, 2)} K.`
      : `Fail: ${failed.join("; ")}.`;


  return {
    engineVersion: ENGINE_VERSION,
    verdict,
    summary,
    plateau: { start: round(startS, 3), end: round(timesS[plateauEndIndex], 3) },
    plateausFound: plateaus.length,
    plateauIndex: wanted,
    equilibrationTime: equilibrationTime === null ? null : round(equilibrationTime, 3),
    holdingTime: holdingTime === null ? null : round(holdingTime, 3),
    saturation: {
      maxDeviation: round(largest, 3),
      lowestDeviation: round(lowest, 3),
      highestDeviation: round(highest, 3),
      flags,
    },
    f0,
    checks,
    referenceChannel: referenceHeader,
    pressureChannel: pressure.header,
    channels,
    saturationTemperatureDuringHold: saturationDuringHold,
    diagnoses,
    limits: { ...limits },
    record,
  };
}

/** Saturation temperature for each pressure sample, °C; NaN (a gap in a chart) where the pressure has no saturation line. */
export function saturationTemperatureSeries(pressureKpaAbs: Float64Array): Float64Array {
  const out = new Float64Array(pressureKpaAbs.length);
  for (let i = 0; i < out.length; i++) {
    const p = pressureKpaAbs[i];
    out[i] = p >= 0.611657 && p <= 22064 ? saturationTemperatureC(p) : NaN;
  }
  return out;
}

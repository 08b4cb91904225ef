import type { Recording } from "../logger-files/types";
import { SteamRangeError, saturationTemperatureC } from "../steam";
import { CHECK_LABELS } from "./checks";
import type { PlateauTiming } from "./equilibration";
import { AnalysisError, type AcceptanceLimits, type AnalysisResult, type Check, type Diagnosis, type SaturationFlag } from "./types";
import { fmt, round, seconds } from "./words";

export type SaturationScan = {
  /** largest |reference − Tsat(p)| over the plateau, K */
  largest: number;
  lowest: number;
  highest: number;
  flags: SaturationFlag[];
  duringHold: AnalysisResult["saturationTemperatureDuringHold"];
};

type OpenFlag = { startIndex: number; endIndex: number; kind: "below" | "above"; worst: number };

/** Tsat(chamber pressure), °C, at one sample; a pressure off the saturation line is the user's unit or gauge setting, said so. */
function tsatAt(recording: Recording, i: number): number {
  try {
    return saturationTemperatureC(recording.pressure.values[i]);
  } catch (error) {
    if (error instanceof SteamRangeError) {
      throw new AnalysisError(`Chamber pressure at ${seconds(recording.timesS[i])} during the plateau: ${error.message}. Check the pressure unit and the gauge/absolute setting`);
    }
    throw error;
  }
}

/** The reference against the saturation temperature of the chamber pressure, over the plateau. */
export function scanSaturation(recording: Recording, timing: PlateauTiming, limits: AcceptanceLimits): SaturationScan {
  const { timesS } = recording;
  const reference = recording.temperatures[recording.referenceIndex];
  const { holdStart, holdEnd } = timing;
  const scan: SaturationScan = { largest: 0, lowest: Infinity, highest: -Infinity, flags: [], duringHold: null };
  let satMin = Infinity;
  let satMax = -Infinity;
  let satSum = 0;
  let open: OpenFlag | null = null;
  const closeFlag = () => {
    if (!open) return;
    scan.flags.push(toFlag(open, timesS, reference.header));
    open = null;
  };
  for (let i = timing.startIndex; i <= timing.plateauEndIndex; i++) {
    const tsat = tsatAt(recording, i);
    if (i >= holdStart && i <= holdEnd && holdStart >= 0) {
      if (tsat < satMin) satMin = tsat;
      if (tsat > satMax) satMax = tsat;
      satSum += tsat;
    }
    const deviation = reference.values[i] - tsat;
    if (Math.abs(deviation) > scan.largest) scan.largest = Math.abs(deviation);
    if (deviation < scan.lowest) scan.lowest = deviation;
    if (deviation > scan.highest) scan.highest = deviation;
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
    scan.duringHold = { min: round(satMin, 3), max: round(satMax, 3), mean: round(satSum / (holdEnd - holdStart + 1), 3) };
  }
  return scan;
}

function toFlag(open: OpenFlag, timesS: Float64Array, referenceHeader: string): SaturationFlag {
  const start = timesS[open.startIndex];
  const end = timesS[open.endIndex];
  return {
    start: round(start, 3),
    end: round(end, 3),
    durationS: round(end - start, 3),
    kind: open.kind,
    worst: round(open.worst, 3),
    diagnosis: flagDiagnosis(open.kind, open.worst, start, end, referenceHeader),
  };
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

export function checkSaturation(scan: SaturationScan, limits: AcceptanceLimits, basis: string): { check: Check; diagnoses: Diagnosis[] } {
  const check: Check = {
    id: "saturation",
    label: CHECK_LABELS.saturation,
    passed: scan.flags.length === 0,
    measured: round(scan.largest, 3),
    limit: limits.saturationLimitK,
    comparison: "at-most",
    unit: "K",
    basis,
  };
  return { check, diagnoses: scan.flags.map((flag) => ({ checkId: "saturation", text: flag.diagnosis })) };
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

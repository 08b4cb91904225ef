import type { Recording } from "../logger-files/types";
import { SteamRangeError, saturationTemperatureC } from "../steam";
import { CHECK_LABELS } from "./checks";
import type { PlateauTiming } from "./equilibration";
import { flagDiagnosis, type FlagWords } from "./saturation-words";
import { AnalysisError, EDGE_TOLERANCE_K, type AcceptanceLimits, type AnalysisResult, type Check, type Diagnosis, type SaturationFlag } from "./types";
import { round, seconds } from "./words";

export type SaturationScan = {
  /** largest |reference − Tsat(p)| over the plateau period, K */
  largest: number;
  lowest: number;
  highest: number;
  flags: SaturationFlag[];
  duringHold: AnalysisResult["saturationTemperatureDuringHold"];
  /** the lowest and highest Tsat(p) during the hold within the plateau period, °C, and when; null without a hold there */
  tsatLow: { c: number; atS: number } | null;
  tsatHigh: { c: number; atS: number } | null;
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

/**
 * The reference against the saturation temperature of the chamber pressure over the whole plateau
 * period (past a broken hold, up to the exhaust); samples missing either reading are passed over.
 * Also the saturation temperature during the hold, for the saturation-band check.
 */
export function scanSaturation(recording: Recording, timing: PlateauTiming, limits: AcceptanceLimits, words: FlagWords): SaturationScan {
  const { timesS } = recording;
  const reference = recording.temperatures[recording.referenceIndex].values;
  const pressure = recording.pressure.values;
  const holdFrom = timing.holdStart;
  const holdTo = Math.min(timing.holdEnd, timing.periodEndIndex);
  const scan: SaturationScan = { largest: 0, lowest: Infinity, highest: -Infinity, flags: [], duringHold: null, tsatLow: null, tsatHigh: null };
  let satSum = 0;
  let satCount = 0;
  let open: OpenFlag | null = null;
  const limitK = limits.saturationLimitK + EDGE_TOLERANCE_K;
  const closeFlag = () => {
    if (!open) return;
    scan.flags.push(toFlag(open, timesS, words));
    open = null;
  };
  for (let i = timing.startIndex; i <= timing.periodEndIndex; i++) {
    if (pressure[i] !== pressure[i]) continue;
    const tsat = tsatAt(recording, i);
    if (holdFrom >= 0 && i >= holdFrom && i <= holdTo) {
      if (!scan.tsatLow || tsat < scan.tsatLow.c) scan.tsatLow = { c: tsat, atS: timesS[i] };
      if (!scan.tsatHigh || tsat > scan.tsatHigh.c) scan.tsatHigh = { c: tsat, atS: timesS[i] };
      satSum += tsat;
      satCount++;
    }
    if (reference[i] !== reference[i]) continue;
    const deviation = reference[i] - tsat;
    if (Math.abs(deviation) > scan.largest) scan.largest = Math.abs(deviation);
    if (deviation < scan.lowest) scan.lowest = deviation;
    if (deviation > scan.highest) scan.highest = deviation;
    const kind = deviation < -limitK ? "below" : deviation > limitK ? "above" : null;
    if (open && open.kind !== kind) closeFlag();
    if (kind) {
      if (!open) open = { startIndex: i, endIndex: i, kind, worst: deviation };
      open.endIndex = i;
      if (Math.abs(deviation) > Math.abs(open.worst)) open.worst = deviation;
    }
  }
  closeFlag();
  if (scan.tsatLow && scan.tsatHigh) {
    scan.duringHold = { min: round(scan.tsatLow.c, 3), max: round(scan.tsatHigh.c, 3), mean: round(satSum / satCount, 3) };
  }
  return scan;
}

function toFlag(open: OpenFlag, timesS: Float64Array, words: FlagWords): SaturationFlag {
  const start = timesS[open.startIndex];
  const end = timesS[open.endIndex];
  return {
    start: round(start, 3),
    end: round(end, 3),
    durationS: round(end - start, 3),
    kind: open.kind,
    worst: round(open.worst, 3),
    diagnosis: flagDiagnosis(open.kind, open.worst, start, end, words),
  };
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

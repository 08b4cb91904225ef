import type { Recording } from "../logger-files/types";
import { CHECK_LABELS } from "./checks";
import type { PlateauTiming } from "./equilibration";
import { countMissing } from "./record";
import { EDGE_TOLERANCE_K, type AcceptanceLimits, type ChannelSummary, type Check, type Diagnosis } from "./types";
import { fmt, round, seconds } from "./words";

/** Per-channel figures before the hold is measured: missing readings, F0 and arrival at Ts only. */
export function channelSummaries(recording: Recording, f0Values: number[], arrivals: Array<number | null>, startS: number | null): ChannelSummary[] {
  return recording.temperatures.map((c, k) => ({
    header: c.header,
    role: k === recording.referenceIndex ? "reference" : k === recording.freeSpaceIndex ? "free-space" : "load",
    missing: countMissing(c.values),
    minDuringHold: null,
    maxDuringHold: null,
    meanDuringHold: null,
    f0: round(f0Values[k], 4),
    firstArrival: arrivals[k] ?? null,
    arrivalAfterPlateauStart: arrivals[k] !== null && arrivals[k] !== undefined && startS !== null ? round((arrivals[k] as number) - startS, 3) : null,
  }));
}

export type HoldExtremes = {
  /** the hottest reading of any channel during the hold, °C, and whose it was */
  maxDuringHold: number | null;
  hottest: string;
  /** the largest difference between channels at one instant during the hold, K, and when */
  maxSpread: number | null;
  maxSpreadAt: number;
};

/**
 * Fills each channel's min, max and mean over the hold (its readings only); returns the hold's
 * hottest reading and widest spread among the load channels (the free-space sensor has its own check).
 */
export function measureHold(recording: Recording, timing: PlateauTiming, channels: ChannelSummary[]): HoldExtremes {
  const extremes: HoldExtremes = { maxDuringHold: null, hottest: "", maxSpread: null, maxSpreadAt: 0 };
  const { holdStart, holdEnd } = timing;
  if (holdStart < 0) return extremes;
  recording.temperatures.forEach((c, k) => {
    let min = Infinity;
    let max = -Infinity;
    let sum = 0;
    let count = 0;
    for (let i = holdStart; i <= holdEnd; i++) {
      const v = c.values[i];
      if (v !== v) continue;
      if (v < min) min = v;
      if (v > max) max = v;
      sum += v;
      count++;
    }
    if (count === 0) return;
    channels[k].minDuringHold = round(min, 3);
    channels[k].maxDuringHold = round(max, 3);
    channels[k].meanDuringHold = round(sum / count, 3);
    if (timing.load.includes(k) && (extremes.maxDuringHold === null || max > extremes.maxDuringHold)) {
      extremes.maxDuringHold = max;
      extremes.hottest = c.header;
    }
  });
  const load = timing.load.map((k) => recording.temperatures[k]);
  let maxSpread = 0;
  for (let i = holdStart; i <= holdEnd; i++) {
    let min = Infinity;
    let max = -Infinity;
    for (const c of load) {
      const v = c.values[i];
      if (v < min) min = v;
      if (v > max) max = v;
    }
    if (max - min > maxSpread) {
      maxSpread = max - min;
      extremes.maxSpreadAt = recording.timesS[i];
    }
  }
  extremes.maxSpread = maxSpread;
  return extremes;
}

export function checkBand(extremes: HoldExtremes, bandTop: number, basis: string): { check: Check; diagnoses: Diagnosis[] } {
  const { maxDuringHold } = extremes;
  const passed = maxDuringHold !== null && maxDuringHold <= bandTop + EDGE_TOLERANCE_K;
  const diagnoses: Diagnosis[] = [];
  if (maxDuringHold !== null && !passed) {
    diagnoses.push({
      checkId: "band",
      text:
        `"${extremes.hottest}" reached ${fmt(maxDuringHold, 2)} °C during holding, above the band's top of ${fmt(bandTop, 2)} °C: ` +
        "look at the controller's set point and overshoot, and for superheat from the jacket or the supply.",
    });
  }
  const check: Check = {
    id: "band",
    label: CHECK_LABELS.band,
    passed,
    measured: maxDuringHold === null ? null : round(maxDuringHold, 3),
    limit: round(bandTop, 3),
    comparison: "at-most",
    unit: "°C",
    basis,
  };
  return { check, diagnoses };
}

export function checkSpread(extremes: HoldExtremes, limits: AcceptanceLimits, basis: string): { check: Check; diagnoses: Diagnosis[] } {
  const { maxSpread } = extremes;
  const passed = maxSpread !== null && maxSpread <= limits.maxSpreadK + 1e-9;
  const diagnoses: Diagnosis[] = [];
  if (maxSpread !== null && !passed) {
    diagnoses.push({
      checkId: "spread",
      text:
        `At ${seconds(extremes.maxSpreadAt)} the channels differed by ${fmt(maxSpread, 2)} K (limit ${limits.maxSpreadK} K): the load heated unevenly. ` +
        "Look at air pockets or slow penetration in the load, superheat near the walls, and each probe's calibration.",
    });
  }
  const check: Check = {
    id: "spread",
    label: CHECK_LABELS.spread,
    passed,
    measured: maxSpread === null ? null : round(maxSpread, 3),
    limit: limits.maxSpreadK,
    comparison: "at-most",
    unit: "K",
    basis,
  };
  return { check, diagnoses };
}

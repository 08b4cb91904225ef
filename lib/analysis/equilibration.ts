import type { Recording, TemperatureChannel } from "../logger-files/types";
import { CHECK_LABELS } from "./checks";
import { plateauPeriodEnd, type PlateauSpan } from "./plateau";
import { missingSpan, TIME_TOLERANCE_S, tooSlowToShowEquilibration, type Pace } from "./record";
import { EDGE_TOLERANCE_K, type AcceptanceLimits, type Check, type Diagnosis } from "./types";
import { fmt, round, seconds } from "./words";

/** Why the hold ended before the plateau region did: a channel below Ts, an interval with no sample, or a channel's missing readings. */
export type HoldBreak = { index: number; kind: "dip" | "gap" | "missing"; channels: number[] };

/** Where one plateau's equilibration and holding lie; indexes into the recording. */
export type PlateauTiming = {
  startIndex: number;
  regionEndIndex: number;
  startS: number;
  /** the channels judged for equilibration, holding, band and spread: all but the free-space sensor */
  load: number[];
  /** per channel: first index at or above Ts within the plateau, −1 if never */
  arrivalIndex: number[];
  /** per channel: seconds of that first arrival, null if never */
  arrivals: Array<number | null>;
  /** load channels that never reached Ts within the plateau */
  missing: TemperatureChannel[];
  equilibrationTime: number | null;
  holdingTime: number | null;
  /** first and last index of the hold, −1 when there was none */
  holdStart: number;
  holdEnd: number;
  /** what ended the hold; null when it lasted to the end of the plateau region */
  holdBreak: HoldBreak | null;
  /** the hold's last index, or the reference's last reading at Ts when there was no hold */
  plateauEndIndex: number;
  /** the last sample of the plateau period (plateauPeriodEnd) */
  periodEndIndex: number;
  pace: Pace;
};

/**
 * Equilibration starts when the reference reaches Ts and ends when the last load channel does; the
 * hold then lasts while every load channel stays at or above Ts, and is not counted across a gap.
 */
export function timePlateau(recording: Recording, span: PlateauSpan, sterilizationTempC: number, pace: Pace): PlateauTiming {
  const { timesS, temperatures } = recording;
  const atTs = sterilizationTempC - EDGE_TOLERANCE_K;
  const s = span.startIndex;
  const regionEnd = span.regionEndIndex;
  const load = temperatures.map((_, k) => k).filter((k) => k !== (recording.freeSpaceIndex ?? -1));
  const arrivalIndex = temperatures.map((c) => {
    for (let i = s; i <= regionEnd; i++) if (c.values[i] >= atTs) return i;
    return -1;
  });
  const periodEndIndex = plateauPeriodEnd(recording, span, sterilizationTempC);
  const timing: PlateauTiming = {
    startIndex: s,
    regionEndIndex: regionEnd,
    startS: timesS[s],
    load,
    arrivalIndex,
    arrivals: arrivalIndex.map((i) => (i >= 0 ? timesS[i] : null)),
    missing: load.filter((k) => arrivalIndex[k] < 0).map((k) => temperatures[k]),
    equilibrationTime: null,
    holdingTime: null,
    holdStart: -1,
    holdEnd: -1,
    holdBreak: null,
    plateauEndIndex: s,
    periodEndIndex,
    pace,
  };
  if (timing.missing.length > 0) {
    const reference = temperatures[recording.referenceIndex].values;
    for (let i = s; i <= regionEnd; i++) if (reference[i] >= atTs) timing.plateauEndIndex = i;
    return timing;
  }
  const holdStart = Math.max(...load.map((k) => arrivalIndex[k]));
  const { holdEnd, holdBreak } = walkHold(recording, load, holdStart, regionEnd, atTs, pace.maxIntervalS);
  Object.assign(timing, {
    holdStart,
    holdEnd,
    holdBreak,
    plateauEndIndex: holdEnd,
    equilibrationTime: timesS[holdStart] - timing.startS,
    holdingTime: timesS[holdEnd] - timesS[holdStart],
  });
  return timing;
}

/** The hold's last sample: before a load channel reads below Ts, before an interval over the gap limit, or before a channel's missing readings span more than it. */
function walkHold(recording: Recording, load: number[], holdStart: number, regionEnd: number, atTs: number, maxIntervalS: number): { holdEnd: number; holdBreak: HoldBreak | null } {
  const { timesS, temperatures } = recording;
  const bridgedUntil = new Int32Array(temperatures.length).fill(-1);
  for (let i = holdStart + 1; i <= regionEnd; i++) {
    if (timesS[i] - timesS[i - 1] > maxIntervalS + TIME_TOLERANCE_S) return { holdEnd: i - 1, holdBreak: { index: i, kind: "gap", channels: [] } };
    const dipped: number[] = [];
    const unread: number[] = [];
    for (const k of load) {
      const v = temperatures[k].values[i];
      if (v === v) {
        if (v < atTs) dipped.push(k);
      } else if (i > bridgedUntil[k]) {
        const { before, after } = missingSpan(temperatures[k].values, i);
        if (timesS[after] - timesS[before] > maxIntervalS + TIME_TOLERANCE_S) unread.push(k);
        else bridgedUntil[k] = after - 1;
      }
    }
    if (dipped.length > 0) return { holdEnd: i - 1, holdBreak: { index: i, kind: "dip", channels: dipped } };
    if (unread.length > 0) return { holdEnd: i - 1, holdBreak: { index: i, kind: "missing", channels: unread } };
  }
  return { holdEnd: regionEnd, holdBreak: null };
}

export function checkEquilibration(recording: Recording, timing: PlateauTiming, limits: AcceptanceLimits, basis: string): { check: Check; diagnoses: Diagnosis[] } {
  const { equilibrationTime, pace } = timing;
  const diagnoses: Diagnosis[] = [];
  // A logger slower than the limit cannot show equilibration within it, whatever its samples say (issue 9, rule 3).
  const tooSlow = pace.samplingIntervalS > limits.maxEquilibrationS + TIME_TOLERANCE_S;
  const text = equilibrationTime === null ? neverEquilibrated(timing, limits) : equilibrationTime > limits.maxEquilibrationS ? slowEquilibration(recording, timing, limits) : null;
  if (text !== null) diagnoses.push({ checkId: "equilibration-time", text });
  if (tooSlow) diagnoses.push({ checkId: "equilibration-time", text: tooSlowToShowEquilibration(pace, limits.maxEquilibrationS, equilibrationTime) });
  const check: Check = {
    id: "equilibration-time",
    label: CHECK_LABELS["equilibration-time"],
    passed: !tooSlow && equilibrationTime !== null && equilibrationTime <= limits.maxEquilibrationS,
    measured: equilibrationTime === null ? null : round(equilibrationTime, 3),
    limit: limits.maxEquilibrationS,
    comparison: "at-most",
    unit: "s",
    basis,
  };
  return { check, diagnoses };
}

function neverEquilibrated(timing: PlateauTiming, limits: AcceptanceLimits): string {
  const names = timing.missing.map((c) => {
    let max = -Infinity;
    for (let i = timing.startIndex; i <= timing.regionEndIndex; i++) if (c.values[i] > max) max = c.values[i];
    return max === -Infinity ? `"${c.header}" (no reading)` : `"${c.header}" (highest ${fmt(max, 2)} °C)`;
  });
  return (
    `${names.join(", ")} never reached ${limits.sterilizationTempC} °C during the plateau, so the load never equilibrated and there was no holding time. ` +
    "Steam did not penetrate the load: look at air removal, the load's size and wrapping, and the probes' placement."
  );
}

function slowEquilibration(recording: Recording, timing: PlateauTiming, limits: AcceptanceLimits): string {
  const slowest = recording.temperatures[timing.load.find((k) => timing.arrivalIndex[k] === timing.holdStart) ?? 0];
  return (
    `"${slowest.header}" reached ${limits.sterilizationTempC} °C ${seconds(round(timing.equilibrationTime as number, 1))} after the reference (limit ${seconds(limits.maxEquilibrationS)}): ` +
    "steam reached that point of the load slowly. Look at residual air in the load (air removal), a load too dense or wrapped too tightly, and condensate pooling."
  );
}

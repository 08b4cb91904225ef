import type { Recording, TemperatureChannel } from "../logger-files/types";
import { CHECK_LABELS } from "./checks";
import type { PlateauSpan } from "./plateau";
import type { AcceptanceLimits, Check, Diagnosis } from "./types";
import { fmt, round, seconds } from "./words";

/** Where one plateau's equilibration and holding lie; indexes into the recording. */
export type PlateauTiming = {
  startIndex: number;
  regionEndIndex: number;
  startS: number;
  /** per channel: first index at or above Ts within the plateau, −1 if never */
  arrivalIndex: number[];
  /** per channel: seconds of that first arrival, null if never */
  arrivals: Array<number | null>;
  /** channels that never reached Ts within the plateau */
  missing: TemperatureChannel[];
  equilibrationTime: number | null;
  holdingTime: number | null;
  /** first and last index of the hold, −1 when there was none */
  holdStart: number;
  holdEnd: number;
  /** the hold's last index, or the reference's last reading at Ts when there was no hold */
  plateauEndIndex: number;
};

/**
 * Equilibration starts when the reference reaches Ts and ends when the last channel does; the hold
 * then lasts while every channel stays at or above Ts.
 */
export function timePlateau(recording: Recording, span: PlateauSpan, sterilizationTempC: number): PlateauTiming {
  const { timesS, temperatures } = recording;
  const reference = temperatures[recording.referenceIndex].values;
  const ts = sterilizationTempC;
  const s = span.startIndex;
  const regionEnd = span.regionEndIndex;
  const startS = timesS[s];
  const arrivalIndex = temperatures.map((c) => {
    for (let i = s; i <= regionEnd; i++) if (c.values[i] >= ts) return i;
    return -1;
  });
  const arrivals = arrivalIndex.map((i) => (i >= 0 ? timesS[i] : null));
  const missing = temperatures.filter((_, k) => arrivalIndex[k] < 0);
  const timing: PlateauTiming = {
    startIndex: s,
    regionEndIndex: regionEnd,
    startS,
    arrivalIndex,
    arrivals,
    missing,
    equilibrationTime: null,
    holdingTime: null,
    holdStart: -1,
    holdEnd: -1,
    plateauEndIndex: s,
  };
  if (missing.length > 0) {
    for (let i = s; i <= regionEnd; i++) if (reference[i] >= ts) timing.plateauEndIndex = i;
    return timing;
  }
  const holdStart = Math.max(...arrivalIndex);
  let holdEnd = holdStart;
  outer: for (let i = holdStart + 1; i <= regionEnd; i++) {
    for (const c of temperatures) if (!(c.values[i] >= ts)) break outer;
    holdEnd = i;
  }
  timing.holdStart = holdStart;
  timing.holdEnd = holdEnd;
  timing.equilibrationTime = timesS[holdStart] - startS;
  timing.holdingTime = timesS[holdEnd] - timesS[holdStart];
  timing.plateauEndIndex = holdEnd;
  return timing;
}

export function checkEquilibration(recording: Recording, timing: PlateauTiming, limits: AcceptanceLimits, basis: string): { check: Check; diagnoses: Diagnosis[] } {
  const { equilibrationTime } = timing;
  const diagnoses: Diagnosis[] = [];
  const text = equilibrationTime === null ? neverEquilibrated(timing, limits) : equilibrationTime > limits.maxEquilibrationS ? slowEquilibration(recording, timing, limits) : null;
  if (text !== null) diagnoses.push({ checkId: "equilibration-time", text });
  const check: Check = {
    id: "equilibration-time",
    label: CHECK_LABELS["equilibration-time"],
    passed: equilibrationTime !== null && equilibrationTime <= limits.maxEquilibrationS,
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
    for (let i = timing.startIndex; i <= timing.regionEndIndex; i++) max = Math.max(max, c.values[i]);
    return `"${c.header}" (highest ${fmt(max, 2)} °C)`;
  });
  return (
    `${names.join(", ")} never reached ${limits.sterilizationTempC} °C during the plateau, so the load never equilibrated and there was no holding time. ` +
    "Steam did not penetrate the load: look at air removal, the load's size and wrapping, and the probes' placement."
  );
}

function slowEquilibration(recording: Recording, timing: PlateauTiming, limits: AcceptanceLimits): string {
  const slowest = recording.temperatures[timing.arrivalIndex.indexOf(timing.holdStart)];
  return (
    `"${slowest.header}" reached ${limits.sterilizationTempC} °C ${seconds(round(timing.equilibrationTime as number, 1))} after the reference (limit ${seconds(limits.maxEquilibrationS)}): ` +
    "steam reached that point of the load slowly. Look at residual air in the load (air removal), a load too dense or wrapped too tightly, and condensate pooling."
  );
}

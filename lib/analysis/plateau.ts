import type { Recording } from "../logger-files/types";
import { CHECK_LABELS } from "./checks";
import { AnalysisError, type Check, type Diagnosis } from "./types";
import { fmt, round, seconds } from "./words";

/**
 * A new plateau can only start once the reference has fallen this far below Ts (as at exhaust),
 * so a brief dip during holding does not count as a second cycle.
 */
export const PLATEAU_REARM_K = 10;

export type PlateauSpan = { startIndex: number; regionEndIndex: number };

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

/** The 0-based plateau asked for; refused when it is not a plateau of this record. */
export function choosePlateau(plateaus: PlateauSpan[], wanted = 0): number {
  if (!Number.isInteger(wanted) || wanted < 0) throw new AnalysisError(`Plateau ${wanted} is not a valid plateau number`);
  if (plateaus.length > 0 && wanted >= plateaus.length) {
    throw new AnalysisError(`The record holds ${plateaus.length} plateau${plateaus.length === 1 ? "" : "s"}; plateau ${wanted + 1} does not exist`);
  }
  return wanted;
}

/** The reference's highest reading and when it was first read. */
export function referencePeak(recording: Recording): { maxC: number; atS: number } {
  const reference = recording.temperatures[recording.referenceIndex].values;
  let maxC = -Infinity;
  let atS = 0;
  for (let i = 0; i < recording.timesS.length; i++) {
    if (reference[i] > maxC) {
      maxC = reference[i];
      atS = recording.timesS[i];
    }
  }
  return { maxC, atS };
}

export function plateauCheck(plateausFound: number, peakC: number, sterilizationTempC: number, basis: string): Check {
  return {
    id: "plateau-reached",
    label: CHECK_LABELS["plateau-reached"],
    passed: plateausFound > 0,
    measured: round(peakC, 3),
    limit: sterilizationTempC,
    comparison: "at-least",
    unit: "°C",
    basis,
  };
}

export function noPlateauDiagnosis(referenceHeader: string, sterilizationTempC: number, peak: { maxC: number; atS: number }): Diagnosis {
  return {
    checkId: "plateau-reached",
    text:
      `"${referenceHeader}" never reached ${sterilizationTempC} °C (highest ${fmt(peak.maxC, 2)} °C at ${seconds(peak.atS)}), so there was no plateau. ` +
      "Look at the controller's set point, the steam supply pressure, the chamber pressure reached and the drain temperature sensor.",
  };
}

import type { Recording } from "../logger-files/types";
import { CHECK_LABELS } from "./checks";
import { AnalysisError, EDGE_TOLERANCE_K, type Check, type Diagnosis } from "./types";
import { fmt, round, seconds } from "./words";
import { plural } from "@/lib/domain";

/**
 * A new plateau can only start once the reference has fallen this far below Ts (as at exhaust),
 * so a brief dip during holding does not count as a second cycle.
 */
export const PLATEAU_REARM_K = 10;

export type PlateauSpan = { startIndex: number; regionEndIndex: number };

/** Plateau starts: the reference reaching Ts, each after it had fallen PLATEAU_REARM_K below; a missing reading (NaN) neither starts nor ends one. */
export function findPlateaus(reference: ArrayLike<number>, sterilizationTempC: number): PlateauSpan[] {
  const spans: PlateauSpan[] = [];
  const rearmBelow = sterilizationTempC - PLATEAU_REARM_K;
  const atTs = sterilizationTempC - EDGE_TOLERANCE_K;
  let open: PlateauSpan | null = null;
  for (let i = 0; i < reference.length; i++) {
    const t = reference[i];
    if (open === null) {
      if (t >= atTs) open = { startIndex: i, regionEndIndex: reference.length - 1 };
    } else if (t < rearmBelow) {
      open.regionEndIndex = i - 1;
      spans.push(open);
      open = null;
    }
  }
  if (open) spans.push(open);
  return spans;
}

/**
 * The last sample of the plateau period, the span the saturation check covers. It ends at the
 * reference's last reading at or above Ts in this plateau (so a hold broken mid-plateau, with the
 * reference back at Ts afterwards, is judged to the end), or earlier where the exhaust began: the
 * run of samples up to that reading over which the chamber pressure and the reference both fell
 * at every sample. In the exhaust the pressure falls faster than the drain can cool, so the drain
 * reads hotter than saturation without the steam being superheated.
 */
export function plateauPeriodEnd(recording: Recording, span: PlateauSpan, sterilizationTempC: number): number {
  const reference = recording.temperatures[recording.referenceIndex].values;
  const pressure = recording.pressure.values;
  let end = span.startIndex;
  for (let i = span.startIndex; i <= span.regionEndIndex; i++) if (reference[i] >= sterilizationTempC - EDGE_TOLERANCE_K) end = i;
  while (end > span.startIndex && pressure[end] < pressure[end - 1] && reference[end] < reference[end - 1]) end--;
  return end;
}

/** The 0-based plateau asked for; refused when it is not a plateau of this record. */
export function choosePlateau(plateaus: PlateauSpan[], wanted = 0): number {
  if (!Number.isInteger(wanted) || wanted < 0) throw new AnalysisError(`Plateau ${wanted} is not a valid plateau number`);
  if (plateaus.length > 0 && wanted >= plateaus.length) {
    throw new AnalysisError(`The record holds ${plural(plateaus.length, "plateau")}; plateau ${wanted + 1} does not exist`);
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

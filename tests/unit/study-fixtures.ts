// Constructed study runs for the cross-run summary's tests: an analysis result whose channel figures the test sets
// (F0, hold extremes, arrival), and a study run around it.
import { DEFAULT_LIMITS, lethalityMinutes, type AnalysisResult, type ChannelSummary } from "@/lib/analysis";
import type { RunIndicator, StudyCriteria, StudyRunInput } from "@/lib/analysis/study-types";
import type { PatternPosition } from "@/lib/domain/studies";

/** F0 of a probe held at temperatureC for minutes, by the trapezoid over 1 s steps (F0 definition, DOMAIN.md §3). */
export function heldF0(temperatureC: number, minutes: number): number {
  const n = minutes * 60 + 1;
  const timesS = Array.from({ length: n }, (_, i) => i);
  return lethalityMinutes(timesS, new Array<number>(n).fill(temperatureC), 121.1, 10);
}

export const PATTERN: PatternPosition[] = [
  { id: "P1", label: "Tray 1, front left" },
  { id: "P2", label: "Tray 2, centre of the wrapped set" },
  { id: "P3", label: "Tray 3, rear right" },
];

export const CRITERIA: StudyCriteria = { sterilizationTempC: 121, minF0Min: 15, maxSpreadK: 2, indicatorsRequired: false, runsRequired: 3 };

export type ProbeFigures = { f0: number; minC?: number | null; maxC?: number | null; arrivalS?: number | null };

function channel(header: string, role: ChannelSummary["role"], figures: ProbeFigures): ChannelSummary {
  const minC = figures.minC === undefined ? 121.5 : figures.minC;
  const maxC = figures.maxC === undefined ? 122.0 : figures.maxC;
  const arrivalS = figures.arrivalS === undefined ? 3 : figures.arrivalS;
  return {
    header,
    role,
    missing: 0,
    minDuringHold: minC,
    maxDuringHold: maxC,
    meanDuringHold: minC === null || maxC === null ? null : (minC + maxC) / 2,
    f0: figures.f0,
    firstArrival: arrivalS === null ? null : 60 + arrivalS,
    arrivalAfterPlateauStart: arrivalS,
  };
}

/** An analysis whose drain is the reference and whose load channels carry the given figures. */
export function analysisWith(probes: Record<string, ProbeFigures>, options: { verdict?: "pass" | "fail"; tsC?: number } = {}): AnalysisResult {
  const tsC = options.tsC ?? 121;
  const channels = [channel("Drain", "reference", { f0: 16, arrivalS: 0 }), ...Object.entries(probes).map(([header, f]) => channel(header, "load", f))];
  return {
    kind: "thermometric",
    engineVersion: "test",
    verdict: options.verdict ?? "pass",
    summary: "constructed",
    plateau: { start: 60, end: 960 },
    plateausFound: 1,
    plateauIndex: 0,
    equilibrationTime: 3,
    holdingTime: 897,
    saturation: { maxDeviation: 0.1, lowestDeviation: -0.1, highestDeviation: 0.1, flags: [] },
    f0: Object.fromEntries(channels.map((c) => [c.header, c.f0])),
    checks: [],
    referenceChannel: "Drain",
    pressureChannel: "Chamber",
    channels,
    saturationTemperatureDuringHold: null,
    diagnoses: [],
    limits: { ...DEFAULT_LIMITS, sterilizationTempC: tsC, holdingTimeS: 900 },
    record: { startedAt: null, samples: 1001, durationS: 1000, medianSampleIntervalS: 1 },
  };
}

/** A signed, passing run whose probes "P1", "P2", "P3" sit at the positions of the same ids. */
export function runWith(runNumber: number, probes: Record<string, ProbeFigures>, change: Partial<StudyRunInput> & { indicators?: RunIndicator[] } = {}): StudyRunInput {
  return {
    runId: `run-${runNumber}`,
    runNumber,
    cycleNumber: `C-${runNumber}`,
    cycleStatus: "approved",
    cycleVerdict: "pass",
    analysis: analysisWith(probes),
    sensorMap: Object.fromEntries(Object.keys(probes).map((header) => [header, header])),
    indicators: [],
    ...change,
  };
}

import type { IndicatorKind, IndicatorResult, PatternPosition } from "../domain/studies";
import type { AnalysisResult } from "./types";

/** What a qualification study demands of every run, beyond each cycle's own checks (issue 14). */
export type StudyCriteria = {
  /** the profile's Ts, °C: a position's equilibration is its arrival at Ts after the plateau start */
  sterilizationTempC: number;
  /** minimum F0 at every load position, minutes (the study's own, or profileMinimumF0 of the profile) */
  minF0Min: number;
  /** largest spread between positions during holding, K */
  maxSpreadK: number;
  /** every indicator placed must be read and negative before the run can pass */
  indicatorsRequired: boolean;
  runsRequired: number;
};

/** The latest reading of one indicator of one run at one position. */
export type RunIndicator = { positionId: string; kind: IndicatorKind; result: IndicatorResult };

/** One attached run as the summary reads it: the signed cycle's analysis and where each channel sat. */
export type StudyRunInput = {
  runId: string;
  runNumber: number;
  cycleNumber: string;
  /** approved or failure-confirmed: only signed outcomes are attached */
  cycleStatus: string;
  /** the cycle's signed verdict */
  cycleVerdict: "pass" | "fail" | null;
  analysis: AnalysisResult;
  /** channel header → pattern position id */
  sensorMap: Record<string, string>;
  indicators: RunIndicator[];
};

/** One position in one run, from the channel mapped there. */
export type RunPositionFigures = {
  positionId: string;
  /** the channel mapped there; two channels at one position are joined with ", " and read together (the lower F0, the wider range) */
  header: string;
  /** °C during holding; null: no reading in the hold */
  minTempC: number | null;
  maxTempC: number | null;
  /** s from the plateau start to this position's arrival at Ts; null: never arrived */
  equilibrationS: number | null;
  /** minutes */
  f0Min: number;
};

export type RunJudgement = "pass" | "fail" | "pending";

export type RunSummary = {
  runId: string;
  runNumber: number;
  cycleNumber: string;
  judgement: RunJudgement;
  /** plain sentences: why the run failed or is pending; empty when it passed */
  reasons: string[];
  positions: RunPositionFigures[];
  /** lowest F0 of the run; ties: the latest arrival at Ts */
  coldSpot: { positionId: string; f0Min: number } | null;
  /** an upper bound of the spread between the run's positions at one instant during holding, K (lib/analysis/study-run.ts spreadOf) */
  spreadK: number | null;
  positiveIndicators: RunIndicator[];
  /** pattern positions without a biological indicator reading, when the study requires indicators */
  missingIndicators: string[];
};

export type PositionAcrossRuns = {
  position: string;
  label: string;
  /** minimum over runs (null when no run read this position) */
  minF0: number | null;
  minTemp: number | null;
  maxTemp: number | null;
  /** longest equilibration over runs, s; null when not reached in some run */
  maxEquilibrationS: number | null;
  /** by run number */
  f0ByRun: Record<number, number | null>;
  minTempByRun: Record<number, number | null>;
  maxTempByRun: Record<number, number | null>;
  equilibrationByRun: Record<number, number | null>;
  /** run numbers in which this position was the run's cold spot */
  coldSpotRuns: number[];
};

export type StudySummary = {
  runs: RunSummary[];
  positions: PositionAcrossRuns[];
  /** the position with the lowest minimum F0 over all runs; how often it was the cold spot of a run */
  coldSpot: { position: string; label: string; minF0: number; runsAsColdSpot: number; runsCounted: number } | null;
  /** the largest run spread, K */
  spreadK: number | null;
  /** passing runs at the end of the series, in attachment order; complete when ≥ runsRequired */
  consecutive: { passing: number; required: number; complete: boolean };
  /** positions of the pattern no run's sensor map covers */
  unmappedPositions: PatternPosition[];
};

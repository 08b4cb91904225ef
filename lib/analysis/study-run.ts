import { isPositiveIndicator, type PatternPosition } from "../domain/studies";
import type { RunIndicator, RunJudgement, RunPositionFigures, RunSummary, StudyCriteria, StudyRunInput } from "./study-types";
import { EDGE_TOLERANCE_K, type ChannelSummary } from "./types";
import { fmt } from "./words";

/** F0 values closer than this are a tie (the analysis stores F0 to 4 decimals), minutes. */
export const F0_TIE_MIN = 1e-6;

/** The figures of one position read from the channels mapped there; the least favourable reading counts. */
function positionFigures(position: PatternPosition, channels: ChannelSummary[]): RunPositionFigures {
  const mins = channels.map((c) => c.minDuringHold);
  const maxes = channels.map((c) => c.maxDuringHold);
  const arrivals = channels.map((c) => c.arrivalAfterPlateauStart);
  return {
    positionId: position.id,
    header: channels.map((c) => c.header).join(", "),
    minTempC: mins.some((v) => v === null) ? null : Math.min(...(mins as number[])),
    maxTempC: maxes.some((v) => v === null) ? null : Math.max(...(maxes as number[])),
    equilibrationS: arrivals.some((v) => v === null) ? null : Math.max(...(arrivals as number[])),
    f0Min: Math.min(...channels.map((c) => c.f0)),
  };
}

/** Lowest F0; a tie goes to the later arrival at Ts (never arriving is latest), then to the pattern's order. */
export function coldestOf<T extends { f0: number; equilibrationS: number | null }>(candidates: T[]): T | null {
  let coldest: T | null = null;
  for (const c of candidates) {
    if (coldest === null || c.f0 < coldest.f0 - F0_TIE_MIN) coldest = c;
    else if (Math.abs(c.f0 - coldest.f0) <= F0_TIE_MIN && arrivesLater(c.equilibrationS, coldest.equilibrationS)) coldest = c;
  }
  return coldest;
}

const arrivesLater = (a: number | null, b: number | null): boolean => (b === null ? false : a === null || a > b);

/**
 * The spread between positions during holding, as an upper bound of the spread at one instant (fail closed): the highest
 * maximum minus the lowest minimum over the positions. When every mapped channel is one of the channels the cycle's own
 * spread check compared at each instant (all but the free-space sensor), that check's figure is an upper bound too, and
 * the smaller of the two bounds is used. Null when a position has no reading in the hold.
 */
function spreadOf(figures: RunPositionFigures[], run: StudyRunInput, mappedChannels: ChannelSummary[]): number | null {
  if (figures.length === 0 || figures.some((f) => f.minTempC === null || f.maxTempC === null)) return null;
  const overHold = Math.max(...figures.map((f) => f.maxTempC as number)) - Math.min(...figures.map((f) => f.minTempC as number));
  const instantCheck = run.analysis.checks.find((c) => c.id === "spread")?.measured;
  const comparedAtEachInstant = mappedChannels.length > 0 && mappedChannels.every((c) => c.role !== "free-space");
  return comparedAtEachInstant && typeof instantCheck === "number" && Number.isFinite(instantCheck) ? Math.min(overHold, instantCheck) : overHold;
}

const indicatorWords = (i: RunIndicator): string =>
  i.kind === "biological" ? `The biological indicator at ${i.positionId} showed growth.` : `The chemical indicator at ${i.positionId} did not change as specified.`;

/** Why the signed cycle itself does not speak for a passing run. */
function cycleReasons(run: StudyRunInput, criteria: StudyCriteria): string[] {
  const reasons: string[] = [];
  if (run.cycleStatus === "failure-confirmed") reasons.push(`Cycle ${run.cycleNumber} was signed as a confirmed failure.`);
  else if (run.cycleStatus !== "approved") reasons.push(`Cycle ${run.cycleNumber} is not signed (status ${run.cycleStatus}); only a signed cycle can count as a run.`);
  else if (run.cycleVerdict !== "pass") reasons.push(`Cycle ${run.cycleNumber} did not pass its own checks.`);
  const analysedTsC = run.analysis.limits.sterilizationTempC;
  if (Math.abs(analysedTsC - criteria.sterilizationTempC) > EDGE_TOLERANCE_K) {
    reasons.push(`Cycle ${run.cycleNumber} was analysed against Ts ${fmt(analysedTsC, 1)} °C, not the study's ${fmt(criteria.sterilizationTempC, 1)} °C.`);
  }
  return reasons;
}

/** The run's figures per mapped position and its judgement: fail, pending (indicators unread) or pass, each reason a sentence. */
export function summarizeRun(run: StudyRunInput, positions: PatternPosition[], criteria: StudyCriteria): RunSummary {
  const reasons = cycleReasons(run, criteria);
  const figures: RunPositionFigures[] = [];
  const mappedChannels: ChannelSummary[] = [];
  for (const position of positions) {
    const headers = Object.keys(run.sensorMap).filter((header) => run.sensorMap[header] === position.id);
    const channels = run.analysis.channels.filter((c) => headers.includes(c.header));
    if (headers.length === 0) {
      reasons.push(`Position ${position.id} has no channel in this run's sensor map.`);
      continue;
    }
    if (channels.length < headers.length) {
      const absent = headers.filter((h) => !channels.some((c) => c.header === h));
      reasons.push(`Position ${position.id} is mapped to ${absent.map((h) => `"${h}"`).join(", ")}, which the cycle's record does not have.`);
      continue;
    }
    const f = positionFigures(position, channels);
    figures.push(f);
    mappedChannels.push(...channels);
    if (f.f0Min < criteria.minF0Min) reasons.push(`Position ${position.id} received F0 ${fmt(f.f0Min, 2)} min, below the minimum ${fmt(criteria.minF0Min, 2)} min.`);
    if (f.equilibrationS === null) reasons.push(`Position ${position.id} never reached Ts (${fmt(criteria.sterilizationTempC, 1)} °C) in the plateau.`);
    if (f.minTempC === null) reasons.push(`Position ${position.id} has no reading during holding.`);
  }
  const spreadK = spreadOf(figures, run, mappedChannels);
  if (spreadK !== null && spreadK > criteria.maxSpreadK + EDGE_TOLERANCE_K) {
    reasons.push(`The spread between positions during holding was ${fmt(spreadK, 2)} K, above the largest allowed ${fmt(criteria.maxSpreadK, 2)} K.`);
  }
  const positiveIndicators = run.indicators.filter((i) => isPositiveIndicator(i.result));
  reasons.push(...positiveIndicators.map(indicatorWords));
  const missingIndicators = criteria.indicatorsRequired ? positions.filter((p) => !run.indicators.some((i) => i.positionId === p.id && i.kind === "biological")).map((p) => p.id) : [];
  let judgement: RunJudgement = "pass";
  if (reasons.length > 0) judgement = "fail";
  else if (missingIndicators.length > 0) {
    judgement = "pending";
    reasons.push(`No biological indicator has been read at ${missingIndicators.join(", ")} yet.`);
  }
  const cold = coldestOf(figures.map((f) => ({ ...f, f0: f.f0Min })));
  return {
    runId: run.runId,
    runNumber: run.runNumber,
    cycleNumber: run.cycleNumber,
    judgement,
    reasons,
    positions: figures,
    coldSpot: cold ? { positionId: cold.positionId, f0Min: cold.f0Min } : null,
    spreadK,
    positiveIndicators,
    missingIndicators,
  };
}

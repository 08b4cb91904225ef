import type { PatternPosition } from "../domain/studies";
import { coldestOf, summarizeRun } from "./study-run";
import type { PositionAcrossRuns, RunJudgement, RunPositionFigures, RunSummary, StudyCriteria, StudyRunInput, StudySummary } from "./study-types";

export { coldestOf, summarizeRun } from "./study-run";

/**
 * The consecutive series: passing runs at the end, in attachment order. A failed or pending last run leaves 0: a pending
 * run proves nothing yet, and the series must end in `required` passes (at least one, whatever the protocol says).
 */
export function consecutiveSeries(judgements: RunJudgement[], required: number): StudySummary["consecutive"] {
  let passing = 0;
  for (let i = judgements.length - 1; i >= 0 && judgements[i] === "pass"; i--) passing++;
  return { passing, required, complete: passing >= Math.max(1, required) };
}

const lowest = (values: Array<number | null>): number | null => {
  const read = values.filter((v): v is number => v !== null);
  return read.length === 0 ? null : Math.min(...read);
};
const highest = (values: Array<number | null>): number | null => {
  const read = values.filter((v): v is number => v !== null);
  return read.length === 0 ? null : Math.max(...read);
};

/** One position across every attached run (failed runs included: the figures hide nothing). */
function acrossRuns(position: PatternPosition, runs: RunSummary[]): PositionAcrossRuns {
  const figuresIn = (run: RunSummary) => run.positions.find((p) => p.positionId === position.id);
  const byRun = <T>(pick: (f: RunPositionFigures) => T): Record<number, T | null> =>
    Object.fromEntries(
      runs.map((run) => {
        const figures = figuresIn(run);
        return [run.runNumber, figures ? pick(figures) : null];
      }),
    );
  const f0ByRun = byRun((f) => f.f0Min);
  const minTempByRun = byRun((f) => f.minTempC);
  const maxTempByRun = byRun((f) => f.maxTempC);
  const equilibrationByRun = byRun((f) => f.equilibrationS);
  const read = runs.filter((run) => figuresIn(run)).map((run) => run.runNumber);
  const equilibrations = read.map((n) => equilibrationByRun[n]);
  return {
    position: position.id,
    label: position.label,
    minF0: lowest(Object.values(f0ByRun)),
    minTemp: lowest(Object.values(minTempByRun)),
    maxTemp: highest(Object.values(maxTempByRun)),
    maxEquilibrationS: read.length === 0 || equilibrations.some((e) => e === null) ? null : highest(equilibrations),
    f0ByRun,
    minTempByRun,
    maxTempByRun,
    equilibrationByRun,
    coldSpotRuns: runs.filter((r) => r.coldSpot?.positionId === position.id).map((r) => r.runNumber),
  };
}

/** The overall cold spot: the lowest minimum F0 over the runs; a tie goes to the later (longest) arrival at Ts. */
function overallColdSpot(positions: PositionAcrossRuns[], runs: RunSummary[]): StudySummary["coldSpot"] {
  const candidates = positions.filter((p) => p.minF0 !== null).map((p) => ({ ...p, f0: p.minF0 as number, equilibrationS: p.maxEquilibrationS }));
  const cold = coldestOf(candidates);
  if (!cold) return null;
  return { position: cold.position, label: cold.label, minF0: cold.f0, runsAsColdSpot: cold.coldSpotRuns.length, runsCounted: runs.filter((r) => r.coldSpot !== null).length };
}

/**
 * The cross-run figures of a qualification study (issue 14 §3): each run's figures and judgement, each position's
 * extremes over the runs, the cold spot per run and overall, the largest spread and the consecutive series.
 */
export function summarizeStudy({ criteria, positions, runs }: { criteria: StudyCriteria; positions: PatternPosition[]; runs: StudyRunInput[] }): StudySummary {
  const ordered = [...runs].sort((a, b) => a.runNumber - b.runNumber);
  const runSummaries = ordered.map((run) => summarizeRun(run, positions, criteria));
  const across = positions.map((p) => acrossRuns(p, runSummaries));
  const covered = new Set(ordered.flatMap((r) => Object.values(r.sensorMap)));
  return {
    runs: runSummaries,
    positions: across,
    coldSpot: overallColdSpot(across, runSummaries),
    spreadK: highest(runSummaries.map((r) => r.spreadK)),
    consecutive: consecutiveSeries(
      runSummaries.map((r) => r.judgement),
      criteria.runsRequired,
    ),
    unmappedPositions: positions.filter((p) => !covered.has(p.id)),
  };
}

// The cross-run figures of a qualification study (issue 14 §3) on constructed runs. Every F0 below is a probe held at a
// constant temperature, integrated by lethalityMinutes and worked by hand from the F0 definition
// F0 = Σ Δt · 10^((T − 121.1)/10) / 60 (DOMAIN.md §3).
import { describe, expect, it } from "vitest";
import { consecutiveSeries, summarizeStudy } from "@/lib/analysis/study-summary";
import { heatMapGrid } from "@/lib/analysis/study-heat-map";
import type { StudyRunInput } from "@/lib/analysis/study-types";
import { CRITERIA, PATTERN, analysisWith, heldF0, runWith } from "./study-fixtures";

// 121.1 °C for 15 min: 900 s × 10^0 / 60 = 15.0 min exactly [worked by hand, DOMAIN.md §3].
const F0_15 = heldF0(121.1, 15);
// 131.1 °C for 3 min: 180 s × 10^1 / 60 = 30.0 min [worked by hand].
const F0_30 = heldF0(131.1, 3);
// 124.1 °C for 10 min: 600 s × 10^0.3 / 60 = 19.953 min [worked by hand; 10^0.3 = 1.99526].
const F0_19_95 = heldF0(124.1, 10);
// 121.0 °C for 15 min: 15 × 10^-0.01 = 14.659 min [worked by hand; DOMAIN.md §3 table 14.66].
const F0_14_66 = heldF0(121.0, 15);

const sound = () => ({ P1: { f0: F0_30 }, P2: { f0: F0_15 }, P3: { f0: F0_19_95 } });
const summaryOf = (runs: ReturnType<typeof runWith>[], criteria = CRITERIA) => summarizeStudy({ criteria, positions: PATTERN, runs });

describe("the hand-worked F0 values the cases use", () => {
  it("come out of the trapezoid as worked by hand", () => {
    expect(F0_15).toBeCloseTo(15.0, 10);
    expect(F0_30).toBeCloseTo(30.0, 10);
    expect(F0_19_95).toBeCloseTo(19.953, 3);
    expect(F0_14_66).toBeCloseTo(14.659, 3);
  });
});

describe("a run's figures and judgement", () => {
  it("a signed passing cycle whose every position reaches the minimum F0 passes; its cold spot is the lowest F0", () => {
    const [run] = summaryOf([runWith(1, sound())]).runs;
    expect(run.judgement).toBe("pass");
    expect(run.reasons).toEqual([]);
    expect(run.positions.map((p) => [p.positionId, p.header])).toEqual([
      ["P1", "P1"],
      ["P2", "P2"],
      ["P3", "P3"],
    ]);
    // P2 at exactly the minimum (15.0 ≥ 15.0, an "at least" criterion) passes and is the coldest.
    expect(run.coldSpot).toEqual({ positionId: "P2", f0Min: F0_15 });
    // hold extremes of the fixture: 121.5–122.0 °C at every position → spread 0.5 K [worked by hand]
    expect(run.spreadK).toBeCloseTo(0.5, 10);
  });

  it("a position below the minimum F0 fails the run and the sentence names it with both figures", () => {
    const [run] = summaryOf([runWith(1, { ...sound(), P2: { f0: F0_14_66 } })]).runs;
    expect(run.judgement).toBe("fail");
    expect(run.reasons).toEqual(["Position P2 received F0 14.66 min, below the minimum 15.00 min."]);
  });

  it("a cycle signed as a confirmed failure, one that did not pass its checks, or an unsigned one fails the run", () => {
    const confirmed = summaryOf([runWith(1, sound(), { cycleStatus: "failure-confirmed", cycleVerdict: "fail" })]).runs[0];
    expect(confirmed.judgement).toBe("fail");
    expect(confirmed.reasons).toEqual(["Cycle C-1 was signed as a confirmed failure."]);
    const failedChecks = summaryOf([runWith(1, sound(), { cycleVerdict: "fail" })]).runs[0];
    expect(failedChecks.reasons).toEqual(["Cycle C-1 did not pass its own checks."]);
    const unsigned = summaryOf([runWith(1, sound(), { cycleStatus: "submitted" })]).runs[0];
    expect(unsigned.judgement).toBe("fail");
    expect(unsigned.reasons[0]).toContain("is not signed");
  });

  it("a cycle analysed against another Ts than the study's fails the run", () => {
    const run = runWith(1, sound());
    const [judged] = summaryOf([{ ...run, analysis: analysisWith(sound(), { tsC: 134 }) }]).runs;
    expect(judged.reasons).toEqual(["Cycle C-1 was analysed against Ts 134.0 °C, not the study's 121.0 °C."]);
  });

  it("a spread above the limit fails; exactly at the limit passes", () => {
    // highest max 123.4 − lowest min 121.0 = 2.4 K > 2 K [worked by hand]
    const wide = summaryOf([runWith(1, { P1: { f0: F0_30, minC: 121.0, maxC: 121.8 }, P2: { f0: F0_15, minC: 121.5, maxC: 123.4 }, P3: { f0: F0_19_95 } })]).runs[0];
    expect(wide.spreadK).toBeCloseTo(2.4, 10);
    expect(wide.judgement).toBe("fail");
    expect(wide.reasons).toEqual(["The spread between positions during holding was 2.40 K, above the largest allowed 2.00 K."]);
    // 123.0 − 121.0 = 2.0 K: at most the limit passes [worked by hand]
    const edge = summaryOf([runWith(1, { P1: { f0: F0_30, minC: 121.0 }, P2: { f0: F0_15, maxC: 123.0 }, P3: { f0: F0_19_95 } })]).runs[0];
    expect(edge.spreadK).toBeCloseTo(2.0, 10);
    expect(edge.judgement).toBe("pass");
  });

  it("the cycle's own spread at one instant tightens the bound when every mapped channel was in it; never with the free-space sensor", () => {
    const probes = { P1: { f0: F0_30, minC: 121.0, maxC: 121.8 }, P2: { f0: F0_15, minC: 121.5, maxC: 123.4 }, P3: { f0: F0_19_95 } };
    const withCheck = (run: StudyRunInput, measured: number): StudyRunInput => ({
      ...run,
      analysis: { ...run.analysis, checks: [{ id: "spread", label: "Spread", passed: true, measured, limit: 2, comparison: "at-most", unit: "K", basis: "constructed" }] },
    });
    // both are upper bounds of the spread at one instant: min(2.4 K over the hold, 1.6 K at the worst instant) = 1.6 K [worked by hand]
    const tight = summaryOf([withCheck(runWith(1, probes), 1.6)]).runs[0];
    expect(tight.spreadK).toBeCloseTo(1.6, 10);
    expect(tight.judgement).toBe("pass");
    // the cycle's check never compared a free-space channel at each instant, so only the bound over the hold stands (2.4 K, fails)
    const freeSpace = withCheck(runWith(1, probes), 1.6);
    freeSpace.analysis.channels = freeSpace.analysis.channels.map((c) => (c.header === "P2" ? { ...c, role: "free-space" } : c));
    const loose = summaryOf([freeSpace]).runs[0];
    expect(loose.spreadK).toBeCloseTo(2.4, 10);
    expect(loose.judgement).toBe("fail");
  });

  it("a position that never reached Ts, or has no reading in the hold, fails the run", () => {
    const run = summaryOf([runWith(1, { ...sound(), P3: { f0: F0_19_95, arrivalS: null, minC: null, maxC: null } })]).runs[0];
    expect(run.judgement).toBe("fail");
    expect(run.reasons).toEqual(["Position P3 never reached Ts (121.0 °C) in the plateau.", "Position P3 has no reading during holding."]);
    expect(run.spreadK).toBeNull();
  });

  it("a biological indicator with growth or a chemical indicator that did not change fails the run", () => {
    const run = summaryOf([
      runWith(1, sound(), {
        indicators: [
          { positionId: "P1", kind: "biological", result: "no-growth" },
          { positionId: "P2", kind: "biological", result: "growth" },
          { positionId: "P3", kind: "chemical", result: "fail" },
        ],
      }),
    ]).runs[0];
    expect(run.judgement).toBe("fail");
    expect(run.positiveIndicators.map((i) => i.positionId)).toEqual(["P2", "P3"]);
    expect(run.reasons).toEqual(["The biological indicator at P2 showed growth.", "The chemical indicator at P3 did not change as specified."]);
  });

  it("when indicators are required, a position without a biological reading leaves the run pending; a chemical one does not stand in", () => {
    const indicators = [
      { positionId: "P1", kind: "biological", result: "no-growth" },
      { positionId: "P2", kind: "biological", result: "no-growth" },
      { positionId: "P3", kind: "chemical", result: "pass" },
    ] as const;
    const required = { ...CRITERIA, indicatorsRequired: true };
    const pending = summaryOf([runWith(1, sound(), { indicators: [...indicators] })], required).runs[0];
    expect(pending.judgement).toBe("pending");
    expect(pending.missingIndicators).toEqual(["P3"]);
    expect(pending.reasons).toEqual(["No biological indicator has been read at P3 yet."]);
    const read = summaryOf([runWith(1, sound(), { indicators: [...indicators, { positionId: "P3", kind: "biological", result: "no-growth" }] })], required).runs[0];
    expect(read.judgement).toBe("pass");
    const notRequired = summaryOf([runWith(1, sound(), { indicators: [...indicators] })]).runs[0];
    expect(notRequired.judgement).toBe("pass");
    expect(notRequired.missingIndicators).toEqual([]);
  });

  it("a pattern position without a channel, or mapped to a header the record lacks, fails the run", () => {
    const unmapped = summaryOf([runWith(1, { P1: { f0: F0_30 }, P2: { f0: F0_15 } })]);
    expect(unmapped.runs[0].judgement).toBe("fail");
    expect(unmapped.runs[0].reasons).toEqual(["Position P3 has no channel in this run's sensor map."]);
    expect(unmapped.unmappedPositions.map((p) => p.id)).toEqual(["P3"]);
    const wrongHeader = summaryOf([runWith(1, sound(), { sensorMap: { P1: "P1", P2: "P2", "P3 (°C)": "P3" } })]).runs[0];
    expect(wrongHeader.reasons).toEqual(['Position P3 is mapped to "P3 (°C)", which the cycle\'s record does not have.']);
  });

  it("two channels at one position are read together: the lower F0, the wider range, the later arrival", () => {
    const run = summaryOf([runWith(1, { ...sound(), "P3 second": { f0: F0_15, minC: 121.2, maxC: 122.4, arrivalS: 8 } }, { sensorMap: { P1: "P1", P2: "P2", P3: "P3", "P3 second": "P3" } })]).runs[0];
    const p3 = run.positions.find((p) => p.positionId === "P3");
    expect(p3).toEqual({ positionId: "P3", header: "P3, P3 second", minTempC: 121.2, maxTempC: 122.4, equilibrationS: 8, f0Min: F0_15 });
  });
});

describe("the cold spot", () => {
  it("a tie in F0 goes to the position that reached Ts latest", () => {
    const run = summaryOf([runWith(1, { P1: { f0: F0_15, arrivalS: 4 }, P2: { f0: F0_15, arrivalS: 9 }, P3: { f0: F0_30 } })]).runs[0];
    expect(run.coldSpot?.positionId).toBe("P2");
    const reversed = summaryOf([runWith(1, { P1: { f0: F0_15, arrivalS: 9 }, P2: { f0: F0_15, arrivalS: 4 }, P3: { f0: F0_30 } })]).runs[0];
    expect(reversed.coldSpot?.positionId).toBe("P1");
  });

  it("overall: the lowest minimum F0 over the runs, with how often that position was a run's cold spot", () => {
    const summary = summaryOf([
      runWith(1, { P1: { f0: F0_30 }, P2: { f0: F0_15 }, P3: { f0: F0_19_95 } }),
      runWith(2, { P1: { f0: F0_30 }, P2: { f0: F0_30 }, P3: { f0: F0_19_95 } }),
      runWith(3, { P1: { f0: F0_30 }, P2: { f0: F0_15 }, P3: { f0: F0_19_95 } }),
    ]);
    expect(summary.runs.map((r) => r.coldSpot?.positionId)).toEqual(["P2", "P3", "P2"]);
    expect(summary.coldSpot).toEqual({ position: "P2", label: "Tray 2, centre of the wrapped set", minF0: F0_15, runsAsColdSpot: 2, runsCounted: 3 });
    const p2 = summary.positions.find((p) => p.position === "P2");
    expect(p2?.f0ByRun).toEqual({ 1: F0_15, 2: F0_30, 3: F0_15 });
    expect(p2?.coldSpotRuns).toEqual([1, 3]);
    expect(p2?.minF0).toBe(F0_15);
  });

  it("overall tie in minimum F0: the position with the longest equilibration over the runs", () => {
    const summary = summaryOf([
      runWith(1, { P1: { f0: F0_15, arrivalS: 2 }, P2: { f0: F0_30, arrivalS: 12 }, P3: { f0: F0_19_95 } }),
      runWith(2, { P1: { f0: F0_30, arrivalS: 2 }, P2: { f0: F0_15, arrivalS: 5 }, P3: { f0: F0_19_95 } }),
    ]);
    // both reach 15.0 as their minimum; P1's longest arrival 2 s, P2's 12 s → P2 [worked by hand]
    expect(summary.coldSpot).toMatchObject({ position: "P2", runsAsColdSpot: 1, runsCounted: 2 });
  });
});

describe("across runs", () => {
  it("each position's lowest minimum, highest maximum and longest equilibration; the study's spread is the largest run spread", () => {
    const summary = summaryOf([
      runWith(1, { P1: { f0: F0_30, minC: 121.3, maxC: 121.9, arrivalS: 2 }, P2: { f0: F0_15 }, P3: { f0: F0_19_95 } }),
      runWith(2, { P1: { f0: F0_30, minC: 121.4, maxC: 122.6, arrivalS: 6 }, P2: { f0: F0_15 }, P3: { f0: F0_19_95 } }),
    ]);
    const p1 = summary.positions[0];
    expect([p1.minTemp, p1.maxTemp, p1.maxEquilibrationS]).toEqual([121.3, 122.6, 6]);
    // run 1: 122.0 − 121.3 = 0.7 K; run 2: 122.6 − 121.4 = 1.2 K [worked by hand]
    expect(summary.runs.map((r) => r.spreadK)).toEqual([expect.closeTo(0.7, 10), expect.closeTo(1.2, 10)]);
    expect(summary.spreadK).toBeCloseTo(1.2, 10);
  });

  it("runs are read in run-number order whatever order they arrive in; no runs gives no cold spot and every position unmapped", () => {
    const summary = summaryOf([runWith(2, sound()), runWith(1, sound())]);
    expect(summary.runs.map((r) => r.runNumber)).toEqual([1, 2]);
    const empty = summaryOf([]);
    expect(empty.coldSpot).toBeNull();
    expect(empty.spreadK).toBeNull();
    expect(empty.unmappedPositions.map((p) => p.id)).toEqual(["P1", "P2", "P3"]);
    expect(empty.consecutive).toEqual({ passing: 0, required: 3, complete: false });
  });
});

describe("the consecutive series", () => {
  it("pass, fail, pass, pass, pass: 3 consecutive, complete for 3 required [issue 14 §2]", () => {
    expect(consecutiveSeries(["pass", "fail", "pass", "pass", "pass"], 3)).toEqual({ passing: 3, required: 3, complete: true });
  });
  it("a failed last run leaves 0", () => {
    expect(consecutiveSeries(["pass", "pass", "pass", "fail"], 3)).toEqual({ passing: 0, required: 3, complete: false });
  });
  it("a pending last run proves nothing yet: 0", () => {
    expect(consecutiveSeries(["pass", "pass", "pass", "pending"], 3)).toEqual({ passing: 0, required: 3, complete: false });
  });
  it("two passes of three required are not complete; a protocol asking for none still needs one pass", () => {
    expect(consecutiveSeries(["fail", "pass", "pass"], 3).complete).toBe(false);
    expect(consecutiveSeries([], 0).complete).toBe(false);
    expect(consecutiveSeries(["pass"], 0).complete).toBe(true);
  });
  it("the summary counts from its own run judgements", () => {
    const summary = summaryOf([runWith(1, { ...sound(), P2: { f0: F0_14_66 } }), runWith(2, sound()), runWith(3, sound()), runWith(4, sound())]);
    expect(summary.runs.map((r) => r.judgement)).toEqual(["fail", "pass", "pass", "pass"]);
    expect(summary.consecutive).toEqual({ passing: 3, required: 3, complete: true });
  });
});

describe("the heat map's grid", () => {
  it("positions × runs with F0 or the minimum temperature, each run's cold spot marked", () => {
    const summary = summaryOf([runWith(1, sound()), runWith(2, { P1: { f0: F0_30, minC: 121.2 }, P2: { f0: F0_30 }, P3: { f0: F0_19_95 } })]);
    const f0 = heatMapGrid(summary, "f0");
    expect(f0.runs.map((r) => [r.runNumber, r.judgement])).toEqual([
      [1, "pass"],
      [2, "pass"],
    ]);
    expect(f0.rows.map((r) => r.cells.map((c) => c.value))).toEqual([
      [F0_30, F0_30],
      [F0_15, F0_30],
      [F0_19_95, F0_19_95],
    ]);
    expect(f0.rows.map((r) => r.cells.map((c) => c.coldSpot))).toEqual([
      [false, false],
      [true, false],
      [false, true],
    ]);
    expect(f0.rows.map((r) => r.overallColdSpot)).toEqual([false, true, false]);
    const temps = heatMapGrid(summary, "minTemp");
    expect(temps.rows[0].cells.map((c) => c.value)).toEqual([121.5, 121.2]);
  });
});

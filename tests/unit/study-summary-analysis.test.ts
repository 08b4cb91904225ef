// End to end: real analyses of constructed recordings, summarised across runs. The probes step from 20 °C straight
// to a constant level, so each F0 is worked by hand: (seconds at the level + ½ s for each step's trapezoid) ×
// 10^((T − 121.1)/10) / 60; the 20 °C readings add 10^-10.1 per second, nothing at this precision (DOMAIN.md §3).
import { describe, expect, it } from "vitest";
import { DEFAULT_LIMITS, analyzeRecording } from "@/lib/analysis";
import { summarizeStudy } from "@/lib/analysis/study-summary";
import type { StudyRunInput } from "@/lib/analysis/study-types";
import type { Recording } from "@/lib/logger-files";
import { saturationPressureKpa } from "@/lib/steam";
import { CRITERIA, PATTERN } from "./study-fixtures";

const LIMITS = { ...DEFAULT_LIMITS, sterilizationTempC: 121, holdingTimeS: 600 };

/** 20 °C until reachS, then levelC until 960 s, then 20 °C again; one sample a second for 1000 s. */
const probe = (reachS: number, levelC: number) => (t: number) => (t >= reachS && t <= 960 ? levelC : 20);

function recording(probes: Record<string, (t: number) => number>): Recording {
  const timesS = Float64Array.from({ length: 1001 }, (_, i) => i);
  const drain = probe(60, 121.6);
  const column = (f: (t: number) => number) => timesS.map(f);
  return {
    startedAt: null,
    timesS,
    temperatures: [{ header: "Drain (°C)", values: column(drain) }, ...Object.entries(probes).map(([header, f]) => ({ header, values: column(f) }))],
    pressure: { header: "Chamber (kPa abs)", values: timesS.map((t) => saturationPressureKpa(drain(t))) },
    referenceIndex: 0,
  };
}

function run(runNumber: number, probes: Record<string, (t: number) => number>, sensorMap: Record<string, string>): StudyRunInput {
  const analysis = analyzeRecording(recording(probes), LIMITS);
  return { runId: `r${runNumber}`, runNumber, cycleNumber: `C-${runNumber}`, cycleStatus: "approved", cycleVerdict: analysis.verdict, analysis, sensorMap, indicators: [] };
}

const MAP = { "P1 front (°C)": "P1", "P2 wrapped set (°C)": "P2", "P3 rear (°C)": "P3" };

describe("the summary of real analyses", () => {
  // Run 1: P1 121.6 °C from 60 s, P2 121.1 °C from 65 s, P3 122.1 °C from 62 s; the drain reaches Ts at 60 s.
  const run1 = run(1, { "P1 front (°C)": probe(60, 121.6), "P2 wrapped set (°C)": probe(65, 121.1), "P3 rear (°C)": probe(62, 122.1) }, MAP);
  // Run 2: P3 is now the slow one (121.1 °C from 68 s), P2 at 121.6 °C from 61 s.
  const run2 = run(2, { "P1 front (°C)": probe(60, 121.6), "P2 wrapped set (°C)": probe(61, 121.6), "P3 rear (°C)": probe(68, 121.1) }, MAP);

  it("the analyses pass on their own", () => {
    expect([run1.analysis.verdict, run2.analysis.verdict]).toEqual(["pass", "pass"]);
  });

  it("each position's F0, hold extremes and equilibration are the analysis' own figures, as worked by hand", () => {
    const summary = summarizeStudy({ criteria: { ...CRITERIA, minF0Min: 14 }, positions: PATTERN, runs: [run1, run2] });
    const [first] = summary.runs;
    expect(first.judgement).toBe("pass");
    const p = Object.fromEntries(first.positions.map((f) => [f.positionId, f]));
    // P1: 901 s × 10^0.05 / 60 = 901 × 1.122018 / 60 = 16.849 min [worked by hand]
    expect(p.P1.f0Min).toBeCloseTo(16.849, 2);
    // P2: (960 − 65 + 1) s × 1 / 60 = 14.933 min [worked by hand]
    expect(p.P2.f0Min).toBeCloseTo(14.933, 2);
    // P3: (960 − 62 + 1) s × 10^0.1 / 60 = 899 × 1.258925 / 60 = 18.863 min [worked by hand]
    expect(p.P3.f0Min).toBeCloseTo(18.863, 2);
    expect([p.P1.equilibrationS, p.P2.equilibrationS, p.P3.equilibrationS]).toEqual([0, 5, 2]);
    expect([p.P2.minTempC, p.P2.maxTempC, p.P3.maxTempC]).toEqual([121.1, 121.1, 122.1]);
    // spread: highest max 122.1 − lowest min 121.1 = 1.0 K [worked by hand]
    expect(first.spreadK).toBeCloseTo(1.0, 6);
    expect(first.coldSpot?.positionId).toBe("P2");
    // Run 2: P3 (960 − 68 + 1) s / 60 = 14.883 min, the cold spot; overall P3 is coldest, cold spot in 1 of 2 runs.
    expect(summary.runs[1].coldSpot).toEqual({ positionId: "P3", f0Min: expect.closeTo(14.883, 2) });
    expect(summary.coldSpot).toMatchObject({ position: "P3", minF0: expect.closeTo(14.883, 2), runsAsColdSpot: 1, runsCounted: 2 });
    expect(summary.consecutive).toEqual({ passing: 2, required: 3, complete: false });
  });

  it("with the minimum F0 at 15 min, both runs fail on their cold spot although each cycle passed its own checks", () => {
    const summary = summarizeStudy({ criteria: CRITERIA, positions: PATTERN, runs: [run1, run2] });
    expect(summary.runs.map((r) => r.reasons)).toEqual([["Position P2 received F0 14.93 min, below the minimum 15.00 min."], ["Position P3 received F0 14.88 min, below the minimum 15.00 min."]]);
    expect(summary.consecutive.passing).toBe(0);
  });

  it("a probe that never reaches Ts fails the run", () => {
    const cold = run(3, { "P1 front (°C)": probe(60, 121.6), "P2 wrapped set (°C)": probe(60, 121.6), "P3 rear (°C)": probe(60, 120.5) }, MAP);
    const summary = summarizeStudy({ criteria: { ...CRITERIA, minF0Min: 1 }, positions: PATTERN, runs: [cold] });
    expect(summary.runs[0].judgement).toBe("fail");
    expect(summary.runs[0].reasons).toContain("Position P3 never reached Ts (121.0 °C) in the plateau.");
  });
});

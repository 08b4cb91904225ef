// Issue 9: both sides of the definitions the criteria tests rely on (the end of the plateau
// period, the free-space sensor's 60 s, the gap limit, the equilibration resolution), and the
// options, mapping and site settings that carry absolute/gauge and the atmospheric pressure.
import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { analyzeLoggerBytes } from "@/lib/cycles/analyze-file";
import { thermometricOf } from "@/lib/analysis";
import { inspectLoggerFile } from "@/lib/logger-files";
import type { AcceptanceProfile } from "@/db/schema";
import { ANALYZE_TIMEOUT_MS, channelOf, checkOf, diagnosisOf, runAnalyze } from "@/tests/support/analyze-cli";
import { LIMITS_134, TS_C, loggerCsv, plateauChannel, sampleTimes, saturationKpa, soundCycle, withBlanks, type Channel } from "@/tests/support/logger-csv";

const concurrent = { concurrent: true, timeout: ANALYZE_TIMEOUT_MS };
const utf8 = (text: string) => new TextEncoder().encode(text);

function cycleFile(change: { times?: number[]; channels?: Record<string, Channel>; kpaAbsAt?: (t: number) => number | null; marker?: "abs" | "gauge" | "none" } = {}): string {
  const base = soundCycle();
  return loggerCsv({ times: change.times ?? base.times, channels: change.channels ?? base.channels, pressure: { marker: change.marker ?? "abs", kpaAbsAt: change.kpaAbsAt ?? base.kpaAbsAt } });
}

describe("the end of the plateau period, the other side of the exhaust", concurrent, () => {
  it("a pressure that falls while the drain holds steady is judged: flagged above, up to the drain's last reading at Ts", async () => {
    // From 300 s the pressure is saturated at 134.6 − 0.1 K/s·(t − 300) while every probe stays at
    // 134.6 °C until 330 s: by 330 s the drain reads 3 K above saturation. The drain did not fall,
    // so this is not the exhaust (README "How Papin judges a cycle"); after 330 s both fall.
    const { drain } = soundCycle();
    const tsatAt = (t: number) => (t <= 300 ? drain(t) : t <= 330 ? 134.6 - 0.1 * (t - 300) : drain(t) - 3);
    const run = await runAnalyze(cycleFile({ kpaAbsAt: (t) => saturationKpa(tsatAt(t)) }), LIMITS_134);
    expect(run.exitCode).toBe(0);
    const flags = run.json?.saturation.flags ?? [];
    expect(flags).toHaveLength(1);
    // Beyond the 2 K limit from 320 s or 321 s (psychrolib and IF97 differ by ~0.006 K there [computed]).
    expect(flags[0]).toMatchObject({ kind: "above", end: 330 });
    expect(flags[0].start).toBeGreaterThanOrEqual(320);
    expect(flags[0].start).toBeLessThanOrEqual(321);
    expect(flags[0].worst).toBeCloseTo(3.0, 1);
    // Tsat fell to 131.6 °C during holding, below Ts: the saturation-band check fails too.
    expect(checkOf(run.json, "saturation-band")).toMatchObject({ passed: false, limit: TS_C });
    expect(run.json?.verdict).toBe("fail");
  });

  it("reports the plateau period beside the plateau: the hold's end and the exhaust's start", async () => {
    const run = await runAnalyze(cycleFile(), LIMITS_134);
    expect(run.json?.plateau).toEqual({ start: 30, end: 330 });
    expect(run.json?.plateauPeriod).toEqual({ start: 30, end: 330 });
  });
});

describe("the free-space sensor's first 60 s", concurrent, () => {
  // Plateau from 30 s: 3 K over the drain at 89 s (59 s in) is inside the 5 K allowance; at 90 s
  // (exactly 60 s in) the 2 K limit applies (DOMAIN.md §2.3 e, from memory; at the boundary the
  // stricter limit, fail closed).
  const withExcessAt = (at: number) => {
    const { drain, pack } = soundCycle();
    return cycleFile({ channels: { Drain: drain, "Pack 1": pack, "Free space": (t) => drain(t) + (t === at ? 3 : 0) } });
  };

  it("3 K at 59 s into the plateau passes", async () => {
    const run = await runAnalyze(withExcessAt(89), LIMITS_134);
    expect(checkOf(run.json, "free-space").passed).toBe(true);
    expect(run.json?.verdict).toBe("pass");
    expect(run.json?.summary).toMatch(/every load channel stayed within 134–137 °C/);
  });

  it("3 K at exactly 60 s fails, measured 3 K against 2 K, and says why", async () => {
    const run = await runAnalyze(withExcessAt(90), LIMITS_134);
    expect(checkOf(run.json, "free-space")).toMatchObject({ passed: false, limit: 2 });
    expect(checkOf(run.json, "free-space").measured).toBeCloseTo(3, 3);
    expect(diagnosisOf(run.json, "free-space")).toMatch(/superheated/);
    expect(channelOf(run.json, "Free space (°C)")).toMatchObject({ role: "free-space" });
  });

  it("a saved mapping names the free-space column", async () => {
    const { drain, pack } = soundCycle();
    const file = cycleFile({ channels: { Drain: drain, "Pack 1": pack, "TC 9": (t) => drain(t) + (t === 120 ? 2.5 : 0) } });
    const dir = await mkdtemp(path.join(tmpdir(), "papin-mapping-"));
    try {
      const mapping = path.join(dir, "mapping.json");
      await writeFile(mapping, JSON.stringify({ freeSpaceColumn: "TC 9 (°C)" }));
      const run = await runAnalyze(file, [...LIMITS_134, "--mapping", mapping]);
      expect(checkOf(run.json, "free-space").passed).toBe(false);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});

describe("the gap limit and the logger's pace", concurrent, () => {
  const everyTwo = (gaps: Array<[number, number]>) => {
    const { drain, pack } = soundCycle();
    return cycleFile({ times: sampleTimes(400, 2, gaps), channels: { Drain: drain, "Pack 1": pack } });
  };

  it("an interval of 6 s in a 2 s record is not a gap (3× the median); with --max-interval 4 it is", async () => {
    const loose = await runAnalyze(everyTwo([[100, 106]]), LIMITS_134);
    expect(loose.json?.input.samplingInterval).toBe(2);
    expect(checkOf(loose.json, "record-complete")).toMatchObject({ passed: true, measured: 6, limit: 6 });
    const strict = await runAnalyze(everyTwo([[100, 106]]), [...LIMITS_134, "--max-interval", "4"]);
    expect(checkOf(strict.json, "record-complete")).toMatchObject({ passed: false, measured: 6, limit: 4 });
    expect(strict.json?.input.gaps).toEqual([{ start: 100, end: 106, durationS: 6, channel: null }]);
  });

  it("a logger recording every 15 s can show an equilibration of at most 15 s", async () => {
    // Drain at Ts at 60 s, the pack at 70 s: seen at the 60 s and 75 s samples, 15 s apart.
    const drain = plateauChannel({ tsC: TS_C, reachS: 60, levelC: 134.6, exhaustS: 500 });
    const pack = plateauChannel({ tsC: TS_C, reachS: 70, levelC: 134.6, exhaustS: 500 });
    const file = loggerCsv({ times: sampleTimes(600, 15), channels: { Drain: drain, "Pack 1": pack }, pressure: { marker: "abs", kpaAbsAt: (t) => saturationKpa(drain(t)) } });
    const run = await runAnalyze(file, LIMITS_134);
    expect(checkOf(run.json, "equilibration-time")).toMatchObject({ passed: true, measured: 15 });
  });

  it("blank pressure cells inside the plateau are a gap of the pressure channel", async () => {
    const { kpaAbsAt } = soundCycle();
    const run = await runAnalyze(cycleFile({ kpaAbsAt: withBlanks(kpaAbsAt, (t) => t >= 200 && t <= 204) }), LIMITS_134);
    expect(run.json?.input.gaps).toEqual([{ start: 199, end: 205, durationS: 6, channel: "Chamber (kPa abs)" }]);
    expect(checkOf(run.json, "record-complete").passed).toBe(false);
  });

  it("nothing is integrated across a gap: F0 loses the 60 s not recorded", async () => {
    // 60 s at 134.6 °C: 60 s × 10^((134.6 − 121.1)/10) = 60 × 22.387 s = 22.39 min [computed by hand; DOMAIN.md §3 F0].
    const full = await runAnalyze(cycleFile(), LIMITS_134);
    const gapped = await runAnalyze(cycleFile({ times: sampleTimes(400, 1, [[150, 210]]) }), LIMITS_134);
    const lost = (full.json?.f0["Drain (°C)"] ?? 0) - (gapped.json?.f0["Drain (°C)"] ?? 0);
    expect(lost).toBeCloseTo(22.39, 1);
  });
});

describe("options that say how the pressure reads", concurrent, () => {
  it("contradicting --pressure-reference and --pressure-absolute are refused", async () => {
    const run = await runAnalyze(cycleFile(), [...LIMITS_134, "--pressure-reference", "gauge", "--pressure-absolute"]);
    expect(run.exitCode).toBe(2);
    expect(run.stderr).toMatch(/--pressure-reference and --pressure-absolute contradict each other/);
  });

  it("--altitude 6000 m (47.2 kPa) is refused with the 50–110 kPa range", async () => {
    // Standard atmosphere at 6000 m: 101.325·(1 − 2.25577e-5·6000)^5.2559 = 47.18 kPa (ASHRAE Fundamentals 2021 ch. 1 Eq. 3).
    const run = await runAnalyze(cycleFile(), [...LIMITS_134, "--altitude", "6000"]);
    expect(run.exitCode).toBe(2);
    expect(run.stderr).toMatch(/--altitude 6000 m is refused: an atmospheric pressure of 47\.18\d* kPa is outside the physical range of 50–110 kPa/);
  });

  it("an unmarked gauge file's readings below zero are kept and noted, and the cycle is flagged, not passed", async () => {
    const run = await runAnalyze(loggerCsv({ ...soundCycle(), pressure: { marker: "none", reads: "gauge", kpaAbsAt: soundCycle().kpaAbsAt } }), LIMITS_134);
    expect(run.exitCode).toBe(0);
    expect(run.json?.input.warnings.join(" ")).toMatch(/below zero, impossible for an absolute pressure: the logger very likely records gauge pressure/);
    expect(run.json?.verdict).toBe("fail");
  });
});

describe("the portal's path: a user's mapping and the site's atmospheric pressure", () => {
  const profile = { sterilizationTempC: 134, holdingTimeS: 180, bandK: 3, maxEquilibrationS: 15, maxSpreadK: 2, saturationLimitK: 2, f0ReferenceC: 121.1, f0ZK: 10 } as AcceptanceProfile;
  const unmarkedGauge = () => utf8(loggerCsv({ ...soundCycle(), pressure: { marker: "none", reads: "gauge", atmosphereKpa: 95, kpaAbsAt: (t) => Math.max(95, soundCycle().kpaAbsAt(t)) } }));

  it("the inspection tells the intake screen that absolute was only assumed", () => {
    const inspected = inspectLoggerFile(unmarkedGauge());
    expect(inspected.pressureReference).toEqual({ kind: "absolute", source: "assumed" });
    expect(inspected.freeSpaceColumn).toBeNull();
  });

  it("gauge confirmed in the mapping, with the site's 95 kPa: passes, and the stored analysis says who said what", () => {
    const analysis = analyzeLoggerBytes(unmarkedGauge(), profile, { pressureGauge: true }, 95);
    expect(analysis.result.verdict).toBe("pass");
    expect(analysis.result.input?.pressureReference).toEqual({ kind: "gauge", source: "user" });
    expect(analysis.result.input?.atmosphere).toEqual({ kpa: 95, source: "site" });
    expect(analysis.result.kind).toBe("thermometric");
    expect(thermometricOf(analysis.result)?.plateauPeriod).toEqual({ start: 30, end: 330 });
    expect(analysis.engineVersion).toBe("papin-analysis 2.0.0");
  });

  it("a site atmospheric pressure of 10 kPa is refused, naming the site's settings and the range", () => {
    expect(() => analyzeLoggerBytes(unmarkedGauge(), profile, { pressureGauge: true }, 10)).toThrow(
      /The site's atmospheric pressure \(site settings\) is refused: an atmospheric pressure of 10 kPa is outside the physical range of 50–110 kPa/,
    );
  });
});

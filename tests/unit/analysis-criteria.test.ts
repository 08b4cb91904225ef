// Issue 9, rules 1–3: what the analysis must judge, as black-box cases of the analyze command.
// Written before the implementation: each case is a constructed logger file whose figures follow
// from DESIGN.md's definitions; the source of every expected value is written beside it.
import { describe, expect, it } from "vitest";
import { ANALYZE_TIMEOUT_MS, checkOf, diagnosisOf, runAnalyze } from "@/tests/support/analyze-cli";
import { LIMITS_134, TS_C, loggerCsv, plateauChannel, sampleTimes, saturationKpa, soundCycle, type Channel } from "@/tests/support/logger-csv";

const concurrent = { concurrent: true, timeout: ANALYZE_TIMEOUT_MS };

/** The sound cycle (30 s plateau start, 298 s hold, pressure saturated at the drain), with parts replaced. */
function cycleFile(change: { times?: number[]; channels?: Record<string, Channel>; kpaAbsAt?: (t: number) => number } = {}): string {
  const base = soundCycle();
  return loggerCsv({
    times: change.times ?? base.times,
    channels: change.channels ?? base.channels,
    pressure: { marker: "abs", kpaAbsAt: change.kpaAbsAt ?? base.kpaAbsAt },
  });
}

describe("rule 1: the saturation temperature from the chamber pressure lies within the band during holding", concurrent, () => {
  // EN 285 thermometric criterion: the pressure-derived temperature is held to the band like
  // every probe (DOMAIN.md §2.3 b, from memory). Check id `saturation-band`; these cases assume
  // measured = the saturation temperature during holding furthest outside the band, limit = the
  // band edge it crossed (°C), like the `band` check.
  it("every probe at 134.6 °C while the pressure gives Tsat 133.0 °C: saturation-band fails", async () => {
    const { drain } = soundCycle();
    // Pressure saturated 1.6 K below the drain: Tsat 133.005 °C during holding
    // [computed: python3-iapws IAPWS97 at psychrolib's p_s(133.0 °C) = 295.453 kPa]. The deviation
    // of 1.6 K stays inside the 2 K saturation limit, so only the new check can catch it.
    const run = await runAnalyze(cycleFile({ kpaAbsAt: (t) => saturationKpa(drain(t) - 1.6) }), LIMITS_134);
    expect(run.exitCode).toBe(0);
    expect(checkOf(run.json, "saturation").passed).toBe(true);
    const check = checkOf(run.json, "saturation-band");
    expect(check.passed).toBe(false);
    expect(check.measured).toBeCloseTo(133.0, 1);
    expect(check.limit).toBe(TS_C);
    expect(run.json?.verdict).toBe("fail");
  });

  it("probes at 134.6 °C with Tsat 134.3 °C: inside the band, the cycle passes", async () => {
    const { drain } = soundCycle();
    // Tsat 134.305 °C [computed: python3-iapws at psychrolib's p_s(134.3 °C) = 306.926 kPa]
    const run = await runAnalyze(cycleFile({ kpaAbsAt: (t) => saturationKpa(drain(t) - 0.3) }), LIMITS_134);
    expect(checkOf(run.json, "saturation-band").passed).toBe(true);
    expect(run.json?.verdict).toBe("pass");
  });

  it("probes at 136.8 °C with Tsat 137.4 °C: above the band's top of 137 °C, saturation-band fails", async () => {
    const hot = plateauChannel({ tsC: TS_C, reachS: 30, levelC: 136.8, exhaustS: 330 });
    // Tsat 137.406 °C [computed: python3-iapws at psychrolib's p_s(137.4 °C) = 335.744 kPa];
    // band top 134 + 3 = 137 °C (EN 285 band width, DOMAIN.md §2.2, from memory).
    const run = await runAnalyze(cycleFile({ channels: { Drain: hot, "Pack 1": hot }, kpaAbsAt: (t) => saturationKpa(hot(t) + 0.6) }), LIMITS_134);
    expect(checkOf(run.json, "band").passed).toBe(true);
    const check = checkOf(run.json, "saturation-band");
    expect(check.passed).toBe(false);
    expect(check.measured).toBeCloseTo(137.4, 1);
    expect(check.limit).toBe(137);
    expect(run.json?.verdict).toBe("fail");
  });
});

describe("rule 2: a free-space sensor may exceed the reference by 5 K in the plateau's first 60 s, 2 K after", concurrent, () => {
  // EN 285 small-load test (DOMAIN.md §2.3 e, from memory). How the command marks the channel,
  // as these cases assume: a temperature header containing "free space" (any case), or the
  // option `--free-space <header>`. The plateau starts at 30 s, so its first 60 s end at 90 s.
  const withFreeSpace = (excessAt: (t: number) => number, header = "Free space") => {
    const { drain, pack } = soundCycle();
    return cycleFile({ channels: { Drain: drain, "Pack 1": pack, "Pack 2": pack, [header]: (t) => drain(t) + excessAt(t) } });
  };
  const during = (from: number, to: number, k: number) => (t: number) => (t >= from && t <= to ? k : 0);
  const both = (a: (t: number) => number, b: (t: number) => number) => (t: number) => a(t) + b(t);

  it("5.5 K above the drain 10 s into the plateau fails", async () => {
    const run = await runAnalyze(withFreeSpace(during(40, 45, 5.5)), LIMITS_134);
    expect(run.exitCode).toBe(0);
    expect(checkOf(run.json, "free-space").passed).toBe(false);
    expect(run.json?.verdict).toBe("fail");
  });

  it("4 K above in the first 60 s and 1.5 K after passes", async () => {
    const run = await runAnalyze(withFreeSpace(both(during(40, 45, 4), during(150, 155, 1.5))), LIMITS_134);
    expect(checkOf(run.json, "free-space").passed).toBe(true);
  });

  it("the free-space sensor is judged by its own limit, not by the band or the spread between load probes", async () => {
    // 134.6 + 4 = 138.6 °C is above the band's top of 137 °C; the 5 K allowance would be void if
    // the band applied to this sensor (DOMAIN.md §2.3 e, from memory).
    const run = await runAnalyze(withFreeSpace(both(during(40, 45, 4), during(150, 155, 1.5))), LIMITS_134);
    expect(checkOf(run.json, "band").passed).toBe(true);
    expect(checkOf(run.json, "spread").passed).toBe(true);
    expect(run.json?.verdict).toBe("pass");
  });

  it("2.5 K above the drain 120 s into the plateau fails", async () => {
    const run = await runAnalyze(withFreeSpace(during(150, 155, 2.5)), LIMITS_134);
    expect(checkOf(run.json, "free-space").passed).toBe(false);
    expect(run.json?.verdict).toBe("fail");
  });

  it("--free-space names the channel when its header does not say so", async () => {
    const run = await runAnalyze(withFreeSpace(during(40, 45, 5.5), "TC 7"), [...LIMITS_134, "--free-space", "TC 7 (°C)"]);
    expect(run.exitCode).toBe(0);
    expect(checkOf(run.json, "free-space").passed).toBe(false);
  });

  it("without a free-space channel there is no free-space check", async () => {
    const run = await runAnalyze(cycleFile(), LIMITS_134);
    expect(run.json?.checks.map((c) => c.id)).not.toContain("free-space");
  });
});

describe("rule 3: a record that can prove it (sampling interval and gaps)", concurrent, () => {
  // The typical sampling interval is the median interval; an interval over 3× it inside the
  // plateau is a gap (issue 9 rule 3; DESIGN.md "Record complete"). These cases assume the
  // record-complete check reports measured = the longest interval inside the plateau (s) and
  // limit = 3 × the median (s).
  const slowLogger = (everyS: number, drainReachS: number, packReachS: number) => {
    const drain = plateauChannel({ tsC: TS_C, reachS: drainReachS, levelC: 134.6, exhaustS: 500 });
    const pack = plateauChannel({ tsC: TS_C, reachS: packReachS, levelC: 134.6, exhaustS: 500 });
    return loggerCsv({ times: sampleTimes(600, everyS), channels: { Drain: drain, "Pack 1": pack }, pressure: { marker: "abs", kpaAbsAt: (t) => saturationKpa(drain(t)) } });
  };

  it("a sound 1 s record: interval 1 s, no gaps, record-complete passes", async () => {
    const run = await runAnalyze(cycleFile(), LIMITS_134);
    expect(run.json?.input.samplingInterval).toBe(1);
    expect(run.json?.input.gaps).toEqual([]);
    expect(checkOf(run.json, "record-complete").passed).toBe(true);
    expect(run.json?.verdict).toBe("pass");
  });

  it("a 30 s logger cannot show equilibration of at most 15 s: the check fails and says why", async () => {
    // Drain at Ts at 85 s, packs at 88 s: both first seen at the 90 s sample, so a naive reading
    // gives 0 s equilibration. 30 s > the 15 s limit (EN 285, DOMAIN.md §2.3 a, found).
    const run = await runAnalyze(slowLogger(30, 85, 88), LIMITS_134);
    expect(run.exitCode).toBe(0);
    expect(run.json?.input.samplingInterval).toBe(30);
    expect(checkOf(run.json, "equilibration-time").passed).toBe(false);
    const why = diagnosisOf(run.json, "equilibration-time");
    expect(why).toContain("30 s");
    expect(why).toContain("15 s");
    // An even 30 s record has no gap: record-complete itself holds.
    expect(checkOf(run.json, "record-complete").passed).toBe(true);
    expect(run.json?.verdict).toBe("fail");
  });

  it("a 10 s logger can show a 15 s equilibration: pack seen 10 s after the drain passes", async () => {
    // Drain at Ts at 60 s, pack at 65 s: seen at the 60 s and 70 s samples, 10 s apart.
    const run = await runAnalyze(slowLogger(10, 60, 65), LIMITS_134);
    expect(run.json?.input.samplingInterval).toBe(10);
    expect(checkOf(run.json, "equilibration-time")).toMatchObject({ passed: true, measured: 10 });
    expect(run.json?.verdict).toBe("pass");
  });

  it("a 60 s gap in the hold: record-complete fails, the gap is listed, the hold is not counted across it", async () => {
    const run = await runAnalyze(cycleFile({ times: sampleTimes(400, 1, [[150, 210]]) }), LIMITS_134);
    expect(run.exitCode).toBe(0);
    expect(run.json?.input.gaps).toEqual([expect.objectContaining({ start: 150, end: 210 })]);
    expect(checkOf(run.json, "record-complete")).toMatchObject({ passed: false, measured: 60, limit: 3 });
    // 298 s from 32 to 330 s, less at least the 60 s not recorded.
    expect(run.json?.holdingTime).toBeLessThanOrEqual(298 - 60);
    expect(run.json?.verdict).toBe("fail");
  });

  it("one interval of 3 s (exactly 3× the median) is not a gap", async () => {
    const run = await runAnalyze(cycleFile({ times: sampleTimes(400, 1, [[100, 103]]) }), LIMITS_134);
    expect(run.json?.input.gaps).toEqual([]);
    expect(checkOf(run.json, "record-complete").passed).toBe(true);
    expect(run.json?.holdingTime).toBe(298);
    expect(run.json?.verdict).toBe("pass");
  });

  it("one interval of 4 s inside the plateau is a gap", async () => {
    const run = await runAnalyze(cycleFile({ times: sampleTimes(400, 1, [[100, 104]]) }), LIMITS_134);
    expect(run.json?.input.gaps).toEqual([expect.objectContaining({ start: 100, end: 104 })]);
    expect(checkOf(run.json, "record-complete")).toMatchObject({ passed: false, measured: 4 });
    expect(run.json?.verdict).toBe("fail");
  });

  it("a 10 s gap while heating up, before the plateau, does not fail the record", async () => {
    const run = await runAnalyze(cycleFile({ times: sampleTimes(400, 1, [[10, 20]]) }), LIMITS_134);
    expect(checkOf(run.json, "record-complete").passed).toBe(true);
    expect(run.json?.verdict).toBe("pass");
  });
});

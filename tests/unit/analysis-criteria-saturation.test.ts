// Issue 9, rules 6–8: the saturation check over the whole plateau period, exact edges, and
// diagnoses naming every likely cause. Black-box cases of the analyze command, written before the
// implementation; sources beside the expected values.
import { describe, expect, it } from "vitest";
import { ANALYZE_TIMEOUT_MS, checkOf, runAnalyze } from "@/tests/support/analyze-cli";
import { LIMITS_134, TS_C, fahrenheit, loggerCsv, plateauChannel, saturationKpa, soundCycle, type PressureMarker } from "@/tests/support/logger-csv";

const concurrent = { concurrent: true, timeout: ANALYZE_TIMEOUT_MS };
const LEVEL_C = 134.6;

/**
 * The 134 °C cycle with a realistic exhaust: from 330 s the chamber pressure falls 10 kPa/s while
 * the drain and packs cool only 0.2 K/s, so the drain reads hotter than Tsat(pressure) as the
 * chamber empties. With `airPocket`, the drain reads 4 K below saturation from 200 to 219 s while
 * the pressure holds (an air pocket at the drain).
 */
function exhaustCycle(options: { airPocket?: boolean } = {}): string {
  const slow = (reachS: number) => plateauChannel({ tsC: TS_C, reachS, levelC: LEVEL_C, exhaustS: 330, fallKPerS: 0.2 });
  const drainBase = slow(30);
  const drain = (t: number) => (options.airPocket && t >= 200 && t <= 219 ? LEVEL_C - 4 : drainBase(t));
  const kpaAbsAt = (t: number) => (t <= 330 ? saturationKpa(drainBase(t)) : Math.max(101.325, saturationKpa(LEVEL_C) - 10 * (t - 330)));
  return loggerCsv({
    times: soundCycle().times,
    channels: { Drain: drain, "Pack 1": slow(32), "Pack 2": slow(32) },
    pressure: { marker: "abs", kpaAbsAt },
  });
}

describe("rule 6: the saturation check covers the whole plateau period, past a broken hold, up to the exhaust", concurrent, () => {
  it("a 20 s air pocket mid-plateau raises a below flag even though it broke the hold", async () => {
    const run = await runAnalyze(exhaustCycle({ airPocket: true }), LIMITS_134);
    expect(run.exitCode).toBe(0);
    // The drain's 130.6 °C against Tsat 134.605 °C: −4.005 K
    // [computed: python3-iapws at psychrolib's p_s(134.6 °C) = 309.624 kPa].
    const flags = run.json?.saturation.flags ?? [];
    expect(flags).toHaveLength(1);
    expect(flags[0]).toMatchObject({ kind: "below", start: 200, end: 219 });
    expect(flags[0].worst).toBeCloseTo(-4.0, 1);
    expect(checkOf(run.json, "saturation").passed).toBe(false);
    expect(run.json?.verdict).toBe("fail");
  });

  it("the exhaust (pressure falling faster than the drain temperature) raises no flag", async () => {
    // At 333 s the drain still reads 134.0 °C while 279.6 kPa gives Tsat 131.14 °C, +2.9 K
    // [computed: python3-iapws]: the chamber emptying, not superheated steam.
    const run = await runAnalyze(exhaustCycle(), LIMITS_134);
    expect(run.exitCode).toBe(0);
    expect(run.json?.saturation.flags).toEqual([]);
    expect(checkOf(run.json, "saturation").passed).toBe(true);
    expect(run.json?.verdict).toBe("pass");
  });
});

describe("rule 7: comparisons at Ts and the band edges allow 1e-6 K of unit-conversion rounding", concurrent, () => {
  // 249.98 °F = 121.1 °C exactly and 255.38 °F = 124.1 °C exactly ((°F − 32) × 5/9, DOMAIN.md §4
  // conversions), but in binary floating point (249.98 − 32) × 5/9 = 121.09999999999998.
  // 121.1 °C is the F0 reference temperature (DOMAIN.md §3, found); band 3 K (common practice).
  const TS_121 = 121.1;
  const LIMITS_121 = ["--sterilization-temp", "121.1", "--holding-time", "180"];
  const fahrenheitFile = (levelF: number, pack1At: (t: number) => number | null, pack2At: (t: number) => number | null = () => null) => {
    const levelC = ((levelF - 32) * 5) / 9;
    const drainC = plateauChannel({ tsC: TS_121, reachS: 30, levelC, exhaustS: 330 });
    const packC = plateauChannel({ tsC: TS_121, reachS: 32, levelC, exhaustS: 330 });
    return loggerCsv({
      times: soundCycle().times,
      temperatureUnit: "°F",
      channels: {
        // The drain reads exactly 249.98 °F at 30 s: that is reaching Ts.
        Drain: (t) => (t === 30 ? 249.98 : fahrenheit(drainC(t))),
        "Pack 1": (t) => pack1At(t) ?? fahrenheit(packC(t)),
        "Pack 2": (t) => pack2At(t) ?? fahrenheit(packC(t)),
      },
      pressure: { marker: "abs", kpaAbsAt: (t) => saturationKpa(t === 30 ? TS_121 : drainC(t)) },
    });
  };
  const between = (from: number, to: number, value: number) => (t: number) => (t >= from && t <= to ? value : null);

  it("a probe reading exactly 249.98 °F (121.1 °C) for 20 s does not end the hold", async () => {
    const run = await runAnalyze(fahrenheitFile(251, between(100, 120, 249.98)), LIMITS_121);
    expect(run.exitCode).toBe(0);
    expect(run.json?.plateau?.start).toBe(30);
    // Hold from the packs' arrival at 32 s to 330 s.
    expect(run.json?.holdingTime).toBe(298);
    expect(run.json?.verdict).toBe("pass");
  });

  it("249.97 °F (121.094 °C, 5.6 mK below Ts) does end the hold", async () => {
    const run = await runAnalyze(fahrenheitFile(251, between(100, 120, 249.97)), LIMITS_121);
    // Hold from 32 s to the last sample before the dip, 99 s.
    expect(run.json?.holdingTime).toBe(67);
    expect(checkOf(run.json, "holding-time").passed).toBe(false);
  });

  it("a probe reading exactly 255.38 °F (124.1 °C, the band's top) stays within the band; 255.39 °F does not", async () => {
    const atTop = await runAnalyze(
      fahrenheitFile(254, () => null, between(200, 210, 255.38)),
      LIMITS_121,
    );
    expect(checkOf(atTop.json, "band").passed).toBe(true);
    expect(atTop.json?.verdict).toBe("pass");
    const above = await runAnalyze(
      fahrenheitFile(254, () => null, between(200, 210, 255.39)),
      LIMITS_121,
    );
    expect(checkOf(above.json, "band").passed).toBe(false);
  });
});

describe("rule 8: diagnoses name every likely cause; a flag's worst is signed", concurrent, () => {
  // The sound cycle (hold 32–330 s, pressure saturated at the drain, exhaust saturated too), with
  // the pressure read as if the steam were `offsetK` hotter than the drain for a span of the hold.
  // The drain stays at 134.6 °C, so the hold is never broken and only the flag's wording is tested.
  const { drain, times, channels } = soundCycle();
  const offsetFile = (offsetAt: (t: number) => number, pressure: { marker?: PressureMarker; atmosphereKpa?: number } = {}) =>
    loggerCsv({
      times,
      channels,
      pressure: { marker: pressure.marker ?? "abs", atmosphereKpa: pressure.atmosphereKpa, kpaAbsAt: (t) => saturationKpa(drain(t) + offsetAt(t)) },
    });
  const during = (from: number, to: number, k: number) => (t: number) => (t >= from && t <= to ? k : 0);

  it("below: air or non-condensable gas, probe or transducer offset, condensate at the drain; worst negative", async () => {
    // Pressure saturated at 136.9 °C from 150 to 169 s: 134.6 − 136.906 = −2.306 K
    // [computed: python3-iapws at psychrolib's p_s(136.9 °C)].
    const run = await runAnalyze(offsetFile(during(150, 169, 2.3)), LIMITS_134);
    const flags = run.json?.saturation.flags ?? [];
    expect(flags).toHaveLength(1);
    expect(flags[0]).toMatchObject({ kind: "below", start: 150, end: 169 });
    expect(flags[0].worst).toBeCloseTo(-2.31, 1);
    const text = flags[0].diagnosis;
    expect(text).toMatch(/air|non-condensable/i);
    expect(text).toMatch(/calibrat/i);
    expect(text).toMatch(/transducer/i);
    expect(text).toMatch(/offset/i);
    expect(text).toMatch(/condensate/i);
  });

  it("below, on gauge readings: names the atmospheric pressure used and where it came from", async () => {
    const run = await runAnalyze(offsetFile(during(150, 169, 2.3), { marker: "gauge", atmosphereKpa: 95.5 }), [...LIMITS_134, "--atmosphere", "95.5"]);
    const flag = run.json?.saturation.flags[0];
    expect(flag?.kind).toBe("below");
    const text = flag?.diagnosis ?? "";
    expect(text).toMatch(/atmospheric pressure/i);
    expect(text).toContain("95.5 kPa");
    expect(text).toMatch(/--atmosphere|option/i);
  });

  it("above: superheat (reducing valve, jacket, over-dry supply) or a probe offset; worst positive", async () => {
    // Pressure saturated 3 K below the drain from 120 to 130 s: 134.6 − 131.605 = +2.995 K
    // [computed: python3-iapws at psychrolib's p_s(131.6 °C) = 283.488 kPa].
    const run = await runAnalyze(offsetFile(during(120, 130, -3)), LIMITS_134);
    const flags = run.json?.saturation.flags ?? [];
    expect(flags).toHaveLength(1);
    expect(flags[0]).toMatchObject({ kind: "above", start: 120, end: 130 });
    expect(flags[0].worst).toBeCloseTo(3.0, 1);
    const text = flags[0].diagnosis;
    expect(text).toMatch(/superheat/i);
    expect(text).toMatch(/reducing valve/i);
    expect(text).toMatch(/jacket/i);
    expect(text).toMatch(/dry/i);
    expect(text).toMatch(/offset|calibrat/i);
  });
});

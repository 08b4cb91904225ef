import { describe, expect, it } from "vitest";
import { AnalysisError, DEFAULT_LIMITS, analyzeRecording, type AcceptanceLimits } from "@/lib/analysis";
import type { Recording } from "@/lib/logger-files";
import { saturationPressureKpa } from "@/lib/steam";

// Small constructed series, one sample a second, to pin down each definition in DESIGN.md.
const TS = 134;
const limits: AcceptanceLimits = { ...DEFAULT_LIMITS, sterilizationTempC: TS, holdingTimeS: 180 };

type Channel = (t: number) => number;

function record(durationS: number, channels: Record<string, Channel>, pressure?: (t: number, drainC: number) => number): Recording {
  const n = durationS + 1;
  const timesS = new Float64Array(n).map((_, i) => i);
  const names = Object.keys(channels);
  const temperatures = names.map((header) => ({ header, values: timesS.map((t) => channels[header](t)) }));
  const drain = temperatures[0].values;
  const pressureValues = timesS.map((t, i) => (pressure ? pressure(t, drain[i]) : saturationPressureKpa(drain[i])));
  return { startedAt: null, timesS, temperatures, pressure: { header: "Chamber (kPa abs)", values: pressureValues }, referenceIndex: 0 };
}

/** Rises 1 K/s from 100 °C, reaching Ts at `arrivalS` and `level` after; holds to `endS`, then drops below Ts. */
const ramp =
  (arrivalS: number, endS: number, level = TS + 1) =>
  (t: number) => {
    const rising = level - (arrivalS + (level - TS) - t);
    if (t <= endS) return Math.max(100, Math.min(level, rising));
    return Math.max(100, TS - 1 - (t - endS));
  };

const check = (result: ReturnType<typeof analyzeRecording>, id: string) => result.checks.find((c) => c.id === id)!;

describe("plateau, equilibration and holding", () => {
  it("the plateau starts when the drain reaches Ts; equilibration ends with the last probe to arrive", () => {
    const result = analyzeRecording(record(400, { "Drain (°C)": ramp(10, 300), "Pack 1 (°C)": ramp(12, 300), "Pack 2 (°C)": ramp(17, 300) }), limits);
    expect(result.plateau?.start).toBe(10);
    expect(result.channels.map((c) => c.firstArrival)).toEqual([10, 12, 17]);
    expect(result.channels.map((c) => c.arrivalAfterPlateauStart)).toEqual([0, 2, 7]);
    expect(result.equilibrationTime).toBe(7);
    // Holding runs from 17 s to the last sample where every channel is still ≥ Ts.
    expect(result.holdingTime).toBe(300 - 17);
    expect(result.plateau?.end).toBe(300);
    expect(result.verdict).toBe("pass");
    expect(result.channels[0].role).toBe("reference");
    expect(result.channels[1].role).toBe("load");
  });

  it("a probe arriving 20 s after the drain fails the 15 s equilibration limit", () => {
    const result = analyzeRecording(record(400, { "Drain (°C)": ramp(10, 300), "Pack 1 (°C)": ramp(30, 300) }), limits);
    expect(result.equilibrationTime).toBe(20);
    expect(check(result, "equilibration-time")).toMatchObject({ passed: false, measured: 20, limit: 15 });
    expect(result.diagnoses.find((d) => d.checkId === "equilibration-time")?.text).toMatch(/"Pack 1 \(°C\)" reached 134 °C 20 s after the reference/);
    expect(result.verdict).toBe("fail");
  });

  it("a dip below Ts in one probe ends the hold there", () => {
    const pack = (t: number) => (t === 150 ? TS - 0.2 : ramp(12, 300)(t));
    const result = analyzeRecording(record(400, { "Drain (°C)": ramp(10, 300), "Pack 1 (°C)": pack }), limits);
    expect(result.holdingTime).toBe(149 - 12);
    expect(result.plateau?.end).toBe(149);
    expect(check(result, "holding-time")).toMatchObject({ passed: false, measured: 137, limit: 180 });
    expect(result.diagnoses.find((d) => d.checkId === "holding-time")?.text).toMatch(/The hold ended at 150 s when "Pack 1 \(°C\)" fell to 133\.80 °C while the reference was still up/);
  });

  it("a short hold fails even when everything else is right", () => {
    const result = analyzeRecording(record(300, { "Drain (°C)": ramp(10, 150), "Pack 1 (°C)": ramp(11, 150) }), limits);
    expect(result.holdingTime).toBe(139);
    expect(result.checks.filter((c) => !c.passed).map((c) => c.id)).toEqual(["holding-time"]);
  });

  it("a cycle that never reaches the sterilization temperature has no plateau", () => {
    const result = analyzeRecording(record(300, { "Drain (°C)": ramp(10, 200, TS - 0.5), "Pack 1 (°C)": ramp(10, 200, TS - 0.8) }), limits);
    expect(result.plateau).toBeNull();
    expect(result.plateausFound).toBe(0);
    expect(result.equilibrationTime).toBeNull();
    expect(result.holdingTime).toBeNull();
    expect(result.verdict).toBe("fail");
    expect(check(result, "plateau-reached")).toMatchObject({ passed: false, measured: 133.5, limit: 134 });
    expect(result.checks.every((c) => !c.passed)).toBe(true);
    expect(result.diagnoses[0].text).toMatch(/never reached 134 °C \(highest 133\.50 °C/);
  });

  it("a probe that never arrives leaves equilibration and holding unmeasured", () => {
    const result = analyzeRecording(record(300, { "Drain (°C)": ramp(10, 250), "Pack 1 (°C)": ramp(10, 250, TS - 0.3) }), limits);
    expect(result.plateau?.start).toBe(10);
    expect(result.equilibrationTime).toBeNull();
    expect(result.holdingTime).toBeNull();
    expect(result.channels[1].firstArrival).toBeNull();
    expect(result.diagnoses[0].text).toMatch(/"Pack 1 \(°C\)" \(highest 133\.70 °C\) never reached 134 °C/);
  });
});

describe("band and spread during holding", () => {
  it("a probe above Ts + band fails the band check", () => {
    const hot = (t: number) => (t >= 100 && t <= 110 ? TS + 3.4 : ramp(11, 300)(t));
    const result = analyzeRecording(record(400, { "Drain (°C)": ramp(10, 300), "Pack 1 (°C)": ramp(11, 300), "Pack 2 (°C)": hot }), limits);
    expect(check(result, "band")).toMatchObject({ passed: false, measured: 137.4, limit: 137 });
    expect(result.channels[2].maxDuringHold).toBe(137.4);
    expect(result.diagnoses.find((d) => d.checkId === "band")?.text).toMatch(/"Pack 2 \(°C\)" reached 137\.40 °C during holding, above the band's top of 137\.00 °C/);
  });

  it("a spread of 2.3 K between channels at one instant fails; 1.9 K passes", () => {
    const channels = (extra: number) => ({
      "Drain (°C)": ramp(10, 300),
      "Pack 1 (°C)": (t: number) => (t === 120 ? TS + 1 + extra : ramp(11, 300)(t)),
      "Pack 2 (°C)": (t: number) => (t === 120 ? TS + 1 - 0.3 : ramp(11, 300)(t)),
    });
    const wide = analyzeRecording(record(400, channels(2.0)), limits);
    expect(check(wide, "spread").measured).toBeCloseTo(2.3, 9);
    expect(check(wide, "spread").passed).toBe(false);
    expect(wide.diagnoses.find((d) => d.checkId === "spread")?.text).toMatch(/At 120 s the channels differed by 2\.30 K/);
    const narrow = analyzeRecording(record(400, channels(1.6)), limits);
    expect(check(narrow, "spread").measured).toBeCloseTo(1.9, 9);
    expect(check(narrow, "spread").passed).toBe(true);
  });

  it("reports each channel's minimum, maximum and mean during holding", () => {
    const wave = (t: number) => (t < 10 || t > 300 ? ramp(10, 300)(t) : TS + 1 + (t % 2 === 0 ? 0.2 : -0.2));
    const result = analyzeRecording(record(400, { "Drain (°C)": ramp(10, 300), "Pack 1 (°C)": wave }), limits);
    const pack = result.channels[1];
    expect(pack.minDuringHold).toBe(134.8);
    expect(pack.maxDuringHold).toBe(135.2);
    expect(pack.meanDuringHold).toBeCloseTo(135, 2);
  });
});

describe("saturation check: drain against Tsat(chamber pressure)", () => {
  it("flags air (colder than saturation) and superheat (hotter) as spans with start and end", () => {
    const pressure = (t: number, drainC: number) => {
      if (t >= 60 && t <= 90) return saturationPressureKpa(drainC + 2.6); // pressure too high for the temperature: air
      if (t >= 120 && t <= 130) return saturationPressureKpa(drainC - 3); // pressure too low: superheat
      return saturationPressureKpa(drainC);
    };
    const result = analyzeRecording(record(400, { "Drain (°C)": ramp(10, 300), "Pack 1 (°C)": ramp(11, 300) }, pressure), limits);
    const flags = result.saturation.flags;
    expect(flags).toHaveLength(2);
    expect(flags[0]).toMatchObject({ start: 60, end: 90, durationS: 30, kind: "below" });
    expect(flags[0].worst).toBeCloseTo(-2.6, 6);
    expect(flags[0].diagnosis).toMatch(/air or another non-condensable gas/);
    expect(flags[0].diagnosis).toMatch(/door seal/);
    expect(flags[1]).toMatchObject({ start: 120, end: 130, kind: "above" });
    expect(flags[1].worst).toBeCloseTo(3, 6);
    expect(flags[1].diagnosis).toMatch(/superheated/);
    expect(flags[1].diagnosis).toMatch(/jacket/);
    expect(result.saturation.maxDeviation).toBeCloseTo(3, 6);
    expect(result.saturation.lowestDeviation).toBeCloseTo(-2.6, 6);
    expect(check(result, "saturation")).toMatchObject({ passed: false, limit: 2 });
    expect(result.verdict).toBe("fail");
    // The flags do not end the hold: the temperatures stayed up.
    expect(result.holdingTime).toBe(289);
  });

  it("a deviation of 1.9 K is within the 2 K limit", () => {
    const pressure = (t: number, drainC: number) => saturationPressureKpa(t >= 60 && t <= 90 ? drainC + 1.9 : drainC);
    const result = analyzeRecording(record(400, { "Drain (°C)": ramp(10, 300), "Pack 1 (°C)": ramp(11, 300) }, pressure), limits);
    expect(result.saturation.flags).toEqual([]);
    expect(result.saturation.maxDeviation).toBeCloseTo(1.9, 6);
    expect(result.verdict).toBe("pass");
  });

  it("a pressure below the triple point during the plateau is an error naming the time, not NaN", () => {
    const pressure = (t: number, drainC: number) => (t === 50 ? 0.2 : saturationPressureKpa(drainC));
    expect(() => analyzeRecording(record(400, { "Drain (°C)": ramp(10, 300), "Pack 1 (°C)": ramp(11, 300) }, pressure), limits)).toThrow(
      /Chamber pressure at 50 s during the plateau: 0\.2 kPa abs is below the triple point/,
    );
  });
});

describe("several cycles in one file", () => {
  const twoCycles = record(1200, {
    "Drain (°C)": (t) => (t < 600 ? ramp(10, 300)(t) : ramp(610, 900)(t)),
    "Pack 1 (°C)": (t) => (t < 600 ? ramp(12, 300)(t) : ramp(620, 900)(t)),
  });

  it("counts the plateaus and analyses the first by default", () => {
    const result = analyzeRecording(twoCycles, limits);
    expect(result.plateausFound).toBe(2);
    expect(result.plateauIndex).toBe(0);
    expect(result.plateau?.start).toBe(10);
  });

  it("analyses the one asked for", () => {
    const result = analyzeRecording(twoCycles, limits, { plateau: 1 });
    expect(result.plateau?.start).toBe(610);
    expect(result.equilibrationTime).toBe(10);
  });

  it("says so when the plateau asked for does not exist", () => {
    expect(() => analyzeRecording(twoCycles, limits, { plateau: 2 })).toThrow(AnalysisError);
    expect(() => analyzeRecording(twoCycles, limits, { plateau: 2 })).toThrow("The record holds 2 plateaus; plateau 3 does not exist");
  });

  it("a brief dip of the drain during holding is not a second plateau", () => {
    const dip = (t: number) => (t === 100 ? TS - 1 : ramp(10, 300)(t));
    const result = analyzeRecording(record(400, { "Drain (°C)": dip, "Pack 1 (°C)": ramp(11, 300) }), limits);
    expect(result.plateausFound).toBe(1);
    expect(result.holdingTime).toBe(99 - 11);
  });
});

describe("checks and limits", () => {
  it("every check carries its id, measured value, limit and basis", () => {
    const result = analyzeRecording(record(400, { "Drain (°C)": ramp(10, 300), "Pack 1 (°C)": ramp(12, 300) }), limits);
    expect(result.checks.map((c) => c.id)).toEqual(["plateau-reached", "record-complete", "equilibration-time", "holding-time", "band", "saturation-band", "spread", "saturation"]);
    for (const c of result.checks) {
      expect(c.passed).toBe(true);
      expect(typeof c.measured).toBe("number");
      expect(typeof c.limit).toBe("number");
      expect(c.basis.length).toBeGreaterThan(20);
    }
    expect(result.summary).toMatch(/^Pass: plateau from 10 s, equilibration 2 s, holding 4 min 48 s/);
    expect(JSON.parse(JSON.stringify(result))).toEqual(result);
  });

  it("uses the profile's limits, not fixed ones", () => {
    const series = record(400, { "Drain (°C)": ramp(10, 300), "Pack 1 (°C)": ramp(30, 300) });
    expect(analyzeRecording(series, { ...limits, maxEquilibrationS: 30 }).verdict).toBe("pass");
    expect(analyzeRecording(series, { ...limits, holdingTimeS: 300 }).verdict).toBe("fail");
  });

  it("refuses unusable limits", () => {
    const series = record(100, { "Drain (°C)": ramp(10, 80), "Pack 1 (°C)": ramp(12, 80) });
    expect(() => analyzeRecording(series, { ...limits, holdingTimeS: NaN })).toThrow(/holdingTimeS/);
  });
});

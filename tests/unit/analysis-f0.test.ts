import { describe, expect, it } from "vitest";
import { DEFAULT_LIMITS, analyzeRecording, lethalRate, lethalityMinutes } from "@/lib/analysis";
import type { Recording } from "@/lib/logger-files";
import { saturationPressureKpa } from "@/lib/steam";

function constant(temperatureC: number, minutes: number, stepS = 1): { timesS: Float64Array; values: Float64Array } {
  const n = Math.round((minutes * 60) / stepS) + 1;
  return { timesS: new Float64Array(n).map((_, i) => i * stepS), values: new Float64Array(n).fill(temperatureC) };
}

describe("F0", () => {
  // DOMAIN.md §3 check values [computed]; 15 min at 121.1 °C → 15 and 111.1 °C → 1.5 also
  // [found: an F0 technical note].
  it.each([
    [121.1, 15, 15.0],
    [121.0, 15, 14.66],
    [111.1, 15, 1.5],
    [126, 10, 30.9],
    [132, 4, 49.21],
    [134, 3, 58.5],
    [135, 3, 73.64],
  ])("%f °C held for %d min gives F0 = %f min", (temperatureC, minutes, f0) => {
    const { timesS, values } = constant(temperatureC, minutes);
    expect(lethalityMinutes(timesS, values, 121.1, 10)).toBeCloseTo(f0, 2);
  });

  it("with the European reference of 121 °C, 15 min at 121 °C gives 15.00 and at 121.1 °C 15.35", () => {
    // DOMAIN.md §3 [computed]; Ph. Eur. 5.1.5 uses 121 °C [memory]
    expect(lethalityMinutes(constant(121, 15).timesS, constant(121, 15).values, 121, 10)).toBeCloseTo(15.0, 2);
    expect(lethalityMinutes(constant(121.1, 15).timesS, constant(121.1, 15).values, 121, 10)).toBeCloseTo(15.35, 2);
  });

  it("integrates by the trapezoid rule over uneven steps", () => {
    // 60 s at L = 1, a 30 s step to L = 10 (trapezoid: mean of the ends), then 60 s at L = 10.
    const timesS = new Float64Array([0, 60, 90, 150]);
    const values = new Float64Array([121.1, 121.1, 131.1, 131.1]);
    const expected = (60 * 1 + (30 * (1 + 10)) / 2 + 60 * 10) / 60;
    expect(lethalityMinutes(timesS, values)).toBeCloseTo(expected, 12);
  });

  it("lethal rate is tenfold per z", () => {
    expect(lethalRate(131.1)).toBeCloseTo(10, 12);
    expect(lethalRate(121.1 + 18, 121.1, 18)).toBeCloseTo(10, 12);
    expect(lethalRate(134)).toBeCloseTo(19.5, 1); // DOMAIN.md §3 table [computed]
  });

  it("is reported per channel, keyed by the header, with the profile's reference and z", () => {
    const { timesS } = constant(0, 3);
    const drain = new Float64Array(timesS.length).fill(134);
    const pack = new Float64Array(timesS.length).fill(121.1);
    const recording: Recording = {
      startedAt: null,
      timesS,
      temperatures: [
        { header: "Drain (°C)", values: drain },
        { header: "Pack 1 (°C)", values: pack },
      ],
      pressure: { header: "P", values: drain.map((t) => saturationPressureKpa(t)) },
      referenceIndex: 0,
    };
    const result = analyzeRecording(recording, { ...DEFAULT_LIMITS, sterilizationTempC: 121, holdingTimeS: 60 });
    expect(result.f0["Drain (°C)"]).toBeCloseTo(58.5, 2);
    expect(result.f0["Pack 1 (°C)"]).toBeCloseTo(3.0, 2);
    const european = analyzeRecording(recording, { ...DEFAULT_LIMITS, sterilizationTempC: 121, holdingTimeS: 60, f0ReferenceC: 121 });
    expect(european.f0["Pack 1 (°C)"]).toBeCloseTo(3 * Math.pow(10, 0.01), 2);
  });
});

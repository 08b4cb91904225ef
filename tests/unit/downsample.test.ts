import { describe, expect, it } from "vitest";
import { downsampleSeries } from "@/lib/analysis";
import type { SeriesResponse } from "@/lib/cycles/contracts";
import { downsampleForReport } from "@/lib/reports";

// Constructed series (invented data for definition tests): a slow sine, flat lines with one-sample spikes.

describe("downsampling for charts", () => {
  const n = 10_000;
  const timesS = new Float64Array(n).map((_, i) => i);
  const smooth = new Float64Array(n).map((_, i) => 100 + Math.sin(i / 500));
  const spiky = new Float64Array(n).fill(120);
  spiky[4321] = 140;
  spiky[7777] = 95;

  it("keeps every sample when the window has no more than maxPoints", () => {
    const result = downsampleSeries(timesS, [smooth], 20_000);
    expect(result.timesS).toHaveLength(n);
    expect(result.series[0][1234]).toBe(smooth[1234]);
    const window = downsampleSeries(timesS, [smooth], 500, 100, 399);
    expect(window.timesS).toHaveLength(300);
    expect(window.timesS[0]).toBe(100);
    expect(window.timesS[299]).toBe(399);
  });

  it("never loses a peak or a dip", () => {
    const result = downsampleSeries(timesS, [spiky, smooth], 200);
    expect(result.timesS.length).toBeLessThanOrEqual(200);
    expect(Math.max(...result.series[0])).toBe(140);
    expect(Math.min(...result.series[0])).toBe(95);
    expect(Math.max(...result.series[1])).toBeCloseTo(Math.max(...smooth), 12);
  });

  it("keeps each bucket's extremes in the order they happened, on a rising time axis", () => {
    const falling = new Float64Array(n).map((_, i) => 1000 - i);
    const result = downsampleSeries(timesS, [falling], 100);
    expect(result.series[0][0]).toBe(1000);
    expect(result.series[0][1]).toBe(801);
    for (let i = 1; i < result.timesS.length; i++) expect(result.timesS[i]).toBeGreaterThanOrEqual(result.timesS[i - 1]);
  });

  it("works on a window of a long record", () => {
    const result = downsampleSeries(timesS, [spiky], 50, 4000, 5000);
    expect(result.timesS[0]).toBe(4000);
    expect(result.timesS[result.timesS.length - 1]).toBe(5000);
    expect(Math.max(...result.series[0])).toBe(140);
    expect(Math.min(...result.series[0])).toBe(120);
  });
});

describe("one downsampler for the web chart and the PDF", () => {
  const n = 10_000;
  const timesS = new Float64Array(n).map((_, i) => i * 2);
  const wave = new Float64Array(n).map((_, i) => 100 + 10 * Math.sin(i / 300));
  const spiky = wave.slice();
  spiky[4321] = 150;
  spiky[777] = 20;
  const saturation = wave.map((v, i) => (i % 101 === 0 || (i >= 6000 && i < 6400) ? NaN : v + 0.5));

  const asReport = (values: Float64Array[]): SeriesResponse => ({
    startedAt: null,
    timesS: Array.from(timesS),
    channels: values.map((v, k) => ({ header: `ch${k}`, kind: "temperature" as const, unit: "°C", role: "load" as const, values: Array.from(v, (x) => (Number.isFinite(x) ? x : null)) })),
    plateau: null,
    band: { low: 134, high: 137 },
    flags: [],
    window: { from: 0, to: timesS[n - 1] },
    totalSamples: n,
    fullResolution: true,
  });

  it.each([
    ["the whole record", 600, undefined, undefined],
    ["a zoomed window", 200, 3000, 9000],
    ["a window small enough for every sample", 5000, 100, 400],
  ])("keeps the same points in both for %s", (_what, points, fromS, toS) => {
    const chart = downsampleSeries(timesS, [spiky, saturation], points, fromS, toS);
    const report = downsampleForReport(asReport([spiky, saturation]), points, fromS, toS);
    expect(report.timesS).toEqual(chart.timesS);
    expect(report.channels.map((c) => c.values)).toEqual(chart.series.map((s) => s.map((v) => (Number.isFinite(v) ? v : null))));
  });

  it("passes over a missing reading and keeps a bucket without any as a gap", () => {
    // 10 000 samples into 100 points: buckets of 200 samples. Sample 8000 opens a bucket and is
    // missing (as the saturation temperature is where the pressure is off the saturation line);
    // samples 6000–6399 are all missing.
    const gappy = saturation.slice();
    gappy[8000] = NaN;
    const chart = downsampleSeries(timesS, [gappy], 100);
    const at = (tS: number) => chart.timesS.indexOf(tS);
    for (const start of [6000, 6200]) {
      expect(chart.series[0][at(start * 2)]).toBeNaN();
      expect(chart.series[0][at(start * 2) + 1]).toBeNaN();
    }
    const readings = Array.from(gappy.slice(8000, 8200)).filter(Number.isFinite);
    const kept = chart.series[0].slice(at(8000 * 2), at(8000 * 2) + 2);
    expect([Math.min(...kept), Math.max(...kept)]).toEqual([Math.min(...readings), Math.max(...readings)]);
  });
});

import { describe, expect, it } from "vitest";
import {
  alignedData,
  chartTraces,
  displayedHeader,
  clockTimeAt,
  describeTimeChart,
  elapsedTickLabels,
  formatElapsed,
  isZoomed,
  panWindow,
  resolutionNote,
  seriesUrl,
  windowCovers,
  windowToFetch,
  fullResolutionSpan,
  zoomWindow,
} from "@/lib/cycles/chart-model";
import {
  classifySample,
  countSides,
  describePlateauPosition,
  phaseLandmarks,
  phaseRegions,
  insidePolygon,
  phaseRange,
  phaseSamples,
  phaseScales,
  plateauSamples,
  saturationCurveInRange,
  thin,
  toleranceBand,
  FULL_PHASE_RANGE,
} from "@/lib/cycles/phase-model";
import { pointsPath } from "@/lib/charts/scale";
import type { SeriesResponse } from "@/lib/cycles/contracts";
import type { AnalysisResult } from "@/lib/analysis/types";

function series(overrides: Partial<SeriesResponse> = {}): SeriesResponse {
  return {
    startedAt: "2025-03-04T08:00:00.000Z",
    timesS: [0, 1, 2, 3, 4],
    channels: [
      { header: "Pack 1 (°C)", kind: "temperature", unit: "°C", role: "load", values: [20, 100, 134.5, 134.6, 90] },
      { header: "Chamber (kPa abs)", kind: "pressure", unit: "kPa abs", role: "pressure", values: [101, 200, 310, 311, 120] },
      { header: "Drain (°C)", kind: "temperature", unit: "°C", role: "reference", values: [20, null, 134.2, 134.3, 91] },
      { header: "Tsat", kind: "saturation", unit: "°C", role: "saturation", values: [100, 120, 134.6, 134.6, 105] },
      { header: "Pack 2 (°C)", kind: "temperature", unit: "°C", role: "load", values: [20, 99, 134.4, 134.5, 89] },
    ],
    plateau: { start: 2, end: 3 },
    band: { low: 134, high: 137 },
    flags: [],
    window: { from: 0, to: 4 },
    totalSamples: 5,
    fullResolution: true,
    ...overrides,
  };
}

describe("the time axis", () => {
  it("reads seconds since the first sample as mm:ss under an hour and h:mm:ss beyond (constructed definition)", () => {
    expect(formatElapsed(0)).toBe("00:00");
    expect(formatElapsed(75)).toBe("01:15");
    expect(formatElapsed(3599.4)).toBe("59:59");
    expect(formatElapsed(3725)).toBe("1:02:05");
    expect(formatElapsed(86_399)).toBe("23:59:59");
    expect(formatElapsed(12.34, { tenths: true })).toBe("00:12.3");
    expect(formatElapsed(-5)).toBe("−00:05");
  });

  it("labels every tick in h:mm:ss once any tick passes the hour, and shows tenths only for short spans", () => {
    expect(elapsedTickLabels([3000, 3600, 4200], 1200)).toEqual(["0:50:00", "1:00:00", "1:10:00"]);
    expect(elapsedTickLabels([10, 10.5, 11], 2)).toEqual(["00:10.0", "00:10.5", "00:11.0"]);
    expect(elapsedTickLabels([0, 60, 120], 120)).toEqual(["00:00", "01:00", "02:00"]);
    // within a day-long record every label carries the hour, even when zoomed into its first hour
    expect(elapsedTickLabels([0, 60, 120], 120, true)).toEqual(["0:00:00", "0:01:00", "0:02:00"]);
  });

  it("gives the wall-clock time in the site's time zone when the record has a start time", () => {
    // 08:00 UTC on 4 March 2025 is 08:00 in London (GMT) and 09:00 in Berlin (CET): common knowledge of the zones.
    expect(clockTimeAt("2025-03-04T08:00:00.000Z", 65, "Europe/London")).toBe("08:01:05");
    expect(clockTimeAt("2025-03-04T08:00:00.000Z", 65, "Europe/Berlin")).toBe("09:01:05");
    expect(clockTimeAt(null, 65, "Europe/London")).toBeNull();
    // No zone in the file: the logger's own clock, shown unshifted.
    expect(clockTimeAt("2025-07-04T08:00:00", 3661, "Europe/Berlin")).toBe("09:01:01");
  });
});

describe("the time chart's traces", () => {
  it("puts the reference first, then the saturation temperature, the load channels in file order, and pressure last", () => {
    const traces = chartTraces(series());
    expect(traces.map((t) => t.header)).toEqual(["Drain (°C)", "Tsat", "Pack 1 (°C)", "Pack 2 (°C)", "Chamber (kPa abs)"]);
    expect(traces[0]).toMatchObject({ emphasis: true, scale: "temperature", label: "Drain (°C) (reference)" });
    expect(traces[1]).toMatchObject({ dashed: true, label: "Saturation temperature from pressure" });
    expect(traces[4]).toMatchObject({ scale: "pressure", unit: "kPa abs" });
    expect(traces.map((t) => t.loadIndex)).toEqual([null, null, 0, 1, null]);
  });

  it("says that values from a bar-gauge or °F column are plotted as kPa abs and °C", () => {
    expect(displayedHeader("Chamber (bar g)", "pressure")).toBe("Chamber (bar g), as kPa abs");
    expect(displayedHeader("Chamber (kPa abs)", "pressure")).toBe("Chamber (kPa abs)");
    expect(displayedHeader("Probe 3 (°F)", "temperature")).toBe("Probe 3 (°F), as °C");
    expect(displayedHeader("Drain (°C)", "temperature")).toBe("Drain (°C)");
  });

  it("hands uPlot the time axis and each trace's values in the traces' order, gaps kept as null", () => {
    const s = series();
    const data = alignedData(s, chartTraces(s));
    expect(data).toHaveLength(6);
    expect(data[0]).toEqual([0, 1, 2, 3, 4]);
    expect(data[1]).toEqual([20, null, 134.2, 134.3, 91]);
    expect(data[5]).toEqual([101, 200, 310, 311, 120]);
  });

  it("says whether the chart shows every sample or a downsampled view", () => {
    expect(resolutionNote(series())).toBe("Full resolution: all 5 samples of the record.");
    expect(resolutionNote(series({ totalSamples: 900 }))).toMatch(/^Full resolution: every one of the 5 samples in this window/);
    const down = resolutionNote(series({ fullResolution: false, totalSamples: 86_400 }));
    expect(down).toContain("Downsampled to 5 points of 86,400 samples");
  });
});

describe("zoom and pan", () => {
  const record = { from: 0, to: 1000 };

  it("treats the whole record as not zoomed and a narrower view as zoomed", () => {
    expect(isZoomed({ from: 0, to: 1000 }, record)).toBe(false);
    expect(isZoomed({ from: 1, to: 999 }, record)).toBe(false);
    expect(isZoomed({ from: 100, to: 400 }, record)).toBe(true);
  });

  it("asks for the view plus a quarter either side, clamped to the record", () => {
    expect(windowToFetch({ from: 400, to: 600 }, record)).toEqual({ from: 350, to: 650 });
    expect(windowToFetch({ from: 10, to: 210 }, record)).toEqual({ from: 0, to: 260 });
    expect(windowCovers({ from: 350, to: 650 }, { from: 380, to: 620 })).toBe(true);
    // a day at 1 s: 4000 points hold 4000 s at full resolution, so a 3600 s view gets a margin that fits
    const day = { from: 0, to: 86_399 };
    const span = fullResolutionSpan(86_400, day, 4000);
    expect(span).toBeCloseTo(4000, 6);
    const w = windowToFetch({ from: 30_000, to: 33_600 }, day, span);
    expect(w.to - w.from).toBeLessThanOrEqual(4000);
    expect(windowCovers(w, { from: 30_000, to: 33_600 })).toBe(true);
    expect(windowCovers({ from: 350, to: 650 }, { from: 300, to: 500 })).toBe(false);
  });

  it("zooms about the centre and pans by a fraction of the view, never leaving the record", () => {
    expect(zoomWindow({ from: 400, to: 600 }, 0.5, record)).toEqual({ from: 450, to: 550 });
    expect(zoomWindow({ from: 0, to: 1000 }, 2, record)).toEqual({ from: 0, to: 1000 });
    expect(zoomWindow({ from: 500, to: 501 }, 0.1, record, 2)).toEqual({ from: 499.5, to: 501.5 });
    expect(panWindow({ from: 400, to: 600 }, 0.5, record)).toEqual({ from: 500, to: 700 });
    expect(panWindow({ from: 900, to: 1000 }, 0.5, record)).toEqual({ from: 900, to: 1000 });
    expect(panWindow({ from: 50, to: 250 }, -0.5, record)).toEqual({ from: 0, to: 200 });
  });

  it("builds the series API's address with the window only when zoomed", () => {
    expect(seriesUrl("c1", { points: 2400 })).toBe("/api/cycles/c1/series?points=2400");
    expect(seriesUrl("c1", { points: 2400, window: { from: 10, to: 20.5 } })).toBe("/api/cycles/c1/series?from=10&to=20.5&points=2400");
  });
});

describe("the phase-diagram view", () => {
  it("places saturated steam on the line and a colder reading on the liquid side (IF97 Table 36: Tsat(0.1 MPa) = 372.755919 K)", () => {
    const onLine = classifySample(99.6, 100, 2);
    expect(onLine?.side).toBe("on-line");
    expect(onLine?.deviationK).toBeCloseTo(-0.005919, 4);
    // Air in the chamber: the thermometer reads colder than saturated steam at the total pressure.
    expect(classifySample(97.5, 100, 2)?.side).toBe("liquid-side");
    expect(classifySample(101.7, 100, 2)?.side).toBe("vapour-side");
  });

  it("finds the saturation temperature at 10 MPa as IF97 Table 36 gives it (584.149488 K)", () => {
    const c = classifySample(584.149488 - 273.15, 10_000, 2);
    expect(c?.deviationK).toBeCloseTo(0, 5);
  });

  it("declines to place a sample below the triple point or above the critical point", () => {
    expect(classifySample(20, 0.1, 2)).toBeNull();
    expect(classifySample(400, 30_000, 2)).toBeNull();
  });

  it("pairs reference temperature and chamber pressure sample by sample, skipping gaps", () => {
    const samples = phaseSamples(series());
    expect(samples.map((s) => s.timeS)).toEqual([0, 2, 3, 4]);
    expect(samples[1]).toEqual({ timeS: 2, temperatureC: 134.2, pressureKpa: 310 });
  });

  it("pairs a downsampled series by interval, since its extremes need not share an instant", () => {
    const s = series({
      fullResolution: false,
      timesS: [0, 9, 10, 19],
      channels: [
        { header: "Drain (°C)", kind: "temperature", unit: "°C", role: "reference", values: [100, 110, 120, 130] },
        { header: "Chamber (kPa abs)", kind: "pressure", unit: "kPa abs", role: "pressure", values: [100, 400, 200, 200] },
      ],
    });
    const samples = phaseSamples(s);
    expect(samples).toHaveLength(2);
    expect(samples[0].timeS).toBeCloseTo(4.5, 9);
    expect(samples[0].temperatureC).toBeCloseTo(105, 9);
    expect(samples[0].pressureKpa).toBeCloseTo(200, 9); // geometric mean, as drawn on the log axis
  });

  it("classifies only the plateau's samples and says where they sat (IF97: Tsat(310 kPa) ≈ 134.6 °C)", () => {
    const plateau = plateauSamples(phaseSamples(series()), { start: 2, end: 3 }, 2);
    expect(plateau).toHaveLength(2);
    expect(countSides(plateau)).toEqual({ "on-line": 2, "liquid-side": 0, "vapour-side": 0 });
    expect(describePlateauPosition(plateau, 2)).toMatch(/^All 2 plateau samples sit on the liquid–vapour line/);

    const airy = plateauSamples(
      [
        { timeS: 10, temperatureC: 131.0, pressureKpa: 310 },
        { timeS: 11, temperatureC: 134.5, pressureKpa: 310 },
      ],
      { start: 10, end: 11 },
      2,
    );
    expect(countSides(airy)).toEqual({ "on-line": 1, "liquid-side": 1, "vapour-side": 0 });
    expect(describePlateauPosition(airy, 2)).toContain("1 on the liquid side, colder than saturated steam");
    expect(plateauSamples(phaseSamples(series()), null, 2)).toEqual([]);
  });

  it("opens on the sterilization region, which holds the 121 °C and 134 °C lines (common practice: 2.05 bar and 3.04 bar abs)", () => {
    const range = phaseRange("sterilization", { samples: [], sterilizationTempC: 134, bandK: 3 });
    expect(range).toEqual({ tMinC: 90, tMaxC: 145, pMinKpa: 50, pMaxKpa: 450 });
    const curve = saturationCurveInRange(range);
    expect(curve.length).toBeGreaterThan(100);
    for (const pt of curve) {
      expect(pt.temperatureC).toBeGreaterThanOrEqual(90 - 1e-9);
      expect(pt.temperatureC).toBeLessThanOrEqual(145 + 1e-9);
      expect(pt.pressureKpa).toBeGreaterThanOrEqual(50 * (1 - 1e-9));
      expect(pt.pressureKpa).toBeLessThanOrEqual(450);
    }
    // 90 °C at 70.18 kPa lies inside, so the curve starts at the left edge (IF97 Table 35 region; value from memory).
    expect(curve[0].temperatureC).toBeCloseTo(90, 6);
  });

  it("fits the cycle view to the path and keeps the full view from triple point to critical point", () => {
    const range = phaseRange("cycle", {
      samples: [
        { timeS: 0, temperatureC: 20, pressureKpa: 7 },
        { timeS: 1, temperatureC: 135, pressureKpa: 310 },
      ],
      sterilizationTempC: 134,
      bandK: 3,
    });
    expect(range.tMinC).toBeLessThan(20);
    expect(range.tMaxC).toBeGreaterThanOrEqual(140);
    expect(range.pMinKpa).toBeLessThan(7);
    expect(range.pMaxKpa).toBeGreaterThan(310);
    const full = phaseLandmarks(FULL_PHASE_RANGE).map((l) => l.id);
    expect(full).toEqual(["triple", "boiling", "critical"]);
  });

  it("closes in on the plateau with the line and the ±limit band in sight (IF97: Tsat(304.2 kPa) ≈ 134.0 °C, from memory)", () => {
    const plateau = [
      { timeS: 1, temperatureC: 134.5, pressureKpa: 310 },
      { timeS: 2, temperatureC: 131.0, pressureKpa: 320 },
    ];
    const range = phaseRange("plateau", { samples: [], plateau, sterilizationTempC: 134, bandK: 3, limitK: 2 });
    expect(range.tMinC).toBeLessThan(131);
    expect(range.tMaxC).toBeGreaterThan(137);
    expect(range.pMinKpa).toBeLessThan(304.2);
    expect(range.pMaxKpa).toBeGreaterThan(320);
    expect(range.tMaxC - range.tMinC).toBeLessThan(15);
    expect(saturationCurveInRange(range).length).toBeGreaterThan(10);
    // without a plateau it falls back to the sterilization region
    expect(phaseRange("plateau", { samples: [], plateau: [], sterilizationTempC: 134, bandK: 3 })).toEqual({ tMinC: 90, tMaxC: 145, pMinKpa: 50, pMaxKpa: 450 });
  });

  it("marks the 1 atm boiling point at 99.97 °C (IF97 region 4 at 101.325 kPa; value from memory)", () => {
    const marks = phaseLandmarks({ tMinC: 90, tMaxC: 145, pMinKpa: 50, pMaxKpa: 450 });
    expect(marks).toHaveLength(1);
    expect(marks[0].id).toBe("boiling");
    expect(marks[0].temperatureC).toBeCloseTo(99.97, 2);
  });

  it("draws the ±limit band as the line shifted by the limit in temperature", () => {
    const band = toleranceBand({ tMinC: 90, tMaxC: 145, pMinKpa: 100, pMaxKpa: 450 }, 2, 10);
    expect(band.colder).toHaveLength(10);
    expect(band.colder[0][1]).toBeCloseTo(100, 9);
    expect(band.colder[0][0]).toBeCloseTo(99.605919 - 2, 4); // IF97 Table 36 at 0.1 MPa
    expect(band.hotter[0][0]).toBeCloseTo(99.605919 + 2, 4);
  });

  it("shades the liquid side above the line and the vapour side below it (IF97: Psat(100 °C) = 101.4 kPa, Psat(140 °C) = 361.5 kPa, from memory)", () => {
    const range = phaseRange("sterilization", { samples: [], sterilizationTempC: 134, bandK: 3 });
    const regions = phaseRegions(range, saturationCurveInRange(range))!;
    expect(insidePolygon(regions.liquid, 100, 300)).toBe(true);
    expect(insidePolygon(regions.vapour, 100, 300)).toBe(false);
    expect(insidePolygon(regions.vapour, 140, 200)).toBe(true);
    expect(insidePolygon(regions.liquid, 140, 200)).toBe(false);
    expect(insidePolygon(regions.liquid, 140, 400)).toBe(true);
    expect(regions.solid).toBeNull();
    expect(regions.supercritical).toBeNull();
  });

  it("bounds the full view by the triple point and the critical point (IF97 constants: 0.01 °C / 611.657 Pa, 373.946 °C / 22.064 MPa)", () => {
    const regions = phaseRegions(FULL_PHASE_RANGE, saturationCurveInRange(FULL_PHASE_RANGE, 300))!;
    expect(insidePolygon(regions.liquid, 50, 1000)).toBe(true);
    expect(insidePolygon(regions.vapour, 300, 100)).toBe(true);
    expect(insidePolygon(regions.vapour, 50, 1000)).toBe(false);
    expect(insidePolygon(regions.solid!, -10, 100)).toBe(true);
    expect(insidePolygon(regions.liquid, -10, 100)).toBe(false);
    expect(insidePolygon(regions.supercritical!, 380, 30_000)).toBe(true);
    expect(insidePolygon(regions.liquid, 380, 30_000)).toBe(false);
    expect(insidePolygon(regions.vapour, 380, 30_000)).toBe(false);
  });

  it("maps temperature linearly and pressure logarithmically, higher pressure upwards", () => {
    const { x, y } = phaseScales({ tMinC: 0, tMaxC: 100, pMinKpa: 10, pMaxKpa: 1000 }, { left: 0, top: 0, width: 200, height: 100 });
    expect(x(50)).toBeCloseTo(100, 9);
    expect(y(1000)).toBeCloseTo(0, 9);
    expect(y(100)).toBeCloseTo(50, 9);
    expect(y(10)).toBeCloseTo(100, 9);
    expect(
      pointsPath(
        [
          [0, 10],
          [50, 100],
          [Number.NaN, 1],
          [100, 1000],
          [100, 0],
        ],
        x,
        y,
      ),
    ).toBe("M0 100L100 50M200 0");
  });

  it("thins long lists evenly, keeping both ends", () => {
    const items = Array.from({ length: 101 }, (_, i) => i);
    expect(thin(items, 5)).toEqual([0, 25, 50, 75, 100]);
    expect(thin(items, 500)).toBe(items);
  });
});

describe("the chart's text summary", () => {
  const base: AnalysisResult = {
    engineVersion: "test",
    verdict: "fail",
    summary: "",
    plateau: { start: 620, end: 860 },
    plateausFound: 1,
    plateauIndex: 0,
    equilibrationTime: 8,
    holdingTime: 232,
    saturation: {
      maxDeviation: 2.6,
      lowestDeviation: -2.6,
      highestDeviation: 0.3,
      flags: [{ start: 700, end: 754, durationS: 54, kind: "below", worst: -2.6, diagnosis: "" }],
    },
    f0: {},
    checks: [],
    referenceChannel: "Drain (°C)",
    pressureChannel: "Chamber (kPa abs)",
    channels: [],
    saturationTemperatureDuringHold: { min: 134.1, max: 135.2, mean: 134.7 },
    diagnoses: [],
    limits: { sterilizationTempC: 134, holdingTimeS: 180, bandK: 3, maxEquilibrationS: 15, maxSpreadK: 2, saturationLimitK: 2, f0ReferenceC: 121.1, f0ZK: 10 },
    record: { startedAt: null, samples: 1500, durationS: 1499, medianSampleIntervalS: 1 },
  };

  it("names the plateau, the band and each flag in words", () => {
    const text = describeTimeChart(base, { sterilizationTempC: 134, bandK: 3 });
    expect(text).toContain("The plateau starts at 10:20 when Drain (°C) reaches 134 °C and ends at 14:20");
    expect(text).toContain("the sterilization band is 134 to 137 °C");
    expect(text).toContain("1 saturation flag: colder than saturation (air or non-condensable gas) from 11:40 to 12:34, worst −2.6 K.");
  });

  it("writes times with the hour throughout when the record lasts an hour or more", () => {
    const text = describeTimeChart({ ...base, record: { ...base.record, durationS: 86_399 } }, { sterilizationTempC: 134, bandK: 3 });
    expect(text).toContain("The record runs 23:59:59");
    expect(text).toContain("The plateau starts at 0:10:20");
  });

  it("says so when the reference never reached the sterilization temperature", () => {
    const text = describeTimeChart({ ...base, plateau: null, saturation: { ...base.saturation, flags: [] } }, { sterilizationTempC: 134, bandK: 3 });
    expect(text).toContain("never reached the sterilization temperature of 134 °C");
  });
});

import { describe, expect, it } from "vitest";
import { extent, linearTicks, linePath, logTicks, niceTicks, pointsPath, scaleLinear, scaleLog, timeTicks, TIME_STEPS_S } from "@/lib/charts/scale";

// One scale module for the record page's charts and the report's: constructed definition tests.
describe("scales", () => {
  it("map values linearly, and logarithmically with a decade to each equal step", () => {
    const x = scaleLinear([100, 140], [0, 400]);
    expect(x(121.1)).toBeCloseTo(211, 9);
    const y = scaleLog([10, 1000], [200, 0]);
    expect(y(100)).toBeCloseTo(100, 9);
    expect(y(1000)).toBeCloseTo(0, 9);
    expect(scaleLinear([5, 5], [0, 10])(7)).toBe(0); // an empty domain maps to the range's start, never NaN
  });

  it("finds the smallest and largest finite value over several series", () => {
    expect(
      extent([
        [3, null, 7],
        [Number.NaN, -1],
      ]),
    ).toEqual([-1, 7]);
    expect(extent([[null], []])).toBeNull();
  });
});

describe("ticks", () => {
  it("chooses round temperature ticks covering the data", () => {
    const t = niceTicks(21.3, 137.2, 7);
    expect(t.ticks).toEqual([20, 40, 60, 80, 100, 120, 140]);
    expect([t.min, t.max, t.step]).toEqual([20, 140, 20]);
    expect(niceTicks(134, 134, 4).ticks).toEqual([133, 133.5, 134, 134.5, 135]); // a flat line still gets an axis
  });

  it("picks readable ticks inside a fixed range", () => {
    expect(linearTicks(90, 145, 8)).toEqual([90, 100, 110, 120, 130, 140]);
    expect(linearTicks(90, 145, 12)).toEqual([90, 95, 100, 105, 110, 115, 120, 125, 130, 135, 140, 145]);
    const ticks = logTicks(50, 450);
    expect(ticks.map((t) => t.value)).toEqual([50, 60, 80, 100, 150, 200, 300, 400]);
    expect(ticks.filter((t) => t.major).map((t) => t.value)).toEqual([100]);
    expect(
      logTicks(0.3, 50_000)
        .filter((t) => t.major)
        .map((t) => t.value),
    ).toEqual([1, 10, 100, 1000, 10_000]);
    expect(logTicks(290, 330).map((t) => t.value)).toEqual([290, 295, 300, 305, 310, 315, 320, 325, 330]);
    expect(logTicks(270, 390).map((t) => t.value)).toEqual([280, 300, 320, 340, 360, 380]);
  });

  it("ticks a 21-minute record every 5 minutes and a day every 4 hours", () => {
    expect(timeTicks(0, 1300, 5)).toEqual({ ticks: [0, 300, 600, 900, 1200], stepS: 300 });
    expect(timeTicks(0, 86_399, 7).stepS).toBe(14_400);
    expect(timeTicks(0, 12, 8).stepS).toBe(5); // the report labels whole seconds
    expect(timeTicks(0, 12, 8, 0).stepS).toBe(2);
    expect(TIME_STEPS_S).toContain(0.1); // the record page zooms to tenths of a second
  });
});

describe("paths", () => {
  it("breaks a line where a reading is missing", () => {
    expect(
      linePath(
        [0, 1, 2, 3, 4],
        [1, 2, null, 4, 5],
        (v) => v * 10,
        (v) => v,
      ),
    ).toBe("M0 1L10 2M30 4L40 5");
  });

  it("drops a point that lands on the one before and rounds to hundredths of a pixel", () => {
    expect(
      linePath(
        [0, 0.0001, 1],
        [1, 1, 2.345678],
        (v) => v * 10,
        (v) => v,
      ),
    ).toBe("M0 1L10 2.35");
  });

  it("breaks a path through data points at a gap or a point the scale cannot place, and can close it", () => {
    const y = scaleLog([10, 1000], [100, 0]);
    const x = (t: number) => t * 2;
    expect(pointsPath([[0, 10], [50, 100], null, [100, 1000], [100, 0], [110, 1000]], x, y)).toBe("M0 100L100 50M200 0M220 0");
    expect(
      pointsPath(
        [
          [0, 10],
          [50, 100],
          [100, 1000],
        ],
        x,
        y,
        { close: true },
      ),
    ).toBe("M0 100L100 50L200 0Z");
    expect(pointsPath([], x, y, { close: true })).toBe("");
  });
});

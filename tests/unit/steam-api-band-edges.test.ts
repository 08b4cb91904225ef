import { describe, expect, it } from "vitest";
import { bandEdgePressures } from "@/components/steam/band-edges";

describe("pressures at the edges of the usual sterilization bands", () => {
  it("match DOMAIN §1.4 at the standard atmosphere (IF97 computed)", () => {
    const rows = bandEdgePressures(101.325);
    expect(rows.map((r) => r.temperatureC)).toEqual([121, 124, 126, 129, 134, 137]);
    // [kPa abs, kPa gauge, bar abs, psig] from DOMAIN.md §1.4 (IF97 computed).
    const expected = [
      [205.04, 103.71, 2.0504, 15.04],
      [225.17, 123.84, 2.2517, 17.96],
      [239.46, 138.14, 2.3946, 20.04],
      [262.27, 160.95, 2.6227, 23.34],
      [304.2, 202.87, 3.042, 29.42],
      [331.85, 230.53, 3.3185, 33.44],
    ];
    rows.forEach((row, i) => {
      const [kpaAbs, kpaGauge, barAbs, psig] = expected[i];
      expect(row.kpaAbs).toBeCloseTo(kpaAbs, 1);
      expect(row.kpaGauge).toBeCloseTo(kpaGauge, 1);
      expect(row.barAbs).toBeCloseTo(barAbs, 3);
      expect(row.psig).toBeCloseTo(psig, 1);
    });
  });

  it("126 °C is 239.4597 kPa abs (ASHRAE Handbook—Fundamentals 2021 ch. 1 Table 3)", () => {
    expect(bandEdgePressures(101.325)[2].kpaAbs).toBeCloseTo(239.4597, 3);
  });

  it("a lower site atmosphere raises the gauge reading by the difference, absolute unchanged", () => {
    const sea = bandEdgePressures(101.325);
    const hill = bandEdgePressures(90);
    hill.forEach((row, i) => {
      expect(row.kpaAbs).toBe(sea[i].kpaAbs);
      expect(row.kpaGauge - sea[i].kpaGauge).toBeCloseTo(11.325, 9);
    });
  });
});

// The heat map's colour scales (issue 14 §3): bands around the study's minimum F0 and within the sterilization band,
// below-criterion cells unmistakable without colour, every text colour readable (WCAG 2.1 AA, 4.5:1 for normal text).
import { describe, expect, it } from "vitest";
import {
  HEAT_MARKER_SYMBOLS,
  NO_READING_BAND,
  contrastRatio,
  f0Band,
  f0Bands,
  hatchStroke,
  heatValueText,
  relativeLuminance,
  temperatureBand,
  temperatureBands,
  textColourOn,
} from "@/lib/charts/heat-map";

const SCALE_121 = { sterilizationTempC: 121, bandK: 3 };

describe("contrast", () => {
  it("follows the WCAG 2.1 formula: black on white 21:1, #767676 on white 4.54:1", () => {
    // 21:1 by definition (luminance 1 and 0); #767676 is the lightest grey that passes AA on white [memory: WebAIM]
    expect(relativeLuminance("#ffffff")).toBeCloseTo(1, 12);
    expect(relativeLuminance("#000000")).toBe(0);
    expect(contrastRatio("#000000", "#ffffff")).toBeCloseTo(21, 10);
    expect(contrastRatio("#ffffff", "#767676")).toBeCloseTo(4.54, 2);
  });

  it("picks the text colour that reads better: dark on a light fill, white on a dark one", () => {
    expect(textColourOn("#ffffff")).toBe("#111111");
    expect(textColourOn("#000000")).toBe("#ffffff");
  });

  it("every band of both scales, and the no-reading cell, keeps at least 4.5:1 between text and fill", () => {
    const bands = [...f0Bands(15), ...temperatureBands(SCALE_121), NO_READING_BAND];
    for (const band of bands) expect(contrastRatio(band.fill, band.text), band.id).toBeGreaterThanOrEqual(4.5);
  });
});

describe("the F0 scale", () => {
  // minimum 15 min: edges at 15, 30, 75 and 150 min (1, 2, 5, 10 × the minimum) [worked by hand]
  it.each([
    [0, "below"],
    [14.99, "below"],
    [15, "x1"],
    [29.99, "x1"],
    [30, "x2"],
    [74.9, "x2"],
    [75, "x5"],
    [150, "x10"],
    [900, "x10"],
  ])("F0 %f min against a 15 min minimum is band %s", (f0, id) => {
    expect(f0Band(f0, 15).id).toBe(id);
  });

  it("below the minimum is its own hue with a symbol, not told apart by colour alone", () => {
    const below = f0Band(10, 15);
    const at = f0Band(15, 15);
    expect(below.marker).toBe("below");
    expect(HEAT_MARKER_SYMBOLS[below.marker!]).toBe("▼");
    expect(at.marker).toBeNull();
    expect(below.fill).not.toBe(at.fill);
    expect(below.label).toBe("below the minimum F0 (under 15 min)");
    expect(
      f0Bands(15)
        .filter((b) => b.marker !== null)
        .map((b) => b.id),
    ).toEqual(["below"]);
  });

  it("the ramp above the minimum darkens with lethality, so the eye reads more as darker", () => {
    const luminances = f0Bands(15)
      .slice(1)
      .map((b) => relativeLuminance(b.fill));
    expect([...luminances].sort((a, b) => b - a)).toEqual(luminances);
  });

  it("no reading is its own grey cell", () => {
    expect(f0Band(null, 15)).toBe(NO_READING_BAND);
    expect(f0Band(Number.NaN, 15)).toBe(NO_READING_BAND);
  });
});

describe("the minimum-temperature scale", () => {
  // Ts 121 °C, band 3 K (DOMAIN.md §2.2): thirds at 122 and 123 °C, top 124 °C [worked by hand]
  it.each([
    [120.9, "below"],
    [121, "low"],
    [121.99, "low"],
    [122, "mid"],
    [123, "high"],
    [124, "high"],
    [124.1, "above"],
  ])("%f °C with Ts 121 °C and a 3 K band is band %s", (t, id) => {
    expect(temperatureBand(t, SCALE_121).id).toBe(id);
  });

  it("below Ts and above the band's top are marked with different symbols", () => {
    expect(temperatureBand(120, SCALE_121).marker).toBe("below");
    expect(temperatureBand(125, SCALE_121).marker).toBe("above");
    expect(temperatureBand(122.5, SCALE_121).marker).toBeNull();
    expect(temperatureBands(SCALE_121).map((b) => b.label)).toEqual([
      "below Ts (under 121 °C)",
      "121 °C to under 122 °C",
      "122 °C to under 123 °C",
      "123 °C to 124 °C",
      "above the band's top (over 124 °C)",
    ]);
  });
});

describe("the printed value", () => {
  it("keeps two decimals of F0 below 100 min, so a value just under the minimum never prints as the minimum", () => {
    expect(heatValueText(14.96, "f0")).toBe("14.96");
    expect(heatValueText(152.34, "f0")).toBe("152.3");
    expect(heatValueText(121.104, "minTemp")).toBe("121.10");
    expect(heatValueText(null, "f0")).toBe("—");
  });
});

describe("the hatch", () => {
  it("is drawn in the colour opposite the text, so it never lowers the text's contrast", () => {
    const below = f0Band(1, 15);
    const above = temperatureBand(130, SCALE_121);
    expect([below.text, hatchStroke(below)]).toEqual(["#111111", "#ffffff"]);
    expect([above.text, hatchStroke(above)]).toEqual(["#ffffff", "#000000"]);
  });
});

import { describe, expect, it } from "vitest";
import {
  STANDARD_ATMOSPHERE_KPA,
  SteamRangeError,
  ATMOSPHERE_RANGE_KPA,
  atmosphereAtAltitudeKpa,
  atmosphereOutOfRange,
  convertPressure,
  convertTemperature,
  fromAbsoluteKpa,
  parsePressureLabel,
  parsePressureUnit,
  parseTemperatureUnit,
  saturationLine,
  saturationPressureKpa,
  saturationTemperatureC,
  toAbsoluteKpa,
} from "@/lib/steam";

describe("temperature units", () => {
  it("converts between °C, °F and K", () => {
    // Definitions: T[K] = t[°C] + 273.15; t[°F] = 1.8·t[°C] + 32 (common practice)
    expect(convertTemperature(121.1, "C", "F")).toBeCloseTo(249.98, 10);
    expect(convertTemperature(250, "F", "C")).toBeCloseTo(121.1111111111, 9);
    expect(convertTemperature(134, "C", "K")).toBeCloseTo(407.15, 10);
    expect(convertTemperature(407.15, "K", "F")).toBeCloseTo(273.2, 10);
    expect(convertTemperature(-40, "C", "F")).toBe(-40);
  });

  it("refuses temperatures below absolute zero", () => {
    expect(() => convertTemperature(-300, "C", "K")).toThrow(SteamRangeError);
  });

  it.each([
    ["°C", "C"],
    ["degC", "C"],
    ["deg C", "C"],
    ["C", "C"],
    ["celsius", "C"],
    ["℃", "C"],
    ["ºC", "C"],
    ["°F", "F"],
    ["degF", "F"],
    ["Fahrenheit", "F"],
    ["K", "K"],
    ["kelvin", "K"],
  ])("reads %s as %s", (spelling, unit) => {
    expect(parseTemperatureUnit(spelling)).toBe(unit);
  });

  it("says null for what is not a temperature unit", () => {
    expect(parseTemperatureUnit("kPa")).toBeNull();
    expect(parseTemperatureUnit("")).toBeNull();
  });
});

describe("pressure units", () => {
  // DOMAIN.md §4: 1 bar = 100 kPa, 1 mbar = 0.1 kPa (exact); 1 psi = 6.894757293168 kPa (exact from
  // the pound and the inch); 1 mmHg = 0.133322387415 kPa; 1 inHg = 3.38638864 kPa [computed];
  // standard atmosphere = 760 mmHg = 29.921 inHg = 14.696 psi [memory].
  it("converts the standard atmosphere into every unit", () => {
    expect(convertPressure(101.325, "kPa", "Pa")).toBeCloseTo(101325, 6);
    expect(convertPressure(101.325, "kPa", "MPa")).toBeCloseTo(0.101325, 12);
    expect(convertPressure(101.325, "kPa", "bar")).toBeCloseTo(1.01325, 12);
    expect(convertPressure(101.325, "kPa", "mbar")).toBeCloseTo(1013.25, 9);
    expect(convertPressure(101.325, "kPa", "psi")).toBeCloseTo(14.696, 3);
    expect(convertPressure(101.325, "kPa", "mmHg")).toBeCloseTo(760, 3);
    expect(convertPressure(101.325, "kPa", "inHg")).toBeCloseTo(29.921, 3);
    expect(convertPressure(1, "psi", "Pa")).toBeCloseTo(6894.757293168, 6);
  });

  it("makes gauge readings absolute with the given atmosphere", () => {
    // −0.75 bar g at sea level is 0.263 bar abs [DOMAIN.md §4]
    expect(toAbsoluteKpa(-0.75, "bar", { gauge: true })).toBeCloseTo(26.325, 9);
    expect(toAbsoluteKpa(2.0287, "bar", { gauge: true })).toBeCloseTo(304.195, 3);
    expect(toAbsoluteKpa(29.42, "psi", { gauge: true })).toBeCloseTo(304.2, 1); // 134 °C ≈ 29.42 psig [computed, §1.4]
    expect(toAbsoluteKpa(100, "kPa", { gauge: true, atmosphereKpa: 89.875 })).toBeCloseTo(189.875, 9);
    expect(toAbsoluteKpa(3.042, "bar", { gauge: false })).toBeCloseTo(304.2, 9);
    expect(fromAbsoluteKpa(304.2, "kPa", { gauge: true })).toBeCloseTo(202.875, 9);
    expect(fromAbsoluteKpa(205.04, "psi", { gauge: true })).toBeCloseTo(15.04, 2); // 121 °C ≈ 15.04 psig [computed, §1.4]
  });

  it("refuses a gauge reading below vacuum", () => {
    expect(() => toAbsoluteKpa(-2, "bar", { gauge: true })).toThrow(/cannot be negative/);
  });

  it.each([
    ["kPa", "kPa", null],
    ["kPa abs", "kPa", false],
    ["kPa(a)", "kPa", false],
    ["kPa g", "kPa", true],
    ["kPa gauge", "kPa", true],
    ["bar", "bar", null],
    ["bara", "bar", false],
    ["bar(a)", "bar", false],
    ["barg", "bar", true],
    ["bar g", "bar", true],
    ["mbar", "mbar", null],
    ["mbar abs", "mbar", false],
    ["mbar(g)", "mbar", true],
    ["hPa", "mbar", null],
    ["MPa", "MPa", null],
    ["MPa a", "MPa", false],
    ["Pa", "Pa", null],
    ["psi", "psi", null],
    ["psia", "psi", false],
    ["psig", "psi", true],
    ["mmHg", "mmHg", null],
    ["Torr", "mmHg", null],
    ["inHg", "inHg", null],
  ])("reads %s as %s (gauge %s)", (spelling, unit, gauge) => {
    expect(parsePressureLabel(spelling)).toEqual({ unit, gauge });
    expect(parsePressureUnit(spelling)).toBe(unit);
  });

  it("says null for what is not a pressure unit", () => {
    expect(parsePressureUnit("°C")).toBeNull();
    expect(parsePressureUnit("g")).toBeNull();
  });
});

describe("atmosphere at altitude", () => {
  // ASHRAE Handbook—Fundamentals 2021 ch. 1 Table 1 [found, DOMAIN.md §4]
  it.each([
    [0, 101.325],
    [500, 95.461],
    [1000, 89.875],
    [1500, 84.556],
    [2000, 79.495],
    [3000, 70.108],
  ])("%d m: %f kPa", (altitudeM, kpa) => {
    expect(atmosphereAtAltitudeKpa(altitudeM)).toBeCloseTo(kpa, 2);
  });

  it("puts the boiling point at 1000 m near 96.65 °C", () => {
    // [computed, DOMAIN.md §4]
    expect(saturationTemperatureC(atmosphereAtAltitudeKpa(1000))).toBeCloseTo(96.65, 1);
  });

  it("refuses altitudes outside the standard atmosphere's range", () => {
    expect(() => atmosphereAtAltitudeKpa(20000)).toThrow(SteamRangeError);
  });

  it("uses 101.325 kPa as the standard atmosphere", () => {
    expect(STANDARD_ATMOSPHERE_KPA).toBe(101.325);
  });
});

describe("the physical range of an atmospheric pressure (issue 9 rule 11)", () => {
  // 50 kPa: the standard atmosphere near 5500 m; 110 kPa: above any weather at sea level (common practice).
  it("accepts 50 to 110 kPa, edges included, and the standard atmosphere", () => {
    expect(ATMOSPHERE_RANGE_KPA).toEqual({ min: 50, max: 110 });
    for (const kpa of [50, 84.556, STANDARD_ATMOSPHERE_KPA, 110]) expect(atmosphereOutOfRange(kpa)).toBeNull();
  });

  it("refuses what lies outside, or is not a number, naming the range", () => {
    for (const kpa of [10, 49.99, 110.01, Number.NaN]) expect(atmosphereOutOfRange(kpa)).toMatch(/outside the physical range of 50–110 kPa/);
  });
});

describe("saturation line for the phase diagram", () => {
  it("runs from the triple point to the critical point, evenly in log pressure", () => {
    const line = saturationLine(50);
    expect(line.temperatureC).toHaveLength(50);
    expect(line.temperatureC[0]).toBe(0.01);
    expect(line.temperatureC[49]).toBe(373.946);
    const ratios = line.pressureKpa.slice(1).map((p, i) => p / line.pressureKpa[i]);
    for (const r of ratios) expect(r).toBeCloseTo(ratios[0], 6);
    line.temperatureC.forEach((t, i) => expect(saturationPressureKpa(t)).toBeCloseTo(line.pressureKpa[i], 6));
  });

  it("covers a chosen range", () => {
    const line = saturationLine(5, 100, 140);
    expect(line.temperatureC[0]).toBe(100);
    expect(line.temperatureC[4]).toBe(140);
    expect(line.pressureKpa[4]).toBeCloseTo(361.501, 3);
  });

  it("refuses too few points", () => {
    expect(() => saturationLine(1)).toThrow(SteamRangeError);
  });
});

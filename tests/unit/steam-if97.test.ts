import { describe, expect, it } from "vitest";
// psychrolib: ASHRAE's psychrometric library (npm), an independent formulation of water's saturation pressure.
import psychrolib from "psychrolib";
import {
  CRITICAL_POINT,
  SteamRangeError,
  TRIPLE_POINT,
  latentHeat,
  region1,
  region2,
  saturatedLiquidEnthalpy,
  saturatedVapourEnthalpy,
  saturatedVapourVolume,
  saturationPressureKpa,
  saturationTemperatureC,
} from "@/lib/steam";

const K = 273.15;
const relative = (actual: number, expected: number) => Math.abs(actual - expected) / Math.abs(expected);

describe("IF97 region 4, saturation pressure (Eq. 30)", () => {
  // IAPWS R7-97(2012), Table 35 [found, DOMAIN.md §1.1]
  it.each([
    [300, 0.353658941e-2],
    [500, 0.263889776e1],
    [600, 0.123443146e2],
  ])("p_s(%d K) = %f MPa to 1e-8 relative", (temperatureK, pressureMpa) => {
    expect(relative(saturationPressureKpa(temperatureK - K) / 1000, pressureMpa)).toBeLessThan(1e-8);
  });
});

describe("IF97 region 4, saturation temperature (Eq. 31)", () => {
  // IAPWS R7-97(2012), Table 36 [found, DOMAIN.md §1.1]
  it.each([
    [0.1, 0.372755919e3],
    [1, 0.453035632e3],
    [10, 0.584149488e3],
  ])("T_s(%f MPa) = %f K to 1e-6 K", (pressureMpa, temperatureK) => {
    expect(Math.abs(saturationTemperatureC(pressureMpa * 1000) + K - temperatureK)).toBeLessThan(1e-6);
  });

  it("water boils at 99.97 °C under the standard atmosphere of 101.325 kPa", () => {
    // 99.974 °C [computed, DOMAIN.md §1.4]; 99.97 °C is the usual textbook figure [memory]
    expect(saturationTemperatureC(101.325)).toBeCloseTo(99.974, 3);
  });

  it.each([
    [200, 120.21],
    [300, 133.53],
  ])("T_s(%d kPa) = %f °C", (kpa, celsius) => {
    // [computed, DOMAIN.md §1.4]
    expect(saturationTemperatureC(kpa)).toBeCloseTo(celsius, 2);
  });

  it("Eq. 30 and Eq. 31 invert each other along the whole line", () => {
    for (let t = 1; t < 373; t += 3.7) {
      expect(Math.abs(saturationTemperatureC(saturationPressureKpa(t)) - t)).toBeLessThan(1e-5);
    }
  });
});

describe("the ends of the liquid–vapour line", () => {
  it("reaches the triple point and the critical point", () => {
    // p_s(273.16 K) = 611.6570 Pa and p_s(647.096 K) = 22.06400 MPa [computed, DOMAIN.md §1.1]
    expect(saturationPressureKpa(TRIPLE_POINT.temperatureC)).toBeCloseTo(0.611657, 6);
    expect(saturationPressureKpa(CRITICAL_POINT.temperatureC)).toBeCloseTo(22064, 1);
    expect(saturationTemperatureC(TRIPLE_POINT.pressureKpa)).toBeCloseTo(0.01, 4);
    expect(saturationTemperatureC(CRITICAL_POINT.pressureKpa)).toBeCloseTo(373.946, 3);
  });

  it("refuses pressures below the triple point with a plain message, not NaN", () => {
    expect(() => saturationTemperatureC(0.32)).toThrow(SteamRangeError);
    expect(() => saturationTemperatureC(0.32)).toThrow("0.32 kPa abs is below the triple point (0.611657 kPa): water has no liquid–vapour line there");
    expect(() => saturationTemperatureC(-5)).toThrow(/below the triple point/);
  });

  it("refuses states above the critical point", () => {
    expect(() => saturationTemperatureC(30000)).toThrow(/above the critical point \(22064 kPa\)/);
    expect(() => saturationPressureKpa(400)).toThrow(/400 °C is above the critical point \(373\.946 °C\)/);
    expect(() => saturationPressureKpa(-10)).toThrow(/below the triple point \(0\.01 °C\)/);
  });

  it("refuses NaN and infinities", () => {
    for (const bad of [NaN, Infinity, -Infinity]) {
      expect(() => saturationTemperatureC(bad)).toThrow(SteamRangeError);
      expect(() => saturationPressureKpa(bad)).toThrow(SteamRangeError);
    }
  });
});

describe("IF97 regions 1 and 2", () => {
  // IAPWS R7-97(2012), Table 5 [found, DOMAIN.md §1.2]
  it.each([
    [300, 3, 0.100215168e-2, 0.115331273e3],
    [300, 80, 0.971180894e-3, 0.184142828e3],
    [500, 3, 0.1202418e-2, 0.975542239e3],
  ])("region 1 at %d K, %d MPa: v and h", (temperatureK, pressureMpa, volume, enthalpy) => {
    const state = region1(temperatureK, pressureMpa);
    expect(relative(state.specificVolumeM3PerKg, volume)).toBeLessThan(1e-8);
    expect(relative(state.enthalpyKjPerKg, enthalpy)).toBeLessThan(1e-8);
  });

  // IAPWS R7-97(2012), Table 15 [found, DOMAIN.md §1.2]
  it.each([
    [300, 0.0035, 0.394913866e2, 0.254991145e4],
    [700, 0.0035, 0.923015898e2, 0.333568375e4],
    [700, 30, 0.542946619e-2, 0.263149474e4],
  ])("region 2 at %d K, %f MPa: v and h", (temperatureK, pressureMpa, volume, enthalpy) => {
    const state = region2(temperatureK, pressureMpa);
    expect(relative(state.specificVolumeM3PerKg, volume)).toBeLessThan(1e-8);
    expect(relative(state.enthalpyKjPerKg, enthalpy)).toBeLessThan(1e-8);
  });
});

describe("saturated water and steam, 100 to 140 °C", () => {
  // ASHRAE Handbook—Fundamentals 2021 (SI), ch. 1, Table 3 [found, DOMAIN.md §1.3]. The table prints
  // two decimals of enthalpy and four significant figures of volume, hence the tolerances.
  it.each([
    [100, 101.418, 419.1, 2675.57, 2256.47, 1.6719],
    [115, 169.177, 482.55, 2698.58, 2216.03, 1.0359],
    [120, 198.6654, 503.78, 2705.93, 2202.15, 0.8913],
    [126, 239.4597, 529.32, 2714.52, 2185.19, 0.7483],
    [134, 304.1989, 563.49, 2725.53, 2162.04, 0.5979],
    [140, 361.501, 589.2, 2733.44, 2144.24, 0.5085],
  ])("%d °C", (celsius, pressureKpa, liquid, vapour, latent, vapourVolume) => {
    expect(saturationPressureKpa(celsius)).toBeCloseTo(pressureKpa, 3);
    expect(Math.abs(saturatedLiquidEnthalpy(celsius) - liquid)).toBeLessThan(0.006);
    expect(Math.abs(saturatedVapourEnthalpy(celsius) - vapour)).toBeLessThan(0.006);
    expect(Math.abs(latentHeat(celsius) - latent)).toBeLessThan(0.011);
    expect(Math.abs(saturatedVapourVolume(celsius) - vapourVolume)).toBeLessThan(0.00006);
  });

  it("matches the XSteam values at 100 °C quoted by a public test suite", () => {
    // h′ = 419.099155, h″ = 2675.572029 kJ/kg [found, DOMAIN.md §1.3]
    expect(saturatedLiquidEnthalpy(100)).toBeCloseTo(419.099155, 5);
    expect(saturatedVapourEnthalpy(100)).toBeCloseTo(2675.572029, 5);
  });

  it("refuses saturated enthalpies where region 3 would be needed", () => {
    expect(() => saturatedLiquidEnthalpy(360)).toThrow(/region 3/);
  });
});

describe("cross-check against psychrolib (npm), an independent ASHRAE formulation", () => {
  // psychrolib's GetSatVapPres implements ASHRAE Handbook—Fundamentals 2017 ch. 1 Eq. 6 (the
  // Hyland–Wexler fit, valid to 200 °C). The library states no accuracy figure; the fit predates
  // IF97 and is commonly quoted as agreeing with the IAPWS formulations to a few parts in 10⁴
  // [memory]. So the bound here is 3e-4 relative, far tighter than any error that would matter
  // for a 2 K saturation check (2 K is about 6 % in pressure at 134 °C).
  psychrolib.SetUnitSystem(psychrolib.SI);
  it.each([0.01, 10, 25, 50, 75, 100, 110, 121, 121.1, 126, 134, 137, 150, 175, 200])("at %f °C", (celsius) => {
    const ashraeKpa = psychrolib.GetSatVapPres(celsius) / 1000;
    expect(relative(saturationPressureKpa(celsius), ashraeKpa)).toBeLessThan(3e-4);
  });
});

import { describe, expect, it } from "vitest";
import {
  AIR_LEAKAGE,
  calibrationState,
  evaluateAirLeakage,
  evaluateBowieDick,
  evaluateDryness,
  evaluateNonCondensableGas,
  evaluateSuperheat,
  latestCertificate,
  scheduleStatus,
  sizeClassOf,
  trendsFromAnalyses,
  type AnalysedCycle,
} from "@/lib/periodic-tests";
import type { AnalysisResult } from "@/lib/analysis/types";

describe("air leakage test: (p3 − p2) / 10 min against 0.13 kPa/min", () => {
  it("uses the limit of EN 285 / HTM 2010 [found: DOMAIN §2.5]: 0.13 kPa/min = 1.3 mbar/min", () => {
    expect(AIR_LEAKAGE.maxLeakRateKpaPerMin).toBe(0.13);
    const r = evaluateAirLeakage({ p1: 40, p2: 45, p3: 50, unit: "mbar" });
    expect(r.limitPerMinInUnit).toBeCloseTo(1.3, 9);
  });

  it("states the limit as 0.975 mmHg/min and 0.0189 psi/min [computed: DOMAIN §2.5 unit equivalents]", () => {
    expect(evaluateAirLeakage({ p1: 30, p2: 34, p3: 36, unit: "mmHg" }).limitPerMinInUnit).toBeCloseTo(0.975, 3);
    expect(evaluateAirLeakage({ p1: 0.6, p2: 0.65, p3: 0.66, unit: "psi" }).limitPerMinInUnit).toBeCloseTo(0.0189, 4);
  });

  it("passes a chamber that rises 1.3 kPa over the 10 min exactly at the limit, in kPa and in mbar", () => {
    const kpa = evaluateAirLeakage({ p1: 4.0, p2: 5.0, p3: 6.3, unit: "kPa" });
    expect(kpa.leakRateKpaPerMin).toBeCloseTo(0.13, 12);
    expect(kpa.passed).toBe(true);
    // 13 mbar over 10 min: 63 × 0.1 kPa is 6.300000000000001 in floating point; it is still the limit.
    const mbar = evaluateAirLeakage({ p1: 40, p2: 50, p3: 63, unit: "mbar" });
    expect(mbar.leakRatePerMinInUnit).toBeCloseTo(1.3, 9);
    expect(mbar.passed).toBe(true);
  });

  it("fails a rise of 1.4 kPa over the 10 min (0.14 kPa/min)", () => {
    const r = evaluateAirLeakage({ p1: 4.0, p2: 5.0, p3: 6.4, unit: "kPa" });
    expect(r.leakRateKpaPerMin).toBeCloseTo(0.14, 12);
    expect(r.passed).toBe(false);
  });

  it("warns of condensate when p2 − p1 exceeds 2 kPa in the 5 min wait [memory: DOMAIN §2.5, to verify]", () => {
    const wet = evaluateAirLeakage({ p1: 4.0, p2: 6.5, p3: 7.0, unit: "kPa" });
    expect(wet.stabilisationRiseKpa).toBeCloseTo(2.5, 12);
    expect(wet.condensateSuspected).toBe(true);
    expect(wet.warnings.join(" ")).toMatch(/condensate/);
    const dry = evaluateAirLeakage({ p1: 4.0, p2: 5.9, p3: 6.5, unit: "kPa" });
    expect(dry.condensateSuspected).toBe(false);
  });

  it("converts bar readings: 0.013 bar over the 10 min is the limit [found: a manual quoted in DOMAIN §2.5], and asks for absolute values when p1 is high", () => {
    const r = evaluateAirLeakage({ p1: 0.035, p2: 0.04, p3: 0.053, unit: "bar" });
    expect(r.passed).toBe(true);
    expect(r.leakRateKpaPerMin).toBeCloseTo(0.13, 9);
    expect(r.p1Kpa).toBeCloseTo(3.5, 12);
    const gaugeByMistake = evaluateAirLeakage({ p1: 20, p2: 21, p3: 21.5, unit: "kPa" });
    expect(gaugeByMistake.warnings.join(" ")).toMatch(/absolute/);
    expect(() => evaluateAirLeakage({ p1: -80, p2: -79, p3: -78, unit: "kPa" })).toThrow(/absolute/);
  });
});

describe("steam quality: non-condensable gases, 100·Vg/Vc ≤ 3.5 % [found: EN 285 / HTM 2010, DOMAIN §2.8]", () => {
  it("passes 3.5 ml of gas per 100 ml of condensate and fails 4.0 ml", () => {
    expect(evaluateNonCondensableGas({ gasVolumeMl: 3.5, condensateVolumeMl: 100 })).toMatchObject({ passed: true, limitPercent: 3.5 });
    expect(evaluateNonCondensableGas({ gasVolumeMl: 7, condensateVolumeMl: 200 }).percent).toBeCloseTo(3.5, 12);
    const r = evaluateNonCondensableGas({ gasVolumeMl: 4, condensateVolumeMl: 100 });
    expect(r.percent).toBeCloseTo(4, 12);
    expect(r.passed).toBe(false);
  });
  it("refuses a zero condensate volume with a plain message", () => {
    expect(() => evaluateNonCondensableGas({ gasVolumeMl: 1, condensateVolumeMl: 0 })).toThrow(/condensate volume/);
  });
});

describe("steam quality: superheat = T_expansion − T_boil(p_atm) ≤ 25 K", () => {
  it("at sea level water boils at 99.97 °C, so the limit is reached at 124.97 °C [computed IF97: DOMAIN §4 altitude table]", () => {
    const r = evaluateSuperheat({ expansionTempC: 120, atmosphere: { kind: "pressure", atmosphereKpa: 101.325 } });
    expect(r.boilingPointC).toBeCloseTo(99.974, 2);
    expect(r.limitTemperatureC).toBeCloseTo(124.97, 2);
    expect(r.superheatK).toBeCloseTo(20.03, 2);
    expect(r.passed).toBe(true);
    expect(evaluateSuperheat({ expansionTempC: 126, atmosphere: { kind: "pressure", atmosphereKpa: 101.325 } }).passed).toBe(false);
  });
  it("at 1000 m the standard atmosphere is 89.875 kPa [found: ASHRAE 2021 ch.1 Table 1] and water boils at 96.65 °C [computed IF97]", () => {
    const r = evaluateSuperheat({ expansionTempC: 122, atmosphere: { kind: "altitude", altitudeM: 1000 } });
    expect(r.atmosphereKpa).toBeCloseTo(89.875, 2);
    expect(r.boilingPointC).toBeCloseTo(96.65, 2);
    expect(r.limitTemperatureC).toBeCloseTo(121.65, 2);
    // 122 °C passes at sea level but is 25.35 K of superheat at 1000 m.
    expect(r.passed).toBe(false);
  });
  it("at 2000 m the limit is reached at 118.32 °C [computed IF97: DOMAIN §4]", () => {
    expect(evaluateSuperheat({ expansionTempC: 110, atmosphere: { kind: "altitude", altitudeM: 2000 } }).limitTemperatureC).toBeCloseTo(118.32, 2);
  });
});

describe("steam quality: dryness value by the calorimetric formula (DOMAIN §2.8)", () => {
  const worked = { initialWaterTempC: 20, finalWaterTempC: 80, waterMassKg: 0.65, steamTempC: 134, load: "metal" as const };

  it("takes h_s = 563.49 and L = 2162.04 kJ/kg at 134 °C from IF97 [found: ASHRAE 2021 ch.1 Table 3]", () => {
    const r = evaluateDryness({ ...worked, condensateMassKg: 0.075 });
    expect(r.liquidEnthalpyKjPerKg).toBeCloseTo(563.49, 1);
    expect(r.latentHeatKjPerKg).toBeCloseTo(2162.04, 1);
  });

  it("DOMAIN §2.8 worked check: m_c = 0.075 kg → D = 0.988 [computed], a pass for metal loads (≥ 0.95)", () => {
    const r = evaluateDryness({ ...worked, condensateMassKg: 0.075 });
    expect(r.dryness).toBeCloseTo(0.988, 3);
    expect(r).toMatchObject({ limit: 0.95, passed: true, aboveOne: false });
  });

  it("DOMAIN §2.8 worked check: m_c = 0.080 kg → D = 0.920 [computed]: fails for metal (≥ 0.95), passes for other loads (≥ 0.90)", () => {
    expect(evaluateDryness({ ...worked, condensateMassKg: 0.08 }).dryness).toBeCloseTo(0.92, 3);
    expect(evaluateDryness({ ...worked, condensateMassKg: 0.08 }).passed).toBe(false);
    expect(evaluateDryness({ ...worked, load: "other", condensateMassKg: 0.08 })).toMatchObject({ limit: 0.9, passed: true });
  });

  it("DOMAIN §2.8 worked check: m_c = 0.070 kg → D = 1.066 [computed], which means superheat or a measurement error", () => {
    const r = evaluateDryness({ ...worked, condensateMassKg: 0.07 });
    expect(r.dryness).toBeCloseTo(1.066, 3);
    expect(r.aboveOne).toBe(true);
    expect(r.passed).toBe(false);
    expect(r.warnings.join(" ")).toMatch(/superheat|measurement error/);
  });

  it("refuses readings that cannot come from the method", () => {
    expect(() => evaluateDryness({ ...worked, condensateMassKg: 0 })).toThrow(/condensate mass/);
    expect(() => evaluateDryness({ ...worked, finalWaterTempC: 15, condensateMassKg: 0.07 })).toThrow(/final water temperature/);
  });
});

describe("Bowie-Dick test (EN 285; indicator per ISO 11140-3, common practice)", () => {
  it("passes a uniform change and fails a non-uniform one with the possible causes", () => {
    expect(evaluateBowieDick("uniform").passed).toBe(true);
    const fail = evaluateBowieDick("non-uniform");
    expect(fail.passed).toBe(false);
    expect(fail.meaning).toMatch(/air removal/);
  });
});

describe("size class and equilibration limit from chamber volume (DOMAIN §2.3 a [found: HTM 2010 §13.14(c)], §2.10)", () => {
  it("a 23 l benchtop is an EN 13060 small sterilizer", () => {
    expect(sizeClassOf(23)).toMatchObject({ standard: "EN 13060", maxEquilibrationS: null });
  });
  it("60 l and up is EN 285; 15 s up to 800 l, 30 s above", () => {
    expect(sizeClassOf(60)).toMatchObject({ standard: "EN 285", maxEquilibrationS: 15 });
    expect(sizeClassOf(445).maxEquilibrationS).toBe(15);
    expect(sizeClassOf(800).maxEquilibrationS).toBe(15);
    expect(sizeClassOf(800.5).maxEquilibrationS).toBe(30);
    expect(sizeClassOf(960).maxEquilibrationS).toBe(30);
  });
});

describe("schedule: next due date from the last pass (constructed definition tests)", () => {
  it("a daily test passed yesterday is due today; one passed three days ago is two days overdue", () => {
    expect(scheduleStatus({ intervalDays: 1, lastPassAt: "2025-03-09T06:30:00Z", lastAttempt: { at: "2025-03-09T06:30:00Z", result: "pass" }, today: "2025-03-10" })).toMatchObject({
      state: "due-today",
      dueOn: "2025-03-10",
      daysLeft: 0,
    });
    expect(scheduleStatus({ intervalDays: 1, lastPassAt: "2025-03-07T06:30:00Z", lastAttempt: null, today: "2025-03-10" })).toMatchObject({ state: "overdue", daysLeft: -2 });
  });
  it("a weekly test two days old is fine; a failure after the last pass needs a repeat at once", () => {
    expect(scheduleStatus({ intervalDays: 7, lastPassAt: "2025-03-08T09:00:00Z", lastAttempt: null, today: "2025-03-10" })).toMatchObject({ state: "ok", dueOn: "2025-03-15" });
    expect(scheduleStatus({ intervalDays: 7, lastPassAt: "2025-03-08T09:00:00Z", lastAttempt: { at: "2025-03-09T09:00:00Z", result: "fail" }, today: "2025-03-10" }).state).toBe("failed");
  });
  it("a test never done has no due date and is shown as needed", () => {
    expect(scheduleStatus({ intervalDays: 365, lastPassAt: null, lastAttempt: null, today: "2025-03-10" })).toMatchObject({ state: "never", dueOn: null });
  });
  it("dates follow the site's time zone: 23:30 UTC on 9 March is 10 March in London summer time", () => {
    expect(scheduleStatus({ intervalDays: 1, lastPassAt: "2025-06-09T23:30:00Z", lastAttempt: null, today: "2025-06-10", timeZone: "Europe/London" }).dueOn).toBe("2025-06-11");
  });
});

describe("calibration state from the latest certificate", () => {
  it("valid, due within 30 days, overdue", () => {
    expect(calibrationState("2025-05-01", "2025-03-10")).toMatchObject({ state: "valid" });
    expect(calibrationState("2025-04-09", "2025-03-10")).toMatchObject({ state: "due-soon", daysLeft: 30 });
    expect(calibrationState("2025-03-09", "2025-03-10")).toMatchObject({ state: "overdue", daysLeft: -1 });
    expect(calibrationState(null, "2025-03-10").state).toBe("none");
  });
  it("the certificate in force is the latest calibration, not the latest entered", () => {
    const c = latestCertificate([
      { n: "new", calibratedOn: "2025-01-10", dueOn: "2026-01-10" },
      { n: "old", calibratedOn: "2024-01-10", dueOn: "2025-01-10" },
    ]);
    expect(c?.n).toBe("new");
  });
});

describe("trends from stored analyses", () => {
  const result = (over: Partial<AnalysisResult>, checks: Array<[string, boolean, number | null, number]>): AnalysisResult =>
    ({
      verdict: checks.every((c) => c[1]) ? "pass" : "fail",
      equilibrationTime: null,
      holdingTime: null,
      saturation: { maxDeviation: null, lowestDeviation: null, highestDeviation: null, flags: [] },
      limits: { sterilizationTempC: 134, holdingTimeS: 180, bandK: 3, maxEquilibrationS: 15, maxSpreadK: 2, saturationLimitK: 2, f0ReferenceC: 121.1, f0ZK: 10 },
      checks: checks.map(([id, passed, measured, limit]) => ({ id, passed, measured, limit })),
      ...over,
    }) as unknown as AnalysisResult;

  it("orders cycles by start, carries the limit of each analysis and counts the pass rate", () => {
    const cycles: AnalysedCycle[] = [
      {
        cycleId: "b",
        cycleNumber: "B",
        startedAt: "2025-03-02T06:00:00Z",
        createdAt: "",
        result: result({}, [
          ["equilibration-time", false, 21, 15],
          ["spread", true, 1.1, 2],
        ]),
      },
      {
        cycleId: "a",
        cycleNumber: "A",
        startedAt: "2025-03-01T06:00:00Z",
        createdAt: "",
        result: result({}, [
          ["equilibration-time", true, 9, 15],
          ["spread", true, 0.8, 2],
        ]),
      },
      { cycleId: "c", cycleNumber: "C", startedAt: "2025-03-03T06:00:00Z", createdAt: "", result: result({ equilibrationTime: null }, [["plateau-reached", false, null, 0]]) },
    ];
    const t = trendsFromAnalyses(cycles);
    expect(t.analysed).toBe(3);
    expect(t.passed).toBe(1);
    expect(t.passRate).toBeCloseTo(1 / 3, 12);
    const eq = t.figures.find((f) => f.id === "equilibration")!;
    expect(eq.points.map((p) => [p.cycleNumber, p.value, p.limit, p.passed])).toEqual([
      ["A", 9, 15, true],
      ["B", 21, 15, false],
      ["C", null, 15, null],
    ]);
    expect(t.failuresByCheck).toEqual({ "equilibration-time": 1, "plateau-reached": 1 });
  });
});

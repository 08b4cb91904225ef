import { describe, expect, it } from "vitest";
import { DEFAULT_LIMITS, analyzeRecording } from "@/lib/analysis";
import { readLoggerFile } from "@/lib/logger-files";
import { simulateCycle, simulateDay, toLoggerCsv, type CsvDialect, type Scenario } from "@/lib/simulator";
import { saturationTemperatureC } from "@/lib/steam";

function analyse(scenario: Scenario, sterilizationTempC: number, holdingTimeS: number, dialect?: CsvDialect) {
  const sim = simulateCycle({ scenario, sterilizationTempC, holdingTimeS, seed: 11 });
  const { recording } = readLoggerFile(toLoggerCsv(sim, dialect));
  return analyzeRecording(recording, { ...DEFAULT_LIMITS, sterilizationTempC, holdingTimeS });
}

const failedChecks = (result: ReturnType<typeof analyse>) => result.checks.filter((c) => !c.passed).map((c) => c.id);

describe("simulated cycles fail exactly the way their scenario says", () => {
  it.each([
    [134, 180],
    [121, 900],
  ])("at %d °C for %d s", (ts, hold) => {
    expect(analyse("pass", ts, hold).verdict).toBe("pass");
    const air = analyse("air", ts, hold);
    // Air adds to the chamber pressure, so its saturation temperature also rises above the band
    // (issue 9 rule 1: the pressure-derived temperature is held to the band, EN 285, from memory).
    expect(failedChecks(air)).toEqual(["saturation-band", "saturation"]);
    expect(air.saturation.flags.map((f) => f.kind)).toEqual(["below"]);
    const superheat = analyse("superheat", ts, hold);
    expect(failedChecks(superheat)).toEqual(["saturation"]);
    expect(superheat.saturation.flags.map((f) => f.kind)).toEqual(["above"]);
    expect(failedChecks(analyse("short-hold", ts, hold))).toEqual(["holding-time"]);
    expect(failedChecks(analyse("slow-equilibration", ts, hold))).toEqual(["equilibration-time"]);
    const never = analyse("never-reaches", ts, hold);
    expect(never.plateau).toBeNull();
    expect(never.verdict).toBe("fail");
  });

  it("follows the saturation line during the plateau of a good cycle", () => {
    const sim = simulateCycle({ scenario: "pass", sterilizationTempC: 134, holdingTimeS: 180, seed: 2 });
    const drain = sim.channels[0].values;
    const pressure = sim.channels[sim.channels.length - 1].values;
    const hot = [...drain.keys()].filter((i) => drain[i] >= 134);
    expect(hot.length).toBeGreaterThan(180);
    for (const i of hot) expect(Math.abs(drain[i] - saturationTemperatureC(pressure[i]))).toBeLessThan(1);
  });

  it("has the expected channels and is reproducible from its seed", () => {
    const a = simulateCycle({ scenario: "pass", sterilizationTempC: 134, holdingTimeS: 180, seed: 5 });
    const b = simulateCycle({ scenario: "pass", sterilizationTempC: 134, holdingTimeS: 180, seed: 5 });
    const c = simulateCycle({ scenario: "pass", sterilizationTempC: 134, holdingTimeS: 180, seed: 6 });
    expect(a.channels.map((ch) => ch.header)).toEqual(["Drain (°C)", "Pack 1 (°C)", "Pack 2 (°C)", "Pack 3 (°C)", "Pack 4 (°C)", "Pack 5 (°C)", "Pack 6 (°C)", "Chamber (kPa abs)"]);
    expect(Array.from(a.channels[3].values)).toEqual(Array.from(b.channels[3].values));
    expect(Array.from(a.channels[3].values)).not.toEqual(Array.from(c.channels[3].values));
    // Vacuum pulses go well below atmosphere before the plateau.
    expect(Math.min(...a.channels[7].values)).toBeLessThan(10);
  });
});

describe("the CSV writer and the reader agree in every dialect", () => {
  it.each<[string, CsvDialect]>([
    ["comma, ISO, kPa abs", {}],
    ["semicolon, decimal comma, d.m.y, CRLF, Windows-1252, bar g", { delimiter: ";", decimal: ",", timeFormat: "dmy", lineEnding: "crlf", encoding: "windows-1252", pressureUnit: "bar", gauge: true }],
    ["tab, m/d/y AM/PM, °F, psig", { delimiter: "\t", timeFormat: "mdy-ampm", temperatureUnit: "F", pressureUnit: "psi", gauge: true }],
    ["BOM, ISO with T, degC, mbar abs, preamble", { encoding: "utf-8-bom", timeFormat: "iso-t", temperatureLabel: "degC", pressureUnit: "mbar", preamble: ["Export of cycle 88", "Probe set B"] }],
    ["elapsed seconds, kelvin, MPa", { timeFormat: "elapsed-seconds", temperatureUnit: "K", pressureUnit: "MPa" }],
    ["mmHg", { pressureUnit: "mmHg" }],
    ["inHg gauge at altitude", { pressureUnit: "inHg", gauge: true, atmosphereKpa: 89.875 }],
  ])("%s", (_name, dialect) => {
    const sim = simulateCycle({ scenario: "pass", sterilizationTempC: 134, holdingTimeS: 180, seed: 4 });
    const { recording } = readLoggerFile(toLoggerCsv(sim, dialect), dialect.atmosphereKpa ? { atmosphereKpa: dialect.atmosphereKpa } : {});
    expect(recording.timesS.length).toBe(sim.timesS.length);
    // The writer marks the pressure header abs or gauge, so no simulated file leans on the assumed reading (issue 9 rule 5).
    expect(recording.source?.pressureReference).toEqual({ kind: dialect.gauge ? "gauge" : "absolute", source: "header" });
    expect(recording.temperatures).toHaveLength(7);
    expect(recording.referenceIndex).toBe(0);
    const i = 900;
    expect(recording.temperatures[2].values[i]).toBeCloseTo(sim.channels[2].values[i], 1);
    // The writer rounds pressure to its unit's usual resolution.
    expect(Math.abs(recording.pressure.values[i] - sim.channels[7].values[i])).toBeLessThan(0.2);
    expect(recording.timesS[i]).toBe(sim.timesS[i]);
  });
});

describe("a day of cycles for the benchmark", () => {
  it("has 86 400 one-second rows of 16 temperatures and a pressure, and many plateaus", () => {
    const day = simulateDay();
    expect(day.timesS.length).toBe(86_400);
    expect(day.timesS[86_399]).toBe(86_399);
    expect(day.channels.filter((c) => c.kind === "temperature")).toHaveLength(16);
    expect(day.channels.filter((c) => c.kind === "pressure")).toHaveLength(1);
    const recording = {
      startedAt: null,
      timesS: day.timesS,
      temperatures: day.channels.filter((c) => c.kind === "temperature").map((c) => ({ header: c.header, values: c.values })),
      pressure: { header: "Chamber (kPa abs)", values: day.channels[16].values },
      referenceIndex: 0,
    };
    const result = analyzeRecording(recording, { ...DEFAULT_LIMITS, sterilizationTempC: 134, holdingTimeS: 180 });
    expect(result.plateausFound).toBeGreaterThan(30);
    expect(result.verdict).toBe("pass");
  });
});

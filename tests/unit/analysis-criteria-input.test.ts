// Issue 9, rules 4, 5 and 11: what the analyze command takes from the file and the options, as
// black-box cases. Written before the implementation; sources beside the expected values.
import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { ANALYZE_TIMEOUT_MS, channelOf, checkOf, runAnalyze, type AnalyzeRun } from "@/tests/support/analyze-cli";
import { LIMITS_134, loggerCsv, saturationKpa, soundCycle, withBlanks, type LoggerCsvSpec, type PressureMarker } from "@/tests/support/logger-csv";

const concurrent = { concurrent: true, timeout: ANALYZE_TIMEOUT_MS };

/** The sound 134 °C cycle (hold 32–330 s, drain 134.6 °C), with the pressure and the file's layout chosen by the case. */
function cycleFile(
  options: { marker?: PressureMarker; reads?: "absolute" | "gauge"; atmosphereKpa?: number; kpaAbsAt?: (t: number) => number } & Partial<Pick<LoggerCsvSpec, "channels" | "blankRows">> = {},
): string {
  const base = soundCycle();
  return loggerCsv({
    times: base.times,
    channels: options.channels ?? base.channels,
    blankRows: options.blankRows,
    pressure: { marker: options.marker ?? "abs", reads: options.reads, atmosphereKpa: options.atmosphereKpa, kpaAbsAt: options.kpaAbsAt ?? base.kpaAbsAt },
  });
}

function expectOneLineRefusal(run: AnalyzeRun, ...parts: string[]): void {
  expect(run.exitCode).not.toBe(0);
  expect(run.stdout).toBe("");
  const lines = run.stderr.split("\n").filter((l) => l !== "");
  expect(lines).toHaveLength(1);
  expect(lines[0]).not.toMatch(/\bat .*:\d+:\d+/);
  for (const part of parts) expect(lines[0]).toContain(part);
}

describe("rule 4: a blank cell is a missing reading, not a broken file", concurrent, () => {
  it("a sound file: no channel misses a reading", async () => {
    const run = await runAnalyze(cycleFile(), LIMITS_134);
    for (const header of ["Drain (°C)", "Pack 1 (°C)", "Pack 2 (°C)"]) expect(channelOf(run.json, header).missing).toBe(0);
  });

  it("one blank cell while heating up: analysed, counted as missing for that channel, noted", async () => {
    const { channels } = soundCycle();
    const run = await runAnalyze(cycleFile({ channels: { ...channels, "Pack 1": withBlanks(channels["Pack 1"], (t) => t === 10) } }), LIMITS_134);
    expect(run.stderr).toBe("");
    expect(run.exitCode).toBe(0);
    expect(channelOf(run.json, "Pack 1 (°C)").missing).toBe(1);
    expect(channelOf(run.json, "Pack 2 (°C)").missing).toBe(0);
    expect(run.json?.input.warnings.some((w) => w.includes("Pack 1 (°C)"))).toBe(true);
    expect(run.json?.verdict).toBe("pass");
  });

  it("ten blank cells of one probe inside the hold count like a gap for that channel", async () => {
    const { channels } = soundCycle();
    const blankInHold = withBlanks(channels["Pack 1"], (t) => t >= 151 && t <= 160);
    const run = await runAnalyze(cycleFile({ channels: { ...channels, "Pack 1": blankInHold } }), LIMITS_134);
    expect(run.exitCode).toBe(0);
    expect(channelOf(run.json, "Pack 1 (°C)").missing).toBe(10);
    // The probe was read at 150 s and next at 161 s: 11 s, over 3× the 1 s interval.
    expect(checkOf(run.json, "record-complete").passed).toBe(false);
    expect(run.json?.holdingTime).toBeLessThan(298);
    expect(run.json?.verdict).toBe("fail");
  });

  it("rows with every channel blank are skipped with a note", async () => {
    const run = await runAnalyze(cycleFile({ blankRows: [10, 11, 12] }), LIMITS_134);
    expect(run.exitCode).toBe(0);
    // 401 rows at 0…400 s, 3 of them blank
    expect(run.json?.record.samples).toBe(398);
    expect(run.json?.input.warnings.some((w) => /\b3 (blank |empty )?row/i.test(w))).toBe(true);
    expect(run.json?.verdict).toBe("pass");
  });
});

describe("rule 5: absolute or gauge comes from the header, the option or an assumption, never from the fit to steam", concurrent, () => {
  const { drain } = soundCycle();
  const gaugeOrAbsoluteWarnings = (run: AnalyzeRun) => (run.json?.input.warnings ?? []).filter((w) => /absolute|gauge/i.test(w));

  it('"kPa abs" in the header: absolute, from the header, no warning', async () => {
    const run = await runAnalyze(cycleFile({ marker: "abs" }), LIMITS_134);
    expect(run.json?.input.pressureReference).toEqual({ kind: "absolute", source: "header" });
    expect(gaugeOrAbsoluteWarnings(run)).toEqual([]);
    expect(run.json?.verdict).toBe("pass");
  });

  it('"kPa g" in the header with gauge readings: gauge, from the header; the cycle passes', async () => {
    const run = await runAnalyze(cycleFile({ marker: "gauge" }), LIMITS_134);
    expect(run.json?.input.pressureReference).toEqual({ kind: "gauge", source: "header" });
    expect(run.json?.verdict).toBe("pass");
  });

  it("no marker and 13 K of superheat: read as absolute with a warning, flagged above, never passed", async () => {
    // Absolute readings saturated 13 K below the drain: 134.6 − 121.603 = 12.997 K
    // [computed: python3-iapws at psychrolib's p_s(121.6 °C) = 208.965 kPa]. Read as gauge they
    // would sit on the steam line (Tsat 134.67 °C), which is how the old fit passed this cycle.
    const run = await runAnalyze(cycleFile({ marker: "none", kpaAbsAt: (t) => saturationKpa(drain(t) - 13) }), LIMITS_134);
    expect(run.exitCode).toBe(0);
    expect(run.json?.input.pressureReference).toEqual({ kind: "absolute", source: "assumed" });
    expect(gaugeOrAbsoluteWarnings(run).length).toBeGreaterThan(0);
    const flags = run.json?.saturation.flags ?? [];
    expect(flags.length).toBeGreaterThan(0);
    expect(flags.every((f) => f.kind === "above")).toBe(true);
    expect(Math.max(...flags.map((f) => f.worst))).toBeCloseTo(13.0, 1);
    expect(run.json?.verdict).toBe("fail");
  });

  it("no marker and 7 K of superheat: flagged above (superheat), not below (air)", async () => {
    // 134.6 − 127.604 = 6.996 K [computed: python3-iapws at psychrolib's p_s(127.6 °C) = 251.451 kPa];
    // read as gauge the same numbers give Tsat 138.9 °C, 4.3 K above the drain: "air".
    const run = await runAnalyze(cycleFile({ marker: "none", kpaAbsAt: (t) => saturationKpa(drain(t) - 7) }), LIMITS_134);
    const flags = run.json?.saturation.flags ?? [];
    expect(flags.map((f) => f.kind)).not.toContain("below");
    expect(flags.map((f) => f.kind)).toContain("above");
    expect(Math.max(...flags.map((f) => f.worst))).toBeCloseTo(7.0, 1);
    expect(run.json?.verdict).toBe("fail");
  });

  it("a gauge logger without its marker is read as absolute and fails: fail closed", async () => {
    // 309.624 − 101.325 = 208.299 kPa read as absolute: Tsat 121.502 °C, 13.098 K below the drain
    // [computed: python3-iapws; p_s(134.6 °C) from psychrolib].
    const run = await runAnalyze(cycleFile({ marker: "none", reads: "gauge" }), LIMITS_134);
    expect(run.json?.input.pressureReference).toEqual({ kind: "absolute", source: "assumed" });
    expect(run.json?.saturation.flags.map((f) => f.kind)).toContain("above");
    expect(Math.max(...(run.json?.saturation.flags ?? []).map((f) => f.worst))).toBeGreaterThan(13);
    expect(run.json?.verdict).toBe("fail");
  });

  it("--pressure-reference gauge overrides the assumption: the same file passes", async () => {
    const run = await runAnalyze(cycleFile({ marker: "none", reads: "gauge" }), [...LIMITS_134, "--pressure-reference", "gauge"]);
    expect(run.exitCode).toBe(0);
    expect(run.json?.input.pressureReference).toEqual({ kind: "gauge", source: "option" });
    expect(run.json?.saturation.flags).toEqual([]);
    expect(run.json?.verdict).toBe("pass");
  });

  it("--pressure-reference absolute on an unmarked file: absolute, from the option, no warning", async () => {
    const run = await runAnalyze(cycleFile({ marker: "none" }), [...LIMITS_134, "--pressure-reference", "absolute"]);
    expect(run.json?.input.pressureReference).toEqual({ kind: "absolute", source: "option" });
    expect(gaugeOrAbsoluteWarnings(run)).toEqual([]);
    expect(run.json?.verdict).toBe("pass");
  });

  it("--pressure-reference takes absolute or gauge only", async () => {
    const run = await runAnalyze(cycleFile(), [...LIMITS_134, "--pressure-reference", "relative"]);
    expect(run.exitCode).toBe(2);
    expectOneLineRefusal(run, "--pressure-reference");
  });
});

describe("rule 11: an atmospheric pressure outside about 50–110 kPa is refused with the range named", concurrent, () => {
  // Sea level 101.325 kPa; 84.556 kPa at 1500 m [found: ASHRAE Fundamentals 2021 ch. 1 Table 1,
  // DOMAIN.md §4]; 50 kPa is the standard atmosphere near 5500 m (common practice: no sterile
  // services unit sits higher), 110 kPa above any weather at sea level [memory].
  // Gauge readings that never go below zero (the chamber vents to atmosphere, no vacuum), so no
  // atmospheric pressure makes them negative and only the range can refuse it.
  const { drain } = soundCycle();
  const gaugeFile = (atmosphereKpa: number) => cycleFile({ marker: "gauge", atmosphereKpa, kpaAbsAt: (t) => Math.max(atmosphereKpa, saturationKpa(drain(t))) });

  it.each([10, 40, 120])("--atmosphere %d kPa is refused on one stderr line naming 50–110 kPa", async (kpa) => {
    const run = await runAnalyze(gaugeFile(101.325), [...LIMITS_134, "--atmosphere", String(kpa)]);
    expectOneLineRefusal(run, String(kpa), "50", "110");
  });

  it("--atmosphere 84.556 kPa (1500 m) is used to make the gauge readings absolute", async () => {
    const run = await runAnalyze(gaugeFile(84.556), [...LIMITS_134, "--atmosphere", "84.556"]);
    expect(run.exitCode).toBe(0);
    expect(run.json?.input.atmosphereKpa).toBe(84.556);
    // With 101.325 kPa instead, Tsat would sit 1.8 K above the drain (136.42 °C) [computed: python3-iapws].
    expect(run.json?.saturation.maxDeviation).toBeLessThan(0.1);
    expect(run.json?.verdict).toBe("pass");
  });

  it("an atmospheric pressure of 10 kPa in a saved mapping is refused too", async () => {
    const dir = await mkdtemp(path.join(tmpdir(), "papin-mapping-"));
    try {
      const mapping = path.join(dir, "mapping.json");
      await writeFile(mapping, JSON.stringify({ atmosphereKpa: 10 }));
      const run = await runAnalyze(gaugeFile(101.325), [...LIMITS_134, "--mapping", mapping]);
      expectOneLineRefusal(run, "10", "50", "110");
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});

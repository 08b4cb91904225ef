// Issue 9 rule 12 on paper: the report states the sampling interval, the gaps with their times, the
// missing readings per channel, the pressure reference with its source ("assumed" as a caution) and
// the atmospheric pressure used; the free-space sensor is named as such; the new checks print with
// their basis wording. Read back with poppler's pdftotext; page images for a person in test-results/.
import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { renderCycleReport, type ReportModel } from "@/lib/reports";
import { basisNoteFor } from "@/lib/domain";
import { buildReportModel, type ThermometricReportModel } from "@/tests/fixtures/reports/model";
import { loggerCsv, plateauChannel, sampleTimes, saturationKpa, TS_C, withBlanks } from "@/tests/support/logger-csv";

const work = mkdtempSync(path.join(tmpdir(), "papin-report-input-"));
const squash = (text: string) => text.replace(/\s+/g, " ").trim();
const poppler = (tool: string, args: string[]) => execFileSync(tool, args, { encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });

async function render(name: string, model: ReportModel): Promise<{ file: string; text: string }> {
  const file = path.join(work, `${name}.pdf`);
  writeFileSync(file, await renderCycleReport(model));
  return { file, text: squash(poppler("pdftotext", [file, "-"])) };
}

/**
 * A constructed 134 °C cycle, one sample a second for 400 s (tests/support/logger-csv.ts): drain at
 * Ts from 30 s, packs from 32 s, all at 134.6 °C until 330 s; a free-space sensor 1 K above the
 * drain; no rows between 100 s and 110 s (a 10 s gap inside the plateau); "Pack 2" blank at 5, 6
 * and 7 s (before the plateau); the pressure header "Chamber (kPa)" names neither absolute nor gauge.
 */
function gappyCycleCsv(): string {
  const drain = plateauChannel({ tsC: TS_C, reachS: 30, levelC: 134.6, exhaustS: 330 });
  const pack = plateauChannel({ tsC: TS_C, reachS: 32, levelC: 134.6, exhaustS: 330 });
  return loggerCsv({
    times: sampleTimes(400, 1, [[100, 110]]),
    channels: { Drain: drain, "Pack 1": pack, "Pack 2": withBlanks(pack, (t) => t >= 5 && t <= 7), "Free space": (t) => drain(t) + 1 },
    pressure: { marker: "none", kpaAbsAt: (t) => saturationKpa(drain(t)) },
  });
}

let model: ThermometricReportModel;
let gappy: { file: string; text: string };
let old: { file: string; text: string };

beforeAll(async () => {
  model = buildReportModel({ scenario: "pass", bytes: new TextEncoder().encode(gappyCycleCsv()) });
  gappy = await render("gappy", model);
  const oldModel = buildReportModel({ scenario: "pass" });
  // An analysis stored by engine 1.x: no input block and no per-channel missing counts.
  const analysis = { ...oldModel.detail.analysis!, input: undefined, channels: oldModel.detail.analysis!.channels.map(({ missing: _missing, ...c }) => c) };
  old = await render("engine-1", { ...oldModel, detail: { ...oldModel.detail, analysis: analysis as typeof oldModel.detail.analysis } });
}, 120_000);

afterAll(() => rmSync(work, { recursive: true, force: true }));

describe("the report of a cycle with a gap, missing readings and an unmarked pressure column", () => {
  it("the analysis found what the file was built with (the facts the report must print)", () => {
    const input = model.detail.analysis!.input!;
    expect(input.samplingInterval).toBe(1);
    expect(input.maxIntervalS).toBe(3);
    expect(input.gaps).toEqual([{ start: 100, end: 110, durationS: 10, channel: null }]);
    expect(input.pressureReference).toEqual({ kind: "absolute", source: "assumed" });
    expect(model.detail.analysis!.channels.find((c) => c.header === "Pack 2 (°C)")?.missing).toBe(3);
  });

  it("states the sampling interval, the gap with elapsed and site clock times, and the missing readings", () => {
    expect(gappy.text).toContain("The record and how it was read");
    expect(gappy.text).toContain("Sampling interval every 1 s (median); at most 3 s between samples inside the plateau");
    expect(gappy.text).toContain("Gaps 1 inside the plateau period: the hold is not counted across it");
    // The fixture's cycle starts 07:30:00 UTC on 3 March 2025, GMT in London [common practice]: 100 s is 07:31:40.
    expect(gappy.text).toContain("01:40 (07:31:40) 01:50 (07:31:50)");
    expect(gappy.text).toContain("10 s no sample of any channel");
    expect(gappy.text).toContain("Missing readings 3 readings of the temperature channels, 0 readings of the pressure");
  });

  it("states the pressure reference as an assumption, in a caution, and the atmosphere with its source", () => {
    expect(gappy.text).toContain("Pressure reference CAUTION: Absolute, assumed: the pressure column's header names neither absolute nor gauge");
    expect(gappy.text).toContain("Atmospheric pressure used 101.325 kPa, the standard atmosphere at sea level (not needed: the readings are absolute)");
  });

  it("names the free-space sensor in the channel table and gives each channel's missing count", () => {
    expect(gappy.text).toMatch(/Missing/);
    // Columns: channel, position and note, role, min, max, mean, F0, arrival after the plateau start, missing.
    expect(gappy.text).toMatch(/Free space \(°C\) Free chamber space: [^\d]*free space [\d.]+ [\d.]+ [\d.]+ [\d.]+ [\d.]+ s 0 /);
    expect(gappy.text).toMatch(/Pack 2 \(°C\) Test pack, centre: [^\d]*load [\d.]+ [\d.]+ [\d.]+ [\d.]+ [\d.]+ s 3 /);
    expect(gappy.text).not.toMatch(/Free space \(°C\) load/);
  });

  it("prints the new checks with their labels, results and basis wording", () => {
    const checks = model.detail.analysis!.checks;
    for (const id of ["record-complete", "saturation-band", "free-space"] as const) {
      const check = checks.find((c) => c.id === id)!;
      expect(check, id).toBeDefined();
      expect(gappy.text).toContain(squash(check.label));
      expect(gappy.text).toContain(squash(basisNoteFor(id, "en-285", null, 134)));
    }
    expect(checks.find((c) => c.id === "record-complete")!.passed).toBe(false);
    expect(gappy.text).toMatch(/Record without gaps during the plateau FAIL/);
  });

  it("leaves a page image to look at", () => {
    const dir = path.join(process.cwd(), "test-results", "report-pages");
    mkdirSync(dir, { recursive: true });
    poppler("pdftoppm", ["-png", "-r", "70", gappy.file, path.join(dir, "record-input")]);
  });
});

describe("the report of an analysis stored before these facts were recorded", () => {
  it("says they were not recorded rather than inventing them", () => {
    expect(old.text).toContain("Gaps not recorded by this engine version");
    expect(old.text).toContain("Missing readings not recorded by this engine version");
    expect(old.text).toContain("Pressure reference not recorded by this engine version");
    expect(old.text).toContain("Atmospheric pressure used not recorded by this engine version");
    expect(old.text).toContain("Missing: blank cells of the channel in the whole record (not recorded by this engine version)");
  });
});

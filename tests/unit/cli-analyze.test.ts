import { execFile } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { analyzeCommand } from "@/lib/cli/run-analyze";

const ROOT = path.resolve(import.meta.dirname, "../..");
const LAUNCHER = path.join(ROOT, "lib/cli/launch.mjs");
const FIXTURES = path.join(ROOT, "tests/fixtures/logger-files");

type Run = { code: number; stdout: string; stderr: string };

/** Runs the analyze command in this process: the same function the command runs, the same output. */
function analyze(args: string[]): Run {
  const run = analyzeCommand(args);
  return { code: run.exitCode, stdout: run.stdout, stderr: run.stderr };
}

/** Runs the analyze command as `npm run analyze` does (node lib/cli/launch.mjs analyze), as a separate process. */
function spawnAnalyze(args: string[]): Promise<Run> {
  return new Promise((resolve) => {
    execFile(process.execPath, [LAUNCHER, "analyze", ...args], { cwd: ROOT, maxBuffer: 32 * 1024 * 1024 }, (error, stdout, stderr) => {
      const code = error ? (typeof error.code === "number" ? error.code : 1) : 0;
      resolve({ code, stdout, stderr });
    });
  });
}

function expectOneLineError(run: Run, pattern: RegExp | string): void {
  expect(run.code).not.toBe(0);
  expect(run.stdout).toBe("");
  const lines = run.stderr.split("\n").filter((l) => l !== "");
  expect(lines).toHaveLength(1);
  expect(lines[0]).toMatch(/^analyze: /);
  expect(lines[0]).not.toMatch(/\bat .*:\d+:\d+/);
  if (typeof pattern === "string") expect(lines[0]).toContain(pattern);
  else expect(lines[0]).toMatch(pattern);
}

const fixture = (name: string) => path.join(FIXTURES, name);
// A spawned command bundles itself first when lib/ changed; several at once on a two-core machine take a while.
const SPAWN_TIMEOUT_MS = 90_000;

describe("the analyze command on hand-made logger files", () => {
  it("Windows-1252, semicolons, decimal commas, day.month.year, bar abs: a passing 134 °C cycle", () => {
    const run = analyze([fixture("cp1252-semicolon-dmy-pass.csv"), "--sterilization-temp", "134", "--holding-time", "180"]);
    expect(run.stderr).toBe("");
    expect(run.code).toBe(0);
    const result = JSON.parse(run.stdout);
    expect(Object.keys(result).slice(0, 7)).toEqual(["verdict", "plateau", "equilibrationTime", "holdingTime", "saturation", "f0", "checks"]);
    expect(result.verdict).toBe("pass");
    expect(result.plateau).toEqual({ start: 60, end: 270 });
    expect(result.equilibrationTime).toBe(10);
    expect(result.holdingTime).toBe(200);
    expect(result.saturation.flags).toEqual([]);
    expect(Object.keys(result.f0)).toEqual(["Drain (°C)", "Pack oben (°C)", "Pack Mitte (°C)", "Pack unten (°C)"]);
    expect(result.referenceChannel).toBe("Drain (°C)");
    expect(result.input.dialect).toMatchObject({ encoding: "windows-1252", delimiter: ";", decimal: ",", lineEnding: "crlf", preambleLines: 4, timeFormat: "dmy" });
    for (const c of result.checks) expect(c).toMatchObject({ id: expect.any(String), passed: true, measured: expect.any(Number), limit: expect.any(Number) });
  });

  it("tabs, month/day/year AM/PM, °F, psig: air during the hold of a 121 °C cycle", () => {
    const run = analyze([fixture("tab-mdy-ampm-fahrenheit-psig-air.txt"), "--sterilization-temp", "121", "--holding-time", "900"]);
    expect(run.code).toBe(0);
    const result = JSON.parse(run.stdout);
    expect(result.verdict).toBe("fail");
    expect(result.holdingTime).toBe(990);
    expect(result.saturation.flags).toHaveLength(1);
    expect(result.saturation.flags[0]).toMatchObject({ start: 400, end: 460, kind: "below" });
    expect(result.saturation.flags[0].worst).toBeCloseTo(-3, 1);
    // The air's extra pressure also lifts the saturation temperature above the band's top of 124 °C (issue 9 rule 1).
    expect(result.checks.filter((c: { passed: boolean }) => !c.passed).map((c: { id: string }) => c.id)).toEqual(["saturation-band", "saturation"]);
    expect(result.referenceChannel).toBe("REF drain (°F)");
    expect(result.input.dialect.timeFormat).toBe("mdy-ampm");
  });

  it("UTF-8 with BOM, ISO with T, degC, bar(a): superheat early in the hold", () => {
    const run = analyze([fixture("bom-iso-t-degc-bar-superheat.csv"), "--sterilization-temp", "134", "--holding-time", "180"]);
    expect(run.code).toBe(0);
    const result = JSON.parse(run.stdout);
    expect(result.verdict).toBe("fail");
    expect(result.saturation.flags.map((f: { kind: string; start: number; end: number }) => [f.kind, f.start, f.end])).toEqual([["above", 40, 70]]);
    expect(result.saturation.flags[0].worst).toBeCloseTo(2.6, 1);
    expect(result.startedAt ?? result.record.startedAt).toBe("2025-09-09T06:00:00");
  });

  it("elapsed seconds, kelvin, kPa gauge: a hold too short", () => {
    const run = analyze([fixture("elapsed-kelvin-kpa-gauge-short-hold.csv"), "--sterilization-temp", "134", "--holding-time", "180"]);
    expect(run.code).toBe(0);
    const result = JSON.parse(run.stdout);
    expect(result.verdict).toBe("fail");
    expect(result.holdingTime).toBe(114);
    expect(result.checks.find((c: { id: string }) => c.id === "holding-time")).toMatchObject({ passed: false, measured: 114, limit: 180 });
    expect(result.saturation.flags).toEqual([]);
  });

  it("takes the limits and overrides from the flags", () => {
    const run = analyze([
      fixture("elapsed-kelvin-kpa-gauge-short-hold.csv"),
      "--sterilization-temp=134",
      "--holding-time",
      "100",
      "--band",
      "4",
      "--max-equilibration",
      "30",
      "--max-spread",
      "2.5",
      "--saturation-limit",
      "1.5",
      "--reference",
      "TC 2 (K)",
      "--f0-reference",
      "121",
      "--f0-z",
      "10",
    ]);
    expect(run.code).toBe(0);
    const result = JSON.parse(run.stdout);
    expect(result.referenceChannel).toBe("TC 2 (K)");
    expect(result.limits).toMatchObject({ holdingTimeS: 100, bandK: 4, maxEquilibrationS: 30, maxSpreadK: 2.5, saturationLimitK: 1.5, f0ReferenceC: 121 });
    expect(result.checks.find((c: { id: string }) => c.id === "band").limit).toBe(138);
  });

  it("refuses a gauge file that it is told to read as absolute: the vacuum pulses would be below zero", () => {
    const run = analyze([fixture("elapsed-kelvin-kpa-gauge-short-hold.csv"), "--sterilization-temp", "134", "--holding-time", "100", "--pressure-unit", "kPa abs"]);
    expectOneLineError(run, /^analyze: Row \d+, column "Chamber \(kPa g\)": "-\d+\.\d+" kPa is a negative absolute pressure; check the unit and the gauge\/absolute setting$/);
  });
});

describe("the analyze command on unusable input", () => {
  let dir = "";
  const file = (name: string, content: string | Uint8Array) => {
    const target = path.join(dir, name);
    writeFileSync(target, content);
    return target;
  };
  const header = "Time,Drain (°C),Pack 1 (°C),Chamber (kPa abs)\n";
  const row = (s: number, pack = "134.0") => `2025-03-03 07:30:${String(s).padStart(2, "0")},134.1,${pack},304.2\n`;
  const limits = ["--sterilization-temp", "134", "--holding-time", "180"];

  beforeAll(() => {
    dir = mkdtempSync(path.join(tmpdir(), "papin-cli-"));
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it.each([
    ["an empty file", () => file("empty.csv", ""), "The file is empty (0 bytes)"],
    ["a header only", () => file("header.csv", header), "The file has a header (line 1) but no data rows below it"],
    ["too few rows", () => file("few.csv", header + row(0) + row(5)), "The file has only 2 data rows; at least 3 are needed to analyse a cycle"],
    ["no pressure column", () => file("nop.csv", "Time,Drain (°C),Pack 1 (°C)\n" + [0, 1, 2].map((s) => `2025-03-03 07:30:0${s},134.1,134.0\n`).join("")), "No pressure column"],
    ["no temperature column", () => file("not.csv", "Time,Chamber (kPa abs)\n2025-03-03 07:30:00,304\n2025-03-03 07:30:01,305\n2025-03-03 07:30:02,306\n"), "No temperature column"],
    ["no time column", () => file("notime.csv", "Drain (°C),Pack 1 (°C),Chamber (kPa abs)\n134.1,134.0,304.2\n134.2,134.1,304.9\n134.0,133.9,304.1\n"), "No time column"],
    ["binary bytes", () => file("binary.dat", new Uint8Array([0x41, 0x42, 0x00, 0x01, 0xff, 0x10, 0x00, 0x43])), "The file is not text: byte 0x00 at offset 2"],
    ["a spreadsheet workbook", () => file("book.xlsx", new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00, 0x06, 0x00])), "The file is a ZIP archive (or an .xlsx workbook), not a text export"],
    ["prose", () => file("notes.txt", "The cycle ran fine today.\nWe changed the door seal on Monday and the test passed.\nNothing else to report.\n"), "The file holds no table"],
    [
      "time going backwards",
      () => file("back.csv", header + row(0) + row(5) + row(3) + row(10)),
      'Row 4, column "Time": time goes backwards ("2025-03-03 07:30:03" comes after "2025-03-03 07:30:05" on row 3)',
    ],
    [
      "text in a numeric cell",
      () =>
        file("text.csv", "Time;Drain (°C);Pack 1 (°C);Chamber (kPa abs)\n" + "03.03.2025 07:30:00;134,1;134,0;304,2\n03.03.2025 07:30:05;134,1;12,a;304,2\n03.03.2025 07:30:10;134,1;134,0;304,2\n"),
      'Row 3, column "Pack 1 (°C)": "12,a" is not a number',
    ],
    ["a short row", () => file("short.csv", header + row(0) + "2025-03-03 07:30:05,134.1,134.0\n" + row(10)), "Row 3 has 3 comma-separated fields where the header has 4"],
    [
      "a time cell in another format",
      () => file("badtime.csv", header + row(0) + "yesterday,134.1,134.0,304.2\n" + row(10)),
      'Row 3, column "Time": "yesterday" is not a time written as year-month-day hour:minute:second',
    ],
    ["a missing file", () => path.join(dir, "nowhere.csv"), "Cannot open"],
  ])("%s", (_name, make, message) => {
    expectOneLineError(analyze([make(), ...limits]), message);
  });

  it("an empty cell is a missing reading of that channel, not a broken file (issue 9 rule 4)", () => {
    const run = analyze([file("gap.csv", header + row(0) + row(5, "") + row(10)), ...limits]);
    expect(run.stderr).toBe("");
    expect(run.code).toBe(0);
    const result = JSON.parse(run.stdout);
    expect(result.channels.find((c: { header: string }) => c.header === "Pack 1 (°C)").missing).toBe(1);
    expect(result.input.warnings).toContain('Column "Pack 1 (°C)": 1 blank cell (row 3), read as missing readings');
  });

  it("an empty time cell is still refused with its row", () => {
    expectOneLineError(analyze([file("notime-cell.csv", header + row(0) + ",134.1,134.0,304.2\n" + row(10)), ...limits]), 'Row 3, column "Time": the cell is empty');
  });

  it("pressure that no unit setting makes physical during the plateau", () => {
    const target = file("vacuum.csv", "Time (s),Drain (°C),Pack (°C),Chamber (kPa abs)\n0,134.1,134,0.3\n1,134.2,134.1,0.3\n2,134.2,134.1,0.3\n");
    expectOneLineError(analyze([target, ...limits]), /Chamber pressure at 0 s during the plateau: 0\.3 kPa abs is below the triple point/);
  });

  it.each([
    [["--holding-time", "180"], "--sterilization-temp is required"],
    [["--sterilization-temp", "134"], "--holding-time is required"],
    [["--sterilization-temp", "hot", "--holding-time", "180"], '--sterilization-temp needs a number, not "hot"'],
    [["--sterilization-temp", "134", "--holding-time", "180", "--colour", "red"], "Unknown option --colour"],
    [["--sterilization-temp", "134", "--holding-time", "-5"], "--holding-time must be above 0"],
    [["--sterilization-temp", "134", "--holding-time", "180", "--pressure-unit", "furlongs"], '--pressure-unit "furlongs" is not a pressure unit'],
    [["--sterilization-temp", "134", "--holding-time", "180", "--time-column", "Clock"], 'The time column "Clock" is not a column of this file'],
    [["--sterilization-temp", "134", "--holding-time", "180", "--plateau", "2"], "The record holds 1 plateau; plateau 2 does not exist"],
  ])("bad flags %j", (flags, message) => {
    expectOneLineError(analyze([fixture("cp1252-semicolon-dmy-pass.csv"), ...flags]), message);
  });

  it("no file at all", () => {
    expectOneLineError(analyze(limits), "No logger file given");
  });

  it("usage errors exit 2, unusable files exit 1", () => {
    expect(analyze(["--holding-time", "180", fixture("cp1252-semicolon-dmy-pass.csv")]).code).toBe(2);
    expect(analyze([path.join(FIXTURES, "does-not-exist.csv"), ...limits]).code).toBe(1);
  });

  it("--help prints the usage and exits 0", () => {
    const run = analyze(["--help"]);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/--sterilization-temp <°C> --holding-time <s>/);
  });
});

describe("the analyze command started as npm run analyze starts it", () => {
  it.concurrent(
    "prints, byte for byte, what it prints in process, and exits 0",
    async () => {
      const args = [fixture("tab-mdy-ampm-fahrenheit-psig-air.txt"), "--sterilization-temp", "121", "--holding-time", "900"];
      const run = await spawnAnalyze(args);
      expect(run).toEqual(analyze(args));
      expect(run.code).toBe(0);
      expect(JSON.parse(run.stdout).verdict).toBe("fail");
    },
    SPAWN_TIMEOUT_MS,
  );

  it.concurrent(
    "exits 1 with one line on stderr for a file it cannot use",
    async () => {
      const run = await spawnAnalyze([path.join(FIXTURES, "does-not-exist.csv"), "--sterilization-temp", "134", "--holding-time", "180"]);
      expect(run.code).toBe(1);
      expectOneLineError(run, "Cannot open");
    },
    SPAWN_TIMEOUT_MS,
  );

  it.concurrent(
    "exits 2 for a usage error and 0 for --help",
    async () => {
      const [usage, help] = await Promise.all([spawnAnalyze(["--holding-time", "180", fixture("cp1252-semicolon-dmy-pass.csv")]), spawnAnalyze(["--help"])]);
      expect(usage.code).toBe(2);
      expectOneLineError(usage, "--sterilization-temp is required");
      expect(help.code).toBe(0);
      expect(help.stdout).toMatch(/--sterilization-temp <°C> --holding-time <s>/);
    },
    SPAWN_TIMEOUT_MS,
  );
});

import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { analyzeCommand } from "@/lib/cli/run-analyze";
import { simulateLeakTest, SIMULATED_CLOSE_S, toLoggerCsv } from "@/lib/simulator";

const work = mkdtempSync(path.join(tmpdir(), "papin-leak-cli-"));
afterAll(() => rmSync(work, { recursive: true, force: true }));

function file(name: string, bytes: Uint8Array): string {
  const target = path.join(work, name);
  writeFileSync(target, bytes);
  return target;
}

// The simulator's chamber leaks 0.10 kPa/min after closing the valves at SIMULATED_CLOSE_S (DOMAIN.md §2.5 timing).
const leaking = file("leak-test.csv", toLoggerCsv(simulateLeakTest({ leakRateKpaPerMin: 0.1, seed: 3 }), { pressureUnit: "mbar" }));

describe("the analyze command with --test-kind air-leakage", () => {
  it("judges a time+pressure file and prints kind, leakRate, p1–p3 and t1–t3 first", () => {
    const run = analyzeCommand([leaking, "--test-kind", "air-leakage"]);
    expect(run.stderr).toBe("");
    expect(run.exitCode).toBe(0);
    const out = JSON.parse(run.stdout);
    expect(Object.keys(out).slice(0, 10)).toEqual(["kind", "verdict", "leakRate", "p1", "p2", "p3", "t1", "t2", "t3", "checks"]);
    expect(out.kind).toBe("air-leakage");
    // At the file's 0.1 mbar resolution the last seconds of the evacuation read the same as the deepest vacuum; the first of them is t1.
    expect(Math.abs(out.t1 - SIMULATED_CLOSE_S)).toBeLessThanOrEqual(4);
    expect(out.t3 - out.t1).toBe(900); // 5 min wait + 10 min test
    expect(out.leakRate).toBeCloseTo(0.1, 2);
    expect(out.verdict).toBe("pass"); // 0.10 ≤ 0.13 kPa/min (EN 285 / HTM 2010)
    expect(out.input.file).toBe("leak-test.csv");
  });

  it("takes the limit, the set point and a marked t1 from its options", () => {
    const strict = JSON.parse(analyzeCommand([leaking, "--test-kind", "air-leakage", "--leak-limit", "0.08"]).stdout);
    expect(strict.verdict).toBe("fail");
    const marked = JSON.parse(analyzeCommand([leaking, "--test-kind", "air-leakage", "--t1", "400", "--vacuum-set-point", "4"]).stdout);
    expect(marked.timeSources.t1).toBe("marked");
    expect(marked.t1).toBe(400);
    expect(marked.checks.find((c: { id: string }) => c.id === "vacuum-reached").passed).toBe(false); // the simulator's vacuum is 4.5 kPa abs
  });

  it("refuses thermometric options with an air leakage test, and leak options without it, in one line", () => {
    const mixed = analyzeCommand([leaking, "--test-kind", "air-leakage", "--sterilization-temp", "134"]);
    expect(mixed.exitCode).toBe(2);
    expect(mixed.stderr).toBe("analyze: --sterilization-temp does not apply to an air leakage test\n");
    const stray = analyzeCommand([leaking, "--sterilization-temp", "134", "--holding-time", "180", "--t1", "300"]);
    expect(stray.exitCode).toBe(2);
    expect(stray.stderr).toMatch(/^analyze: --t1 does not apply to a thermometric test/);
    expect(analyzeCommand([leaking, "--test-kind", "bowie"]).stderr).toMatch(/--test-kind takes "thermometric" or "air-leakage"/);
  });

  it("without --test-kind a pressure-only file is refused as before: a thermometric test needs temperatures", () => {
    const run = analyzeCommand([leaking, "--sterilization-temp", "134", "--holding-time", "180"]);
    expect(run.exitCode).toBe(1);
    expect(run.stderr).toMatch(/No temperature column/);
  });
});

// Peak memory per row of the analyze command (issue 12, item 4): a 500,000-row file of 16 temperature channels and
// chamber pressure, analysed by `node lib/cli/launch.mjs analyze` in a child process that writes its peak RSS
// (PAPIN_RESOURCE_REPORT); the same command on a 1,000-row file is the baseline (node, the bundle, the code warmed).
import { spawnSync } from "node:child_process";
import { readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { simulateDay, toLoggerCsv } from "../../lib/simulator";

const ROOT = path.resolve(import.meta.dirname, "../..");
const LAUNCHER = path.join(ROOT, "lib/cli/launch.mjs");
export const MEMORY_ROWS = 500_000;
const BASELINE_ROWS = 1_000;
export const GOAL_BYTES_PER_ROW = 200;
/**
 * The node flags `npm run analyze` starts with (package.json): a 1 MB young generation. The reader's short-lived
 * strings and numbers are collected far more often, which takes peak memory from about 255 to about 180 bytes per row
 * at 500,000 rows for the same run time (measured on the 2-core development machine).
 */
export const ANALYZE_NODE_FLAGS = ["--max-semi-space-size=1"];

function peakRssKb(file: string, report: string): number {
  const args = [...ANALYZE_NODE_FLAGS, LAUNCHER, "analyze", file, "--sterilization-temp", "134", "--holding-time", "180"];
  const result = spawnSync(process.execPath, args, { cwd: ROOT, env: { ...process.env, PAPIN_RESOURCE_REPORT: report }, encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
  if (result.status !== 0) throw new Error(`analyze failed on ${path.basename(file)} (exit ${result.status}): ${result.stderr.trim()}`);
  const usage = JSON.parse(readFileSync(report, "utf8")) as { maxRssKb: number; ownPeakRssKb: number | null };
  // The child's own peak: its maxRSS would start at this (large) process's size (lib/cli/run-analyze.ts).
  return usage.ownPeakRssKb ?? usage.maxRssKb;
}

export type AnalyzeMemory = { rows: number; fileBytes: number; peakMb: number; baselineMb: number; bytesPerRow: number };

/** Writes both files into dir, runs each twice (the lower peak counts, as the first run may build the bundle) and returns the growth per row. */
export function analyzeMemory(dir: string): AnalyzeMemory {
  const write = (name: string, samples: number) => {
    const file = path.join(dir, name);
    const bytes = toLoggerCsv(simulateDay({ temperatureChannels: 16, samples, sterilizationTempC: 134, holdingTimeS: 180 }));
    writeFileSync(file, bytes);
    return { file, bytes: bytes.length };
  };
  const small = write("memory-small.csv", BASELINE_ROWS);
  const large = write("memory-large.csv", MEMORY_ROWS);
  const report = path.join(dir, "memory-resources.json");
  const lowest = (file: string) => Math.min(peakRssKb(file, report), peakRssKb(file, report));
  const baselineKb = lowest(small.file);
  const peakKb = lowest(large.file);
  const bytesPerRow = ((peakKb - baselineKb) * 1024) / (MEMORY_ROWS - BASELINE_ROWS);
  return { rows: MEMORY_ROWS, fileBytes: large.bytes, peakMb: peakKb / 1024, baselineMb: baselineKb / 1024, bytesPerRow };
}

/** The bench table's row for this case (peak memory per row is a goal; the 300 MB must of the day file stays in run.ts). */
export function analyzeMemoryRows(dir: string): Array<[string, string, string, string, string]> {
  const m = analyzeMemory(dir);
  return [
    [
      `analyze command, ${m.rows.toLocaleString("en")} rows × 17 columns (${(m.fileBytes / 1e6).toFixed(0)} MB): peak memory − 1,000-row run, per row`,
      `${m.bytesPerRow.toFixed(0)} B/row`,
      `≤ ${GOAL_BYTES_PER_ROW} B/row`,
      "",
      m.bytesPerRow <= GOAL_BYTES_PER_ROW ? "goal met" : "above goal",
    ],
    ["  peak memory of that run (its baseline)", `${m.peakMb.toFixed(0)} MB (${m.baselineMb.toFixed(0)} MB)`, "", "", ""],
  ];
}

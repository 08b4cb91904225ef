import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { simulateDay, toLoggerCsv } from "../../lib/simulator";
import { saturationTemperatureC } from "../../lib/steam";
import { env } from "../../lib/env";
import { serverBench } from "./http";
import { ANALYZE_NODE_FLAGS, analyzeMemoryRows } from "./analyze-memory";

const ROOT = path.resolve(import.meta.dirname, "../..");
const LAUNCHER = path.join(ROOT, "lib/cli/launch.mjs");
const RUNS = 5;

// The yardstick: what node needs just to read the file, split it and parse every number.
const BASELINE_SCRIPT = `
const fs = require("node:fs");
const text = fs.readFileSync(process.argv[2], "utf8");
const lines = text.split("\\n");
let sum = 0;
for (let i = 1; i < lines.length; i++) {
  const fields = lines[i].split(",");
  for (let k = 1; k < fields.length; k++) sum += parseFloat(fields[k]) || 0;
}
process.stdout.write(String(sum));
`;

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

function timeProcess(command: string, args: string[], env: NodeJS.ProcessEnv = process.env): { seconds: number; stdout: string; stderr: string; status: number | null } {
  const started = performance.now();
  const result = spawnSync(command, args, { cwd: ROOT, env, encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
  const seconds = (performance.now() - started) / 1000;
  return { seconds, stdout: result.stdout, stderr: result.stderr, status: result.status };
}

function tsatEvaluationsPerSecond(): number {
  const pressures = new Float64Array(1024);
  for (let i = 0; i < pressures.length; i++) pressures[i] = 1 + (i * 499) / pressures.length;
  const evaluations = 20_000_000;
  // A local binding, as a hot loop would hold it: module imports compiled by tsx are property getters.
  const tsat = saturationTemperatureC;
  let best = 0;
  let sink = 0;
  for (let round = 0; round < 3; round++) {
    const started = performance.now();
    for (let i = 0; i < evaluations; i++) sink += tsat(pressures[i & 1023]);
    const perSecond = evaluations / ((performance.now() - started) / 1000);
    best = Math.max(best, perSecond);
  }
  if (!Number.isFinite(sink)) throw new Error("IF97 loop produced a non-finite sum");
  return best;
}

async function main(): Promise<number> {
  const dir = mkdtempSync(path.join(tmpdir(), "papin-bench-"));
  try {
    const sim = simulateDay({ temperatureChannels: 16, samples: 86_400, sterilizationTempC: 134, holdingTimeS: 180 });
    const file = path.join(dir, "day.csv");
    const bytes = toLoggerCsv(sim);
    writeFileSync(file, bytes);
    const baselineScript = path.join(dir, "baseline.cjs");
    writeFileSync(baselineScript, BASELINE_SCRIPT);

    const analyzeArgs = [...ANALYZE_NODE_FLAGS, LAUNCHER, "analyze", file, "--sterilization-temp", "134", "--holding-time", "180"];
    const report = path.join(dir, "resources.json");
    const env = { ...process.env, PAPIN_RESOURCE_REPORT: report };

    // One warm-up each, so that tsx's compile cache and the disk cache are in the same state for every timed run.
    timeProcess(process.execPath, [baselineScript, file]);
    const warm = timeProcess(process.execPath, analyzeArgs, env);
    if (warm.status !== 0) {
      console.error(`analyze failed (exit ${warm.status}): ${warm.stderr.trim()}`);
      return 1;
    }
    const output = JSON.parse(warm.stdout) as { verdict: string; plateausFound: number };

    const baselineTimes: number[] = [];
    const analyzeTimes: number[] = [];
    const rssKb: number[] = [];
    for (let run = 0; run < RUNS; run++) {
      baselineTimes.push(timeProcess(process.execPath, [baselineScript, file]).seconds);
      const result = timeProcess(process.execPath, analyzeArgs, env);
      if (result.status !== 0) {
        console.error(`analyze failed (exit ${result.status}): ${result.stderr.trim()}`);
        return 1;
      }
      analyzeTimes.push(result.seconds);
      rssKb.push((JSON.parse(readFileSync(report, "utf8")) as { maxRssKb: number }).maxRssKb);
    }
    const npmRun = timeProcess("npm", ["run", "--silent", "analyze", "--", file, "--sterilization-temp", "134", "--holding-time", "180"]);

    const baseline = median(baselineTimes);
    const analyze = median(analyzeTimes);
    const ratio = analyze / baseline;
    const peakMb = Math.max(...rssKb) / 1024;
    const tsatPerSecond = tsatEvaluationsPerSecond();
    const intake = await intakePath(bytes);
    const bounded = boundedIntake(dir, bytes.length / sim.timesS.length);
    const server = await serverBench({ dir, dayBytes: bytes, dayTempC: 134, baselineS: baseline });

    const rows: Row[] = [
      ["baseline: node read + split + parseFloat", `${baseline.toFixed(3)} s`, "", "", ""],
      ["analyze command (node lib/cli/launch.mjs analyze)", `${analyze.toFixed(3)} s`, "", "", ""],
      ["  the same through npm run --silent analyze", `${npmRun.seconds.toFixed(3)} s`, "", "", "(npm's own start-up included)"],
      ["ratio analyze / baseline", `${ratio.toFixed(2)}×`, "≤ 2×", "≤ 5×", ratio <= 2 ? "goal met" : ratio <= 5 ? "within limit" : "FAILED"],
      ["peak memory of the analyze process", `${peakMb.toFixed(0)} MB`, "", "≤ 300 MB", peakMb <= 300 ? "within limit" : "FAILED"],
      ["intake on the server: read + analyse + hash", `${intake.analyseS.toFixed(3)} s`, "", "", "(in one process, as POST /api/cycles does)"],
      ["chart series (3000 points) built", `${intake.seriesS.toFixed(3)} s`, "", "", ""],
      ["chart series payload", `${(intake.seriesBytes / 1024).toFixed(0)} KiB`, "", "< 1 MB", intake.seriesBytes < 1e6 ? "within limit" : "FAILED"],
      ["report PDF rendered (first render)", `${intake.reportS.toFixed(3)} s`, "< 3 s", "", intake.reportS < 3 ? "goal met" : "above goal"],
      ["server part of drop → record", `${(intake.analyseS + intake.seriesS).toFixed(3)} s`, "", "< 10 s", intake.analyseS + intake.seriesS < 10 ? "within limit" : "FAILED"],
      ...bounded.rows,
      ...analyzeMemoryRows(dir),
      ["IF97 Tsat(p) evaluations per second", `${(tsatPerSecond / 1e6).toFixed(1)} million`, "≥ 20 million", "", tsatPerSecond >= 20e6 ? "goal met" : "below goal"],
      ...server.rows,
    ];
    const widths = [0, 1, 2, 3, 4].map((k) => Math.max(...rows.map((r) => r[k].length), ["measure", "value", "goal", "must", "status"][k].length));
    const line = (cells: string[]) => "| " + cells.map((c, k) => c.padEnd(widths[k])).join(" | ") + " |";
    console.log(
      `Papin benchmark: a day-long logger file, ${sim.timesS.length.toLocaleString("en")} rows × ${sim.channels.length - 1} temperature channels + 1 pressure, ${(bytes.length / 1e6).toFixed(1)} MB`,
    );
    console.log(`median of ${RUNS} runs each after one warm-up; node ${process.version}; verdict of the first of ${output.plateausFound} plateaus: ${output.verdict}`);
    console.log(line(["measure", "value", "goal", "must", "status"]));
    console.log(line(widths.map((w) => "-".repeat(w))));
    for (const row of rows) console.log(line(row));
    const failed = ratio > 5 || peakMb > 300 || intake.seriesBytes >= 1e6 || intake.analyseS + intake.seriesS >= 10 || bounded.failed || server.failed;
    if (failed) console.log("A must limit, or a goal of the HTTP cases, was missed.");
    return failed ? 1 : 0;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

type Row = [string, string, string, string, string];
type IntakeMemory = { outcome: string; message?: string; seconds: number; fileBytes: number; baselineRssKb: number; peakRssKb: number };

/** One upload's reading and analysis in a fresh process (tests/bench/intake-memory.ts): time and peak memory growth. */
function intakeMemory(file: string): IntakeMemory {
  const result = timeProcess(path.join(ROOT, "node_modules/.bin/tsx"), [path.join(ROOT, "tests/bench/intake-memory.ts"), file]);
  if (result.status !== 0) throw new Error(`intake-memory failed on ${path.basename(file)}: ${result.stderr.trim()}`);
  return JSON.parse(result.stdout) as IntakeMemory;
}

/**
 * Bounded intake (issue 11): the largest file PAPIN_UPLOAD_LIMIT_MB allows, of realistic rows, is accepted within a
 * small multiple of its size in memory; a single line of the same size is refused fast, before it is split.
 */
function boundedIntake(dir: string, bytesPerRow: number): { rows: Row[]; failed: boolean } {
  const limitBytes = env().PAPIN_UPLOAD_LIMIT_MB * 1024 * 1024;
  const largest = path.join(dir, "largest.csv");
  const rowsForLimit = Math.floor((limitBytes / bytesPerRow) * 0.99);
  const largestBytes = toLoggerCsv(simulateDay({ temperatureChannels: 16, samples: rowsForLimit, sterilizationTempC: 134, holdingTimeS: 180 }));
  if (largestBytes.length > limitBytes) throw new Error("the generated file came out over the upload limit");
  writeFileSync(largest, largestBytes);
  const oneLine = path.join(dir, "one-line.csv");
  writeFileSync(oneLine, "1,".repeat(Math.floor(limitBytes / 2) - 1));
  const accepted = intakeMemory(largest);
  const refused = intakeMemory(oneLine);
  const growth = (m: IntakeMemory) => (m.peakRssKb * 1024 - m.baselineRssKb * 1024) / m.fileBytes;
  const mb = (n: number) => `${(n / 1e6).toFixed(1)} MB`;
  const acceptedGrowth = growth(accepted);
  const refusedGrowth = growth(refused);
  const rows: Row[] = [
    [
      `largest allowed file (${mb(accepted.fileBytes)}, ${rowsForLimit.toLocaleString("en")} rows): read + analyse`,
      `${accepted.seconds.toFixed(2)} s`,
      "< 5 s",
      "",
      accepted.outcome !== "accepted" ? "FAILED" : accepted.seconds < 5 ? "goal met" : "above goal",
    ],
    ["  peak memory growth / file size", `${acceptedGrowth.toFixed(1)}×`, "≤ 4×", "≤ 6×", acceptedGrowth <= 4 ? "goal met" : acceptedGrowth <= 6 ? "within limit" : "FAILED"],
    [
      `single-line file (${mb(refused.fileBytes)}): refused`,
      `${refused.seconds.toFixed(2)} s`,
      "< 1 s",
      "refused",
      refused.outcome !== "refused" ? "FAILED" : refused.seconds < 1 ? "goal met" : "above goal",
    ],
    ["  peak memory growth / file size", `${refusedGrowth.toFixed(1)}×`, "≤ 2×", "≤ 6×", refusedGrowth <= 2 ? "goal met" : refusedGrowth <= 6 ? "within limit" : "FAILED"],
  ];
  return { rows, failed: accepted.outcome !== "accepted" || refused.outcome !== "refused" || acceptedGrowth > 6 || refusedGrowth > 6 };
}

/** The server's work for one upload of the day-long file, timed in this process. */
async function intakePath(bytes: Uint8Array) {
  const { analyzeLoggerBytes } = await import("../../lib/cycles/analyze-file");
  const { readLoggerFile } = await import("../../lib/logger-files");
  const { buildSeries } = await import("../../lib/cycles/series");
  const { renderCycleReport } = await import("../../lib/reports");
  const { buildReportModel } = await import("../fixtures/reports/model");
  const profile = { sterilizationTempC: 134, holdingTimeS: 180, bandK: 3, maxEquilibrationS: 15, maxSpreadK: 2, saturationLimitK: 2, f0ReferenceC: 121.1, f0ZK: 10 } as Parameters<
    typeof analyzeLoggerBytes
  >[1];
  let t = performance.now();
  const analysed = analyzeLoggerBytes(bytes, profile);
  const analyseS = (performance.now() - t) / 1000;
  const { recording } = readLoggerFile(bytes, analysed.mapping);
  t = performance.now();
  const seriesBytes = Buffer.byteLength(JSON.stringify(buildSeries(recording, analysed.result, { points: 3000 })));
  const seriesS = (performance.now() - t) / 1000;
  const model = buildReportModel({ day: true, points: 3000 });
  t = performance.now();
  await renderCycleReport(model);
  const reportS = (performance.now() - t) / 1000;
  return { analyseS, seriesS, seriesBytes, reportS };
}

main().then((code) => {
  process.exitCode = code;
});

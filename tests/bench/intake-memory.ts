// One upload's server work on one file, in a fresh process, so its peak memory is the file's alone:
// `tsx tests/bench/intake-memory.ts <file>` prints JSON { outcome, message?, seconds, fileBytes, baselineRssKb, peakRssKb, heapUsedGrowthBytes }.
import { readFileSync } from "node:fs";
import { analyzeLoggerBytes } from "../../lib/cycles/analyze-file";
import { LoggerFileError } from "../../lib/logger-files";

const profile = { sterilizationTempC: 134, holdingTimeS: 180, bandK: 3, maxEquilibrationS: 15, maxSpreadK: 2, saturationLimitK: 2, f0ReferenceC: 121.1, f0ZK: 10 } as Parameters<
  typeof analyzeLoggerBytes
>[1];

const file = process.argv[2];
if (!file) throw new Error("usage: tsx tests/bench/intake-memory.ts <file>");
globalThis.gc?.();
// Everything is loaded; what grows from here is the file and its reading.
const baselineRssKb = Math.round(process.memoryUsage().rss / 1024);
const baselineHeap = process.memoryUsage().heapUsed;
const started = performance.now();
// A Buffer is a Uint8Array: the upload's bytes held once, as lib/uploads.ts holds them.
const bytes: Uint8Array = readFileSync(file);
let outcome = "accepted";
let message: string | undefined;
try {
  analyzeLoggerBytes(bytes, profile);
} catch (error) {
  if (!(error instanceof LoggerFileError)) throw error;
  outcome = "refused";
  message = error.message;
}
const seconds = (performance.now() - started) / 1000;
const heapUsedGrowthBytes = process.memoryUsage().heapUsed - baselineHeap;
const peakRssKb = process.resourceUsage().maxRSS;
process.stdout.write(JSON.stringify({ outcome, message, seconds, fileBytes: bytes.byteLength, baselineRssKb, peakRssKb, heapUsedGrowthBytes }));

import { closeSync, openSync, readFileSync, readSync, statSync, writeFileSync } from "node:fs";
import { basename } from "node:path";
import { AnalysisError, analyzeCycleRecording, type CycleAnalysis } from "../analysis";
import { LoggerFileError, readLoggerFile, type ByteSource } from "../logger-files";
import { STANDARD_ATMOSPHERE_KPA, SteamRangeError } from "../steam";
import { USAGE, UsageError, parseArguments } from "./analyze-arguments";

export { USAGE, UsageError, parseArguments } from "./analyze-arguments";

/**
 * The file as a source read piece by piece, so the command never holds the whole file (issue 12: memory per row);
 * the caller closes it.
 */
function openFile(file: string): ByteSource & { close(): void } {
  let size: number;
  try {
    const stat = statSync(file);
    if (stat.isDirectory()) throw new LoggerFileError(`${file} is a folder, not a logger file`);
    size = stat.size;
  } catch (error) {
    if (error instanceof LoggerFileError) throw error;
    throw new LoggerFileError(`Cannot open ${file}: no such file or no permission to read it`);
  }
  if (size > 1024 * 1024 * 1024) throw new LoggerFileError(`${file} is ${Math.round(size / 1048576)} MB, more than the 1 GB a logger file may have`);
  let fd: number;
  try {
    fd = openSync(file, "r");
  } catch {
    throw new LoggerFileError(`Cannot open ${file}: no such file or no permission to read it`);
  }
  const slice = (start: number, end: number): Uint8Array => {
    const bytes = Buffer.allocUnsafe(Math.max(0, end - start));
    let read = 0;
    while (read < bytes.length) {
      const n = readSync(fd, bytes, read, bytes.length - read, start + read);
      if (n === 0) throw new LoggerFileError(`${file} changed while it was read: it is shorter than ${size} bytes`);
      read += n;
    }
    return bytes;
  };
  return { byteLength: size, slice, close: () => closeSync(fd) };
}

export type AnalyzeRun = { exitCode: number; stdout: string; stderr: string };

/** The analyze command in process: argv in, what it would print and its exit code out (the tests call this). */
export function analyzeCommand(argv: string[]): AnalyzeRun {
  let stdout = "";
  let stderr = "";
  const exitCode = runAnalyze(argv, { out: (text) => (stdout += text), err: (line) => (stderr += line + "\n") });
  return { exitCode, stdout, stderr };
}

/** Runs the analyze command; returns the exit code, writing output through the given functions. */
export function runAnalyze(argv: string[], io: { out: (text: string) => void; err: (line: string) => void }): number {
  try {
    const parsed = parseArguments(argv);
    if (parsed.help) {
      io.out(USAGE + "\n");
      return 0;
    }
    const source = openFile(parsed.file);
    let read: ReturnType<typeof readLoggerFile>;
    try {
      read = readLoggerFile(source, parsed.overrides, parsed.context);
    } finally {
      source.close();
    }
    const { recording, dialect, columns } = read;
    const result = analyzeCycleRecording(recording, parsed.request);
    const { input, ...rest } = contractOrder(result);
    const output = {
      ...rest,
      input: {
        file: basename(parsed.file),
        bytes: source.byteLength,
        dialect,
        columns,
        atmosphereKpa: parsed.overrides.atmosphereKpa ?? STANDARD_ATMOSPHERE_KPA,
        ...input,
      },
    };
    io.out(JSON.stringify(output) + "\n");
    return 0;
  } catch (error) {
    const oneLine = (message: string) => message.replace(/\s*[\r\n]+\s*/g, " ").trim();
    if (error instanceof UsageError) {
      io.err(`analyze: ${oneLine(error.message)}`);
      return 2;
    }
    if (error instanceof LoggerFileError || error instanceof AnalysisError || error instanceof SteamRangeError) {
      io.err(`analyze: ${oneLine(error.message)}`);
      return 1;
    }
    const message = error instanceof Error ? error.message : String(error);
    io.err(`analyze: internal error: ${oneLine(message)}`);
    return 70;
  }
}

/** The contract's fields first, in its order; the rest of the analysis after them (how the file was read goes last). */
function contractOrder(result: CycleAnalysis) {
  if (result.kind === "air-leakage") {
    const { kind, verdict, leakRate, p1, p2, p3, t1, t2, t3, checks, ...rest } = result;
    return { kind, verdict, leakRate, p1, p2, p3, t1, t2, t3, checks, ...rest };
  }
  const { verdict, plateau, equilibrationTime, holdingTime, saturation, f0, checks, ...rest } = result;
  return { verdict, plateau, equilibrationTime, holdingTime, saturation, f0, checks, ...rest };
}

/** When PAPIN_RESOURCE_REPORT names a file, the command writes its peak memory there on exit (used by the benchmark). */
export function reportResourcesOnExit(): void {
  // Read here rather than through lib/env: loading zod would double the command's start-up time.
  // eslint-disable-next-line no-restricted-properties
  const target = process.env.PAPIN_RESOURCE_REPORT;
  if (!target) return;
  process.on("exit", () => {
    const usage = process.resourceUsage();
    writeFileSync(target, JSON.stringify({ maxRssKb: usage.maxRSS, ownPeakRssKb: ownPeakRssKb(), userCpuUs: usage.userCPUTime, systemCpuUs: usage.systemCPUTime }));
  });
}

/**
 * This process's own peak resident memory (Linux VmHWM), KB; null elsewhere. maxRSS is not enough for a child: Linux
 * carries the parent's peak across fork and exec, so a child of a large process reports at least the parent's size.
 */
function ownPeakRssKb(): number | null {
  try {
    const match = /VmHWM:\s*(\d+) kB/.exec(readFileSync("/proc/self/status", "utf8"));
    return match ? Number(match[1]) : null;
  } catch {
    return null;
  }
}

import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { analyzeCommand } from "@/lib/cli/run-analyze";

export type AnalyzeFlag = { start: number; end: number; kind: "below" | "above"; /** signed, K: negative = below */ worst: number; diagnosis: string };
export type AnalyzeCheck = { id: string; passed: boolean; measured: number | null; limit: number | null };
export type AnalyzeGap = { start: number; end: number; durationS: number; channel: string | null };

/**
 * The analyze command's JSON as these tests read it: DESIGN.md "The analyze command" plus issue 9's
 * contract (input.pressureReference, input.samplingInterval, input.gaps, input.warnings, per-channel
 * missing) and the fields README "The analyze command" adds (plateauPeriod, input.atmosphere).
 */
export type AnalyzeJson = {
  verdict: "pass" | "fail";
  summary: string;
  plateau: { start: number; end: number } | null;
  plateauPeriod: { start: number; end: number } | null;
  equilibrationTime: number | null;
  holdingTime: number | null;
  saturation: { maxDeviation: number | null; flags: AnalyzeFlag[] };
  f0: Record<string, number>;
  checks: AnalyzeCheck[];
  diagnoses: Array<{ checkId: string; text: string }>;
  channels: Array<{ header: string; role: "reference" | "load" | "free-space"; missing: number }>;
  record: { samples: number };
  input: {
    pressureReference: { kind: "absolute" | "gauge"; source: "header" | "option" | "user" | "assumed" };
    samplingInterval: number;
    gaps: AnalyzeGap[];
    warnings: string[];
    atmosphereKpa: number;
    atmosphere: { kpa: number; source: "option" | "mapping" | "site" | "standard" };
  };
};

export type AnalyzeRun = {
  exitCode: number;
  stdout: string;
  stderr: string;
  /** the parsed stdout when the command exited 0 and printed JSON */
  json?: AnalyzeJson;
};

/** Runs in process, so a case takes milliseconds; the timeout only guards a hang. */
export const ANALYZE_TIMEOUT_MS = 30_000;

/**
 * Runs the analyze command on a logger file given as text, in this process through the function
 * the command itself runs (`analyzeCommand`: same arguments, same output, same exit code; one test
 * in cli-analyze.test.ts checks that the spawned command prints the same bytes).
 */
export async function runAnalyze(fileText: string, args: string[]): Promise<AnalyzeRun> {
  const dir = await mkdtemp(path.join(tmpdir(), "papin-analyze-"));
  try {
    const file = path.join(dir, "logger.csv");
    await writeFile(file, fileText, "utf8");
    const run = analyzeCommand([file, ...args]);
    if (run.exitCode !== 0) return run;
    try {
      return { ...run, json: JSON.parse(run.stdout) };
    } catch {
      return run;
    }
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

/** The check with this id; fails the test with the ids present when there is none. */
export function checkOf(json: AnalyzeJson | undefined, id: string): AnalyzeCheck {
  const found = json?.checks.find((c) => c.id === id);
  if (!found) throw new Error(`No check "${id}" in the output; checks: ${json?.checks.map((c) => c.id).join(", ") ?? "(no JSON)"}`);
  return found;
}

/** The diagnosis text(s) attached to a check, joined. */
export function diagnosisOf(json: AnalyzeJson | undefined, checkId: string): string {
  return (json?.diagnoses ?? [])
    .filter((d) => d.checkId === checkId)
    .map((d) => d.text)
    .join("\n");
}

/** The analysis' summary of the temperature channel with this header. */
export function channelOf(json: AnalyzeJson | undefined, header: string): AnalyzeJson["channels"][number] {
  const found = json?.channels.find((c) => c.header === header);
  if (!found) throw new Error(`No channel "${header}" in the output; channels: ${json?.channels.map((c) => c.header).join(", ") ?? "(no JSON)"}`);
  return found;
}

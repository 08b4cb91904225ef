import { cpus, loadavg } from "node:os";
import path from "node:path";
import { DEMO_USERS } from "../../../db/demo-users";
import { env } from "../../../lib/env";
import { signIn } from "./client";
import { firstViewCase, uploadDayFile } from "./first-view";
import { listsCase } from "./lists";
import { assertFreshBuild, BenchStop, copyDatabase, removeDatabase, seededDatabase, startServer } from "./server";
import { uploadsCase, uploadTarget } from "./uploads";

export type Row = [string, string, string, string, string];
export type CaseResult = { rows: Row[]; failed: boolean };
export type Session = { url: string; cookie: string };

const ENGINEER = DEMO_USERS.find((u) => u.role === "engineer")!.email;

/**
 * Issue 12's HTTP figures on a production server (`next start` on the built app) over a copy of a database seeded
 * with PAPIN_BENCH_CYCLES cycles: list throughput against health, 20 concurrent uploads, and the first report and
 * chart series of the day-long file in freshly started servers (against `baselineS`, the bare parse of that file).
 */
export async function serverBench({ dir, dayBytes, dayTempC, baselineS }: { dir: string; dayBytes: Uint8Array; dayTempC: number; baselineS: number }): Promise<CaseResult> {
  const cycles = env().PAPIN_BENCH_CYCLES;
  if (cycles === 0) return { rows: [["HTTP server cases", "skipped (PAPIN_BENCH_CYCLES=0)", "", "", ""]], failed: false };
  const database = path.join(dir, "bench.db");
  const who = { email: ENGINEER, password: env().PAPIN_DEMO_PASSWORD };
  const runId = Date.now().toString(36).toUpperCase();
  try {
    assertFreshBuild();
    copyDatabase(seededDatabase(cycles), database);
    const heading = `HTTP: next start, ${cycles.toLocaleString("en")} cycles, ${cpus().length} cores, load average ${loadavg()[0].toFixed(1)} at start`;
    const rows: Row[] = [[heading, "", "", "", ""]];
    let failed = false;
    let dayCycleId: string;
    const server = await startServer(database);
    try {
      const session = { url: server.url, cookie: await signIn(server.url, who.email, who.password) };
      const target = await uploadTarget(session, dayTempC);
      for (const result of [await listsCase(session, cycles), await uploadsCase(session, target, runId)]) {
        rows.push(...result.rows);
        failed ||= result.failed;
      }
      dayCycleId = await uploadDayFile(session, target, dayBytes, runId);
    } finally {
      await server.stop();
    }
    const first = await firstViewCase(database, dayCycleId, who, baselineS);
    rows.push(...first.rows);
    return { rows, failed: failed || first.failed };
  } catch (error) {
    console.error(error instanceof BenchStop ? error.message : `The HTTP bench stopped: ${error instanceof Error ? error.message : String(error)}`);
    return { rows: [["HTTP server cases", "not measured", "", "", "FAILED (see the message above)"]], failed: true };
  } finally {
    removeDatabase(database);
  }
}

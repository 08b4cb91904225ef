import { signIn } from "./client";
import { BenchStop, startServer } from "./server";
import { uploadCycle, type Target } from "./uploads";
import type { CaseResult, Session } from "./index";

// Issue 12's goals: the first draft report within 3× the bare node parse of the same file, the first series ≤ 0.2 s.
const MAX_REPORT_RATIO = 3;
const MAX_SERIES_S = 0.2;

/** Registers the day-long file as a cycle (its analysis stores the recording's columns) and returns the cycle's id. */
export async function uploadDayFile(session: Session, target: Target, bytes: Uint8Array, runId: string): Promise<string> {
  const answer = await uploadCycle(session, target, { name: `bench-day-${runId}.csv`, bytes }, `BENCH-DAY-${runId}`);
  if (answer.status !== 201 || !answer.id) throw new BenchStop(`Uploading the day-long file answered HTTP ${answer.status}: ${answer.error ?? "no cycle id"}.`);
  return answer.id;
}

/** In a server started for this request alone: sign in, then time one GET from sending to its last byte. */
async function firstRequest(databaseFile: string, email: string, password: string, path: string, contentType: string): Promise<number> {
  const server = await startServer(databaseFile);
  try {
    const cookie = await signIn(server.url, email, password);
    const started = performance.now();
    const res = await fetch(server.url + path, { headers: { Cookie: cookie } });
    const body = await res.arrayBuffer();
    const seconds = (performance.now() - started) / 1000;
    if (res.status !== 200 || !res.headers.get("content-type")?.startsWith(contentType) || body.byteLength === 0) {
      throw new BenchStop(`GET ${path} in a fresh server answered HTTP ${res.status} (${res.headers.get("content-type")}, ${body.byteLength} bytes).`);
    }
    return seconds;
  } finally {
    await server.stop();
  }
}

/** The draft PDF and the chart series of the day-long cycle, each the first request of a freshly started server. */
export async function firstViewCase(databaseFile: string, cycleId: string, who: { email: string; password: string }, baselineS: number): Promise<CaseResult> {
  const reportS = await firstRequest(databaseFile, who.email, who.password, `/api/cycles/${cycleId}/report`, "application/pdf");
  const seriesS = await firstRequest(databaseFile, who.email, who.password, `/api/cycles/${cycleId}/series`, "application/json");
  const ratio = reportS / baselineS;
  return {
    rows: [
      [
        "  first draft report of the day-long cycle, fresh server",
        `${reportS.toFixed(2)} s = ${ratio.toFixed(2)}× baseline`,
        `≤ ${MAX_REPORT_RATIO}× baseline`,
        "",
        ratio <= MAX_REPORT_RATIO ? "goal met" : "MISSED",
      ],
      ["  first chart series of the day-long cycle, fresh server", `${seriesS.toFixed(3)} s`, `≤ ${MAX_SERIES_S} s`, "", seriesS <= MAX_SERIES_S ? "goal met" : "MISSED"],
    ],
    failed: ratio > MAX_REPORT_RATIO || seriesS > MAX_SERIES_S,
  };
}

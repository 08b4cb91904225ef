import { closedLoop, getJson, type LoadResult } from "./client";
import { BenchStop } from "./server";
import type { CaseResult, Row, Session } from "./index";

const CONCURRENCIES = [1, 10, 50] as const;
const LOAD_SECONDS = 5;
// Issue 12's goals: each list at least half of health's throughput at concurrency 10, p95 ≤ 100 ms unloaded.
const MIN_RATIO_AT_10 = 0.5;
const MAX_P95_AT_1_MS = 100;

type Sterilizer = { id: string; name: string };

/** The three list requests of issue 12, built from the site's own sterilizers. */
async function listRequests({ url, cookie }: Session, expectedCycles: number) {
  const { items: sterilizers } = await getJson<{ items: Sterilizer[] }>(`${url}/api/sterilizers`, cookie);
  const sterilizer = [...sterilizers].sort((a, b) => a.name.localeCompare(b.name))[0];
  if (!sterilizer) throw new BenchStop("The bench database has no sterilizer to filter by.");
  const word = sterilizer.name.split(/\s+/)[0];
  const requests = [
    { label: "list, page 1 of 50", path: "/api/cycles?page=1&pageSize=50" },
    { label: `search "${word}" sorted by number`, path: `/api/cycles?page=1&pageSize=50&q=${encodeURIComponent(word)}&sort=cycleNumber:asc` },
    { label: "approved on one sterilizer", path: `/api/cycles?page=1&pageSize=50&status=approved&sterilizer=${sterilizer.id}` },
  ];
  // Each answers with a full page, and the list holds the seeded cycles: the figures are of the large database.
  for (const r of requests) {
    const page = await getJson<{ items: unknown[]; total: number }>(url + r.path, cookie);
    if (page.items.length !== 50) throw new BenchStop(`${r.path} answered ${page.items.length} rows, not a full page of 50.`);
    if (r.path.endsWith("pageSize=50") && page.total < expectedCycles) throw new BenchStop(`The cycles list counts ${page.total} cycles, fewer than the ${expectedCycles} seeded.`);
  }
  return requests;
}

const ms = (v: number) => `${v.toFixed(v < 10 ? 1 : 0)} ms`;
const figure = (r: LoadResult) => `${r.perSecond.toFixed(r.perSecond < 10 ? 1 : 0)} req/s, p95 ${ms(r.p95Ms)}`;

/**
 * Throughput and p95 of the cycles list, a search with a sort and a filtered page beside /api/health, at concurrency
 * 1, 10 and 50, each in a closed loop for LOAD_SECONDS; ratios against health at the same concurrency in this run.
 */
export async function listsCase(session: Session, expectedCycles: number): Promise<CaseResult> {
  const requests = await listRequests(session, expectedCycles);
  const all = [{ label: "/api/health", path: "/api/health" }, ...requests];
  // Warm-up: every route compiled and its first queries made before anything is timed.
  for (const r of all) await closedLoop(session.url + r.path, session.cookie, 2, 1);
  const rows: Row[] = [];
  let failed = false;
  // Pages are kept until the ledger moves on (lib/services/list-totals.ts), so the requests above repeat a kept page;
  // paging on, one request after another, reads each page from the database: shown beside them, without a goal.
  let pageNumber = 0;
  const paging = await closedLoop(() => `${session.url}/api/cycles?page=${++pageNumber}&pageSize=50`, session.cookie, 1, LOAD_SECONDS);
  failed ||= paging.failures > 0;
  for (const concurrency of CONCURRENCIES) {
    const health = await closedLoop(`${session.url}/api/health`, session.cookie, concurrency, LOAD_SECONDS);
    failed ||= health.failures > 0;
    rows.push([`  /api/health, concurrency ${concurrency}`, figure(health), "(yardstick)", "", health.failures ? `FAILED: ${health.failures} × ${health.firstFailure}` : ""]);
    for (const r of requests) {
      const result = await closedLoop(session.url + r.path, session.cookie, concurrency, LOAD_SECONDS);
      const ratio = result.perSecond / health.perSecond;
      const goal = concurrency === 1 ? `p95 ≤ ${MAX_P95_AT_1_MS} ms` : concurrency === 10 ? `≥ ${MIN_RATIO_AT_10}× health` : "";
      const met = concurrency === 1 ? result.p95Ms <= MAX_P95_AT_1_MS : concurrency === 10 ? ratio >= MIN_RATIO_AT_10 : true;
      const status = result.failures > 0 ? `FAILED: ${result.failures} × ${result.firstFailure}` : goal === "" ? "" : met ? "goal met" : "MISSED";
      failed ||= result.failures > 0 || !met;
      rows.push([`    ${r.label}`, `${figure(result)}; ${ratio.toFixed(2)}× health`, goal, "", status]);
    }
  }
  rows.push([
    `  list, paging on (pages 1 to ${pageNumber}, each read from the database), concurrency 1`,
    figure(paging),
    "(not kept)",
    "",
    paging.failures ? `FAILED: ${paging.failures} × ${paging.firstFailure}` : "",
  ]);
  return { rows, failed };
}

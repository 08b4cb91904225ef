import "server-only";
import { latestAuditSeq } from "@/db/queries/audit";
import { canonicalJson } from "@/lib/integrity";

/**
 * List totals counted once per site and filter, then reused while nothing has changed: every change to
 * a record appends an audit event, so the ledger's newest seq (one index read) tells a stale total from
 * a current one, in this process and across processes. An entry also expires after TOTAL_TTL_MS, for
 * anything written outside the services.
 */
const TOTAL_TTL_MS = 60_000;
const MAX_ENTRIES = 500;

type Entry = { total: number; seq: number; countedAtMs: number };
const cache = globalThis as unknown as { __papinListTotals?: Map<string, Entry> };
const totals = (cache.__papinListTotals ??= new Map());

/** The total for `list` on `siteId` with `filter`: from the cache when still current, else `count()` (and cached). */
export async function cachedTotal({ list, siteId, filter, count }: { list: string; siteId: string; filter: object; count: () => Promise<number> }): Promise<number> {
  const key = `${list}|${siteId}|${canonicalJson(filter)}`;
  const seq = await latestAuditSeq();
  const hit = totals.get(key);
  if (hit && hit.seq === seq && Date.now() - hit.countedAtMs < TOTAL_TTL_MS) return hit.total;
  const total = await count();
  if (totals.size >= MAX_ENTRIES) totals.delete(totals.keys().next().value as string);
  totals.delete(key);
  totals.set(key, { total, seq, countedAtMs: Date.now() });
  return total;
}

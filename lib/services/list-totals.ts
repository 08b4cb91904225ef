import "server-only";
import { latestAuditSeq } from "@/db/queries/audit";
import { canonicalJson } from "@/lib/integrity";

/**
 * List totals and list pages read once per site and filter, then reused while nothing has changed: every change to
 * a record appends an audit event, so the ledger's newest seq (one index read) tells a stale answer from a current
 * one, in this process and across processes. The seq is read before the rows, so an answer is never older than the
 * seq it is kept under. An entry also expires after LEDGER_CACHE_TTL_MS, for anything written outside the services.
 */
const LEDGER_CACHE_TTL_MS = 60_000;

type Entry = { value: unknown; seq: number; readAtMs: number };
const holder = globalThis as unknown as { __papinLedgerCaches?: Map<string, Map<string, Entry>> };
const stores = (holder.__papinLedgerCaches ??= new Map());

/** The ledger's newest seq, read once per request and handed to the cached reads below. */
export const ledgerSeq = latestAuditSeq;

async function remember<T>(store: string, maxEntries: number, key: string, seq: number, read: () => Promise<T>): Promise<T> {
  let entries = stores.get(store);
  if (!entries) stores.set(store, (entries = new Map()));
  const hit = entries.get(key);
  if (hit && hit.seq === seq && Date.now() - hit.readAtMs < LEDGER_CACHE_TTL_MS) return hit.value as T;
  const readAtMs = Date.now();
  const value = await read();
  if (entries.size >= maxEntries) entries.delete(entries.keys().next().value as string);
  entries.delete(key);
  entries.set(key, { value, seq, readAtMs });
  return value;
}

/** The total for `list` on `siteId` with `filter`: from the cache when still current, else `count()` (and cached). */
export async function cachedTotal({ list, siteId, filter, count, seq }: { list: string; siteId: string; filter: object; count: () => Promise<number>; seq?: number }): Promise<number> {
  return remember("totals", 500, `${list}|${siteId}|${canonicalJson(filter)}`, seq ?? (await ledgerSeq()), count);
}

/** One page of `list` on `siteId` for `query` (filter, sort, page, size): from the cache when still current, else `read()` (and cached). */
export async function cachedPage<T>({ list, siteId, query, read, seq }: { list: string; siteId: string; query: object; read: () => Promise<T>; seq?: number }): Promise<T> {
  return remember("pages", 200, `${list}|${siteId}|${canonicalJson(query)}`, seq ?? (await ledgerSeq()), read);
}

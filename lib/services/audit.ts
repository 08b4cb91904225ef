import "server-only";
import type { Actor } from "@/db/queries/users";
import { listAuditEventsAfter, listAuditEventsOfSite, type AuditFilter } from "@/db/queries/audit";
import { auditEventHash } from "@/db/ledger";
import { GENESIS_HASH } from "@/lib/integrity";
import { siteIdOf } from "./site";

type ChainState = { ok: boolean; events: number; firstBrokenAt?: number; problem?: string };

/**
 * Walks the whole chain in order, recomputing each hash; names the first event that does not
 * fit. The chain links every site's events, so it can only be verified whole.
 */
export async function verifyAuditChain(): Promise<ChainState> {
  const pageSize = 2000;
  let prevHash = GENESIS_HASH;
  let lastSeq = 0;
  let events = 0;
  for (;;) {
    const rows = await listAuditEventsAfter({ afterSeq: lastSeq, limit: pageSize });
    for (const row of rows) {
      events++;
      const { seq, hash, ...fields } = row;
      if (fields.prevHash !== prevHash) {
        return { ok: false, events, firstBrokenAt: seq, problem: `Event ${seq} does not point at the event before it.` };
      }
      if (auditEventHash(fields) !== hash) {
        return { ok: false, events, firstBrokenAt: seq, problem: `Event ${seq} was changed after it was written.` };
      }
      prevHash = hash;
      lastSeq = seq;
    }
    if (rows.length < pageSize) break;
  }
  return { ok: true, events };
}

/** The actor's site's events, newest first, filtered. */
export async function listAuditEvents({ actor, filter }: { actor: Actor; filter: AuditFilter }) {
  return listAuditEventsOfSite({ siteId: siteIdOf(actor, "audit ledger"), filter });
}

/** The ledger page: the chain's state and one page of the site's events. */
export async function getAuditLedger({ actor, filter }: { actor: Actor; filter: AuditFilter }) {
  const [chain, events] = await Promise.all([verifyAuditChain(), listAuditEvents({ actor, filter })]);
  return { chain, ...events };
}

import "server-only";
import type { Actor } from "@/db/queries/users";
import { getLedgerHead, listAuditEventsAfter, listAuditEventsOfSite, type AuditEventFilter } from "@/db/queries/audit";
import { auditEventHash } from "@/db/ledger";
import { GENESIS_HASH } from "@/lib/integrity";
import { anchorComparison, type LedgerAnchor, type LedgerHead } from "@/lib/integrity/anchors";
import { readLedgerAnchors } from "./ledger-anchors";
import { siteIdOf } from "./site";
import { cachedTotal } from "./list-totals";

type ChainState = { ok: boolean; events: number; firstBrokenAt?: number; problem?: string };
type Row = { seq: number; hash: string };

/** Walks the chain in order, recomputing each hash; `visit` sees every event that fits, up to the first that does not. */
async function walkChain(visit?: (row: Row) => void): Promise<ChainState> {
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
      visit?.({ seq, hash });
      prevHash = hash;
      lastSeq = seq;
    }
    if (rows.length < pageSize) break;
  }
  return { ok: true, events };
}

/**
 * The chain on its own: every event links to the one before and still has its hash. The chain
 * links every site's events, so it can only be verified whole. It cannot see a chain rewritten
 * from some event on, nor the last events deleted: verifyLedger compares with the anchors for that.
 */
export async function verifyAuditChain(): Promise<ChainState> {
  return walkChain();
}

/** The ledger's head now (event count, last seq, last hash). */
export async function currentLedgerHead(): Promise<LedgerHead> {
  return getLedgerHead();
}

export type AnchorState =
  | { status: "none"; anchors: 0; problem: string }
  | { status: "match"; anchors: number; last: LedgerAnchor }
  | { status: "mismatch"; anchors: number; problem: string; anchorLine?: number }
  | { status: "unchecked"; anchors: number; problem: string };

export type LedgerVerification = ChainState & { head: LedgerHead; anchors: AnchorState };

export const NO_ANCHOR_YET =
  "No outside anchor yet: the ledger head has not been written outside the database (an approval or `npm run ledger:anchor` writes one), so a rewritten or shortened chain could not be told apart.";

/**
 * The chain and its outside anchors (GET /api/audit/verify, the ledger page): each anchored event
 * must be in the database with the anchored hash and count, and nothing after the last anchor may
 * be missing. No anchor file is a warning (that part proves nothing), never a pass of it.
 */
export async function verifyLedger(): Promise<LedgerVerification> {
  const read = readLedgerAnchors();
  const comparison = anchorComparison(read.anchors);
  const chain = await walkChain(comparison.visit);
  const head = await getLedgerHead();
  const disagreement = comparison.finish({ complete: chain.ok });
  const count = read.anchors.length;
  let anchors: AnchorState;
  if (read.problem) anchors = { status: "mismatch", anchors: count, problem: read.problem };
  else if (disagreement) anchors = { status: "mismatch", anchors: count, problem: disagreement.problem, anchorLine: disagreement.anchorIndex + 1 };
  else if (count === 0) anchors = { status: "none", anchors: 0, problem: NO_ANCHOR_YET };
  else if (!chain.ok) anchors = { status: "unchecked", anchors: count, problem: "The anchors after the broken event could not be compared." };
  else anchors = { status: "match", anchors: count, last: read.anchors[count - 1] };
  if (!chain.ok || anchors.status !== "mismatch") return { ...chain, head, anchors };
  return { ok: false, events: chain.events, firstBrokenAt: disagreement?.seq, problem: anchors.problem, head, anchors };
}

/** The ledger's list as scripts ask for it: `actor` is part of an e-mail address, `from`/`to` instants (both inclusive). */
export type AuditFilter = { action?: string; entityType?: string; entityId?: string; actor?: string; from?: string; to?: string; page?: number; pageSize?: number };

/** The actor's site's events, newest first, filtered; the total is counted once per filter (cachedTotal). */
export async function listAuditEvents({ actor, filter }: { actor: Actor; filter: AuditFilter }) {
  const siteId = siteIdOf(actor, "audit ledger");
  const { page, pageSize, actor: actorEmailContains, from: fromIso, to: toIso, action, entityType, entityId } = filter;
  const events: AuditEventFilter = { action, entityType, entityId, actorEmailContains, fromIso, toIso };
  return listAuditEventsOfSite({ siteId, filter: events, page, pageSize, totalOf: (count) => cachedTotal({ list: "audit", siteId, filter: events, count }) });
}

/** The ledger page: the chain's state against its anchors and one page of the site's events. */
export async function getAuditLedger({ actor, filter }: { actor: Actor; filter: AuditFilter }) {
  const [chain, events] = await Promise.all([verifyLedger(), listAuditEvents({ actor, filter })]);
  return { chain, ...events };
}

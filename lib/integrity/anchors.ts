/**
 * The ledger head and its outside anchors: a copy of (event count, last seq, last hash) kept where
 * a person with access to the database alone cannot reach it. Pure: values in, verdicts out.
 */

/** The audit ledger at one moment: how many events, the newest one's seq and hash (GENESIS_HASH when empty). */
export type LedgerHead = { events: number; lastSeq: number; lastHash: string };

/** One line of the anchor file: the head and when it was taken. Site-less: the chain spans every site. */
export type LedgerAnchor = { at: string; events: number; seq: number; hash: string };

export function anchorOf(head: LedgerHead, at: Date): LedgerAnchor {
  return { at: at.toISOString(), events: head.events, seq: head.lastSeq, hash: head.lastHash };
}

export function anchorLine(anchor: LedgerAnchor): string {
  return `${JSON.stringify({ at: anchor.at, events: anchor.events, seq: anchor.seq, hash: anchor.hash })}\n`;
}

const HASH = /^[0-9a-f]{64}$/;
const count = (v: unknown) => typeof v === "number" && Number.isInteger(v) && v >= 0;

/** Reads the anchor file's text; a line that is not an anchor is a problem, never skipped (fail closed). */
export function parseAnchorLines(text: string): { anchors: LedgerAnchor[]; problem: string | null } {
  const anchors: LedgerAnchor[] = [];
  const lines = text.split("\n");
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i].trim();
    if (!line) continue;
    let value: Record<string, unknown> | null = null;
    try {
      value = JSON.parse(line);
    } catch {
      value = null;
    }
    const ok = value && typeof value.at === "string" && !Number.isNaN(Date.parse(value.at)) && count(value.events) && count(value.seq) && typeof value.hash === "string" && HASH.test(value.hash);
    if (!ok) return { anchors, problem: `Line ${i + 1} of the anchor file is not a ledger anchor (at, events, seq, hash); the file was damaged or edited.` };
    anchors.push({ at: value!.at as string, events: value!.events as number, seq: value!.seq as number, hash: value!.hash as string });
  }
  return { anchors, problem: null };
}

type Row = { seq: number; hash: string };
const shortHash = (hash: string) => `${hash.slice(0, 12)}…`;
const named = (a: LedgerAnchor, index: number) => `The anchor of ${a.at} (line ${index + 1})`;

/**
 * Compares the chain, walked in seq order, with the anchors: each anchor's event must be in the
 * database with the anchored hash and the anchored number of events up to it, and the database
 * must hold at least as many events as the last anchor. Feed every row with `visit`, then `finish`.
 * The problem names the first anchor (in file order) that disagrees.
 */
export function anchorComparison(anchors: LedgerAnchor[]) {
  const bySeq = new Map<number, number[]>();
  anchors.forEach((a, i) => bySeq.set(a.seq, [...(bySeq.get(a.seq) ?? []), i]));
  const problems = new Map<number, { problem: string; seq: number }>();
  const seen = new Set<number>();
  let walked = 0;
  let lastSeq = 0;

  function visit(row: Row) {
    walked++;
    lastSeq = row.seq;
    for (const i of bySeq.get(row.seq) ?? []) {
      seen.add(i);
      const a = anchors[i];
      if (a.hash !== row.hash) {
        problems.set(i, {
          seq: a.seq,
          problem: `${named(a, i)} recorded event ${a.seq} with hash ${shortHash(a.hash)}, but the database holds ${shortHash(row.hash)} there: the chain was rewritten.`,
        });
      } else if (a.events !== walked) {
        problems.set(i, { seq: a.seq, problem: `${named(a, i)} counted ${a.events} events up to event ${a.seq}, but the database holds ${walked}: events were deleted or added before it.` });
      }
    }
  }

  /** `complete` is false when the walk stopped early (a broken chain): later anchors were not compared. */
  function finish({ complete }: { complete: boolean }) {
    anchors.forEach((a, i) => {
      if (seen.has(i) || problems.has(i) || (a.seq === 0 && a.events === 0)) return;
      if (a.seq <= lastSeq) problems.set(i, { seq: a.seq, problem: `${named(a, i)} recorded event ${a.seq}, which is missing from the database.` });
      else if (complete) {
        problems.set(i, {
          seq: a.seq,
          problem: `The database holds ${walked} events (the last is event ${lastSeq}), fewer than ${named(a, i).replace("The anchor", "the anchor")} recorded (${a.events}, up to event ${a.seq}): events were deleted.`,
        });
      }
    });
    const first = [...problems.keys()].sort((x, y) => x - y)[0];
    return first === undefined ? null : { anchorIndex: first, ...problems.get(first)! };
  }

  return { visit, finish };
}

// The outside anchors of the audit ledger, compared with a chain given row by row. Hashes are
// made-up 64-hex strings (worked by hand: only equality matters here).
import { describe, expect, it } from "vitest";
import { anchorComparison, anchorLine, anchorOf, parseAnchorLines, type LedgerAnchor } from "@/lib/integrity/anchors";
import { ledgerHeadMail } from "@/lib/mail/templates";
import { SAFETY_SHORT } from "@/lib/safety";

const h = (n: number) => n.toString(16).padStart(64, "0");
const rows = (n: number) => Array.from({ length: n }, (_, i) => ({ seq: i + 1, hash: h(i + 1) }));
const anchor = (seq: number, events = seq, hash = h(seq), at = `2026-12-0${Math.min(seq, 9)}T06:15:00.000Z`): LedgerAnchor => ({ at, events, seq, hash });

function compare(anchors: LedgerAnchor[], chain: Array<{ seq: number; hash: string }>, complete = true) {
  const c = anchorComparison(anchors);
  chain.forEach(c.visit);
  return c.finish({ complete });
}

describe("anchor lines", () => {
  it("write and read back the same head, one JSON object per line", () => {
    const a = anchorOf({ events: 12, lastSeq: 12, lastHash: h(12) }, new Date("2026-12-01T06:15:00Z"));
    const text = anchorLine(a) + anchorLine(anchor(20));
    expect(text.split("\n")).toHaveLength(3);
    expect(parseAnchorLines(text)).toEqual({ anchors: [a, anchor(20)], problem: null });
  });

  it("a damaged line is a problem naming its line, never skipped", () => {
    for (const bad of [
      "{not json",
      '{"at":"2026-12-01T06:15:00Z","events":3,"seq":3}',
      '{"at":"soon","events":3,"seq":3,"hash":"' + h(3) + '"}',
      '{"at":"2026-12-01T06:15:00Z","events":-1,"seq":3,"hash":"' + h(3) + '"}',
    ]) {
      expect(parseAnchorLines(`${anchorLine(anchor(2))}\n${bad}\n`).problem).toMatch(/^Line 3 of the anchor file is not a ledger anchor/);
    }
  });
});

describe("comparing the chain with its anchors", () => {
  it("agrees when every anchored event is there with its hash and count", () => {
    expect(compare([anchor(2), anchor(5), anchor(5)], rows(7))).toBeNull();
    expect(compare([], rows(3))).toBeNull();
    expect(compare([anchor(0, 0, h(0))], [])).toBeNull();
  });

  it("names the first anchor (file order) whose hash the database no longer holds", () => {
    const rewritten = rows(7).map((r) => (r.seq >= 4 ? { ...r, hash: h(100 + r.seq) } : r));
    expect(compare([anchor(2), anchor(5), anchor(6)], rewritten)).toMatchObject({
      anchorIndex: 1,
      seq: 5,
      problem: expect.stringMatching(/^The anchor of .* \(line 2\) recorded event 5 .* the chain was rewritten\.$/),
    });
  });

  it("catches deleted last events, and events deleted in the middle with the chain re-linked", () => {
    expect(compare([anchor(3), anchor(6)], rows(4))).toMatchObject({
      anchorIndex: 1,
      problem: "The database holds 4 events (the last is event 4), fewer than the anchor of 2026-12-06T06:15:00.000Z (line 2) recorded (6, up to event 6): events were deleted.",
    });
    const gap = rows(6).filter((r) => r.seq !== 3);
    expect(compare([anchor(5)], gap)).toMatchObject({ problem: expect.stringMatching(/counted 5 events up to event 5, but the database holds 4/) });
    expect(compare([anchor(3)], gap)).toMatchObject({ problem: expect.stringMatching(/recorded event 3, which is missing from the database/) });
  });

  it("leaves anchors past a broken chain uncompared rather than calling them deleted", () => {
    expect(compare([anchor(2), anchor(6)], rows(3), false)).toBeNull();
    expect(compare([anchor(2), anchor(6)], rows(3), true)).toMatchObject({ anchorIndex: 1 });
  });
});

describe("the daily ledger-head mail", () => {
  const m = ledgerHeadMail({ siteName: "Harbour <Lane>", at: "2026-12-01 06:15:00", events: 4211, lastSeq: 4211, lastHash: h(4211), url: "https://papin.example/audit" });

  it("states the count, the last event and its hash, links to the ledger and carries the safety reminder", () => {
    expect(m.subject).toBe("Daily audit-ledger head for Harbour <Lane>: 4,211 events");
    for (const body of [m.text, m.html]) {
      expect(body).toContain("4,211 events");
      expect(body).toContain(`SHA-256 ${h(4211)}`);
      expect(body).toContain("https://papin.example/audit");
    }
    expect(m.text).toContain(SAFETY_SHORT);
    expect(m.html).toContain("Harbour &lt;Lane&gt;");
    expect(m.html).not.toContain("<Lane>");
  });
});

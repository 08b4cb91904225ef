// The lists (cycles, review queue, archive, audit ledger) are read in index order: SQLite's own
// EXPLAIN QUERY PLAN for each list's statements shows no temporary B-tree for the order and no full
// scan of cycles or audit_events (issue 12; "USE TEMP B-TREE" and "SCAN" are SQLite's plan words).
// The statements are the ones the query functions really send, captured at the client.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { InStatement } from "@libsql/client";
import { useTemporaryDatabase } from "../support/test-db";

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
let sent: Array<{ sql: string; args: unknown }> = [];
type Rows = { rows: Array<Record<string, unknown>> };
let execute: (s: InStatement) => Promise<Rows>;
const actor = { id: "u1", email: "t@example.test", name: "T", role: "engineer" as const, siteId: "site-1" };

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const client = (globalThis as unknown as { __papinDb: { client: { execute: (s: InStatement) => Promise<Rows> } } }).__papinDb.client;
  execute = client.execute.bind(client);
  client.execute = (stmt: InStatement) => {
    if (typeof stmt === "object") sent.push({ sql: stmt.sql, args: stmt.args });
    return execute(stmt);
  };
});
afterAll(() => ctx.cleanup());

/** Every plan line of every statement `run` sends. */
async function plansOf(run: () => Promise<unknown>): Promise<string[]> {
  sent = [];
  await run();
  const statements = sent;
  sent = [];
  const lines: string[] = [];
  for (const s of statements) {
    const plan = await execute({ sql: `EXPLAIN QUERY PLAN ${s.sql}`, args: s.args as never });
    lines.push(...plan.rows.map((r) => String(r.detail)));
  }
  expect(statements.length).toBeGreaterThan(0);
  return lines;
}

function expectIndexed(lines: string[], table: string) {
  expect(lines.join("\n")).not.toMatch(/TEMP B-TREE/);
  expect(lines.filter((l) => new RegExp(`^SCAN ${table}\\b`).test(l))).toEqual([]);
  expect(lines.some((l) => new RegExp(`^SEARCH ${table} USING (COVERING )?INDEX`).test(l))).toBe(true);
}

describe("cycle list plans", () => {
  const page = async (filter: Record<string, string>, sort: { key: string; direction: "asc" | "desc" }) => {
    const { listCycles } = await import("@/db/queries/cycles");
    return plansOf(() => listCycles({ actor, filter, page: 3, pageSize: 50, sort: sort as never }));
  };

  it("reads the default order (newest start first) from an index", async () => {
    const lines = await page({}, { key: "startedAt", direction: "desc" });
    expect(lines.join("\n")).toMatch(/cycles_site_started_idx/);
    expectIndexed(lines, "cycles");
  });

  it("reads the review queue (submitted, oldest submission first) from an index", async () => {
    const lines = await page({ status: "submitted" }, { key: "submittedAt", direction: "asc" });
    expect(lines.join("\n")).toMatch(/cycles_site_status_submitted_idx/);
    expectIndexed(lines, "cycles");
  });

  it.each([
    [{ status: "approved" }, { key: "startedAt", direction: "desc" }],
    [{ verdict: "fail" }, { key: "startedAt", direction: "desc" }],
    [{ sterilizer: "st-1" }, { key: "startedAt", direction: "desc" }],
    [{}, { key: "createdAt", direction: "asc" }],
    [{}, { key: "cycleNumber", direction: "desc" }],
    [{}, { key: "status", direction: "asc" }],
    [{}, { key: "verdict", direction: "desc" }],
    [{}, { key: "submittedAt", direction: "desc" }],
    [{}, { key: "sterilizer", direction: "asc" }],
    [{ status: "approved" }, { key: "sterilizer", direction: "desc" }],
  ] as const)("filter %j, sort %j: no sort of every row", async (filter, sort) => {
    expectIndexed(await page(filter, sort), "cycles");
  });

  it("sorts by sterilizer name walking the site's sterilizers by name, then each one's cycles by start", async () => {
    const lines = await page({}, { key: "sterilizer", direction: "asc" });
    expect(lines.join("\n")).toMatch(/sterilizers_site_name_idx/);
    expect(lines.join("\n")).toMatch(/cycles_sterilizer_started_idx/);
  });

  it.each([
    [{ q: "autoclave" }, { key: "startedAt", direction: "desc" }],
    [{ q: "50%_x" }, { key: "sterilizer", direction: "asc" }],
    [
      { q: "BD-2024", status: "approved" },
      { key: "cycleNumber", direction: "asc" },
    ],
  ] as const)("search %j, sort %j: the text is looked up in the trigram index, never in every cycle", async (filter, sort) => {
    const lines = await page(filter, sort);
    expect(lines.join("\n")).toMatch(/SCAN cycles_search VIRTUAL TABLE INDEX/);
    expect(lines.filter((l) => /^SCAN cycles\b/.test(l))).toEqual([]);
  });
});

describe("archive and audit ledger plans", () => {
  it("reads the archive newest report first from an index, cycles by key", async () => {
    const { listArchivedReports } = await import("@/db/queries/reviews");
    const lines = await plansOf(() => listArchivedReports({ actor: actor as never }));
    expect(lines.join("\n")).not.toMatch(/TEMP B-TREE/);
    expect(lines.join("\n")).toMatch(/reports_created_idx/);
    expect(lines.filter((l) => /^SCAN cycles\b/.test(l))).toEqual([]);
  });

  it.each([{}, { action: "cycle.create" }, { entityType: "cycle", entityId: "c1" }])("reads the site's audit events newest first from an index (filter %j)", async (filter) => {
    const { listAuditEventsOfSite } = await import("@/db/queries/audit");
    const lines = await plansOf(() => listAuditEventsOfSite({ siteId: "site-1", filter }));
    expectIndexed(lines, "audit_events");
  });
});

describe("archive page plans", () => {
  it("reads an archive page newest report first from an index, with the count kept off a scan of cycles", async () => {
    const { listArchivedReports, countArchivedReports } = await import("@/db/queries/reviews");
    const lines = await plansOf(() => listArchivedReports({ actor: actor as never, q: "BD", page: 2, pageSize: 50 }));
    expect(lines.join("\n")).not.toMatch(/TEMP B-TREE/);
    const counted = await plansOf(() => countArchivedReports({ actor: actor as never, q: "BD" }));
    expect(counted.filter((l) => /^SCAN cycles\b/.test(l))).toEqual([]);
  });
});

describe("count plans", () => {
  it("plans the count from an index too", async () => {
    const { countCycles } = await import("@/db/queries/cycles");
    for (const filter of [{}, { status: "submitted" as const }, { sterilizer: "st-1" }]) {
      const lines = await plansOf(() => countCycles({ actor, filter }));
      expect(lines.filter((l) => /^SCAN cycles\b/.test(l))).toEqual([]);
    }
  });
});

// The home page, the status board and the sterilizers page (issue 12): each reads per sterilizer through an index
// (migration 0019) what used to be ranked, grouped or sorted over every cycle of the site.
const noFullRead = (lines: string[]) => {
  expect(lines.join("\n")).not.toMatch(/TEMP B-TREE/);
  expect(lines.filter((l) => /^SCAN (cycles|c)\b/.test(l))).toEqual([]);
};

describe("status board, sterilizers page and home plans", () => {
  it.each([{}, { sterilizerId: "st-1" }])("finds each sterilizer's latest confirmed pass and failure by index lookups (%j)", async (one) => {
    const { listConfirmedOutcomes } = await import("@/db/queries/sterilizer-status");
    const lines = await plansOf(() => listConfirmedOutcomes({ siteId: "site-1", ...one }));
    noFullRead(lines);
    expect(lines.filter((l) => /^SEARCH c USING INDEX cycles_outcome_idx \(sterilizer_id=\? AND test_kind=\? AND <expr>=\?\)/.test(l)).length).toBeGreaterThan(0);
    expect(lines.filter((l) => /^SEARCH c USING INDEX cycles_outcome_idx \(sterilizer_id=\? AND test_kind>\?\)/.test(l)).length).toBeGreaterThan(0);
    expect(lines.filter((l) => /^SCAN p\b/.test(l))).toEqual([]);
  });

  it("finds each sterilizer's latest cycle by one index lookup each", async () => {
    const { listLatestCycleOfEachSterilizer } = await import("@/db/queries/sterilizers");
    const lines = await plansOf(() => listLatestCycleOfEachSterilizer({ siteId: "site-1" }));
    noFullRead(lines);
    expect(lines.join("\n")).toMatch(/SEARCH c USING INDEX cycles_sterilizer_at_idx \(sterilizer_id=\?\)/);
  });

  it("reads a sterilizer's recent cycles newest first from an index", async () => {
    const { listRecentCyclesOfSterilizer } = await import("@/db/queries/sterilizers");
    const lines = await plansOf(() => listRecentCyclesOfSterilizer({ siteId: "site-1", sterilizerId: "st-1", limit: 10 }));
    noFullRead(lines);
    expect(lines.join("\n")).toMatch(/cycles_sterilizer_at_idx/);
  });

  it("reads the auditor's recently approved cycles from an index in their order", async () => {
    const { listRecentlyApproved } = await import("@/db/queries/dashboard");
    const lines = await plansOf(() => listRecentlyApproved({ siteId: "site-1" }));
    noFullRead(lines);
    expect(lines.join("\n")).toMatch(/SEARCH cycles USING INDEX cycles_site_status_updated_idx \(site_id=\? AND status=\?\)/);
  });

  it("finds a person's open cycles through the site-and-status index, sorting only those", async () => {
    const { listMyOpenCycles } = await import("@/db/queries/dashboard");
    const lines = await plansOf(() => listMyOpenCycles({ siteId: "site-1", userId: "u1" }));
    expect(lines.filter((l) => /^SCAN (cycles|c)\b/.test(l))).toEqual([]);
    expect(lines.join("\n")).toMatch(/SEARCH cycles USING INDEX cycles_site_status_\w+_idx \(site_id=\? AND status=\?\)/);
  });

  it.each([
    [{ q: "test pack" }, { key: "startedAt", direction: "desc" }],
    [{ q: "test pack" }, { key: "sterilizer", direction: "asc" }],
    [
      { q: "test pack", status: "approved" },
      { key: "startedAt", direction: "desc" },
    ],
  ] as const)("walks a broad search %j in the page's index order, sort %j, testing each row against the matches", async (filter, sort) => {
    const { listCycles } = await import("@/db/queries/cycles");
    const lines = await plansOf(() => listCycles({ actor, filter, page: 3, pageSize: 50, sort, broadSearchAt: 0 }));
    noFullRead(lines);
    expect(lines.join("\n")).toMatch(/SEARCH k USING COVERING INDEX sqlite_autoindex_cycle_search_rows_1 \(cycle_id=\?\)/);
    expect(lines.some((l) => /^SEARCH cycles USING (COVERING )?INDEX/.test(l))).toBe(true);
  });
});

describe("schedule plans", () => {
  it("finds the latest passing and failed cycle of each sterilizer and kind by index lookups, and counts only unsigned cycles", async () => {
    const { getScheduleFacts } = await import("@/db/queries/periodic-tests");
    const lines = await plansOf(() => getScheduleFacts({ siteId: "site-1", cycleEvidencedKinds: ["thermometric-small-load", "thermometric-full-load"] }));
    expect(lines.filter((l) => /^SCAN (cycles|c)\b/.test(l))).toEqual([]);
    expect(lines.filter((l) => /^SEARCH c USING INDEX cycles_outcome_idx \(sterilizer_id=\? AND test_kind=\? AND <expr>=\?\)/.test(l)).length).toBeGreaterThanOrEqual(2);
    // The unsigned cycles (draft, submitted) are grouped after the site-and-status index found them, not every cycle.
    expect(lines.join("\n")).toMatch(/SEARCH cycles USING INDEX cycles_site_status_\w+_idx \(site_id=\? AND status=\?\)/);
    expect(lines.filter((l) => /TEMP B-TREE/.test(l) && !/GROUP BY/.test(l))).toEqual([]);
  });
});

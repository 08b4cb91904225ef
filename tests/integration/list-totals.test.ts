// List totals are counted once per site and filter and reused until the audit ledger moves on
// (every change to a record appends an event), so a page does not count every row each time (issue 12).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { InStatement } from "@libsql/client";
import { useTemporaryDatabase } from "../support/test-db";

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
beforeAll(async () => {
  ctx = await useTemporaryDatabase();
});
afterAll(() => ctx.cleanup());

describe("cached list totals", () => {
  it("counts once per site and filter, and again after any change appends an audit event", async () => {
    const { cachedTotal } = await import("@/lib/services/list-totals");
    const { recordAuditEvent } = await import("@/db/queries/audit");
    let counts = 0;
    const count = async () => ++counts;
    const ask = (filter: object, siteId = "site-1") => cachedTotal({ list: "test", siteId, filter, count });
    expect(await ask({ status: "submitted" })).toBe(1);
    expect(await ask({ status: "submitted" })).toBe(1);
    expect(await ask({ status: "approved" })).toBe(2);
    expect(await ask({ status: "submitted" }, "site-2")).toBe(3);
    await recordAuditEvent({ action: "cycle.create", entityType: "cycle", entityId: "c1", siteId: "site-1" });
    expect(await ask({ status: "submitted" })).toBe(4);
    expect(await ask({ status: "submitted" })).toBe(4);
  });
});

describe("totals of the audit ledger and the archive", () => {
  const auditor = { id: "u1", email: "t@example.test", name: "T", role: "auditor" as const, siteId: "site-1" };
  /** How many COUNT statements `run` sends (captured at the client). */
  const countsSent = (run: () => Promise<unknown>) => statementsSent(/\bcount\(/i, run);

  /** How many statements matching `pattern` `run` sends (captured at the client). */
  async function statementsSent(pattern: RegExp, run: () => Promise<unknown>): Promise<number> {
    const client = (globalThis as unknown as { __papinDb: { client: { execute: (s: InStatement) => Promise<unknown> } } }).__papinDb.client;
    const execute = client.execute;
    let n = 0;
    client.execute = (stmt: InStatement) => {
      if (typeof stmt === "object" && pattern.test(stmt.sql)) n++;
      return execute.call(client, stmt);
    };
    try {
      await run();
    } finally {
      client.execute = execute;
    }
    return n;
  }

  it("counts each once per filter, not per page, and again once the ledger gains an event", async () => {
    const { listAuditEvents } = await import("@/lib/services/audit");
    const { getArchivePage } = await import("@/lib/services/archive");
    const { recordAuditEvent } = await import("@/db/queries/audit");
    const audit = (filter: object) => countsSent(() => listAuditEvents({ actor: auditor, filter }));
    const archive = (filter: object) => countsSent(() => getArchivePage({ actor: auditor, ...filter }));
    expect(await audit({ action: "cycle.create", page: 1 })).toBe(1);
    expect(await audit({ action: "cycle.create", page: 2, pageSize: 20 })).toBe(0);
    expect(await audit({ action: "sign-in", page: 1 })).toBe(1);
    expect(await archive({ q: "BD-1", page: 1 })).toBe(1);
    expect(await archive({ q: "BD-1", page: 3 })).toBe(0);
    await recordAuditEvent({ action: "cycle.create", entityType: "cycle", entityId: "c1", siteId: "site-1" });
    expect(await audit({ action: "cycle.create", page: 2 })).toBe(1);
    expect(await archive({ q: "BD-1", page: 1 })).toBe(1);
  });

  it("counts the audit trail page's total once per filter as well, not on every page", async () => {
    const { getAuditTrail } = await import("@/lib/services/audit-trail");
    const { recordAuditEvent } = await import("@/db/queries/audit");
    const trail = (page: number) => countsSent(() => getAuditTrail({ actor: auditor, query: { action: "cycle.sign.approved" }, page }));
    const first = await trail(1);
    // The chain check may count too; what the cache saves is the total's own COUNT, one per filter.
    expect(await trail(2)).toBe(first - 1);
    expect(await trail(1)).toBe(first - 1);
    await recordAuditEvent({ action: "cycle.sign.approved", entityType: "cycle", entityId: "c1", siteId: "site-1" });
    expect(await trail(1)).toBe(first);
  });

  it("looks a search text up in the trigram index once, not on every page", async () => {
    const { listCycles } = await import("@/lib/services/cycles");
    const engineer = { ...auditor, role: "engineer" as const };
    const search = (page: number) => countsSent(() => listCycles({ actor: engineer, query: { q: "Autoclave", page } }));
    // The first page counts the matches in the index (to tell a broad text) and the cycles; the next counts nothing.
    expect(await search(1)).toBe(2);
    expect(await search(2)).toBe(0);
  });

  it("reads a cycles page once while the ledger stands still, and again once it gains an event", async () => {
    const { listCycles } = await import("@/lib/services/cycles");
    const { recordAuditEvent } = await import("@/db/queries/audit");
    const engineer = { ...auditor, role: "engineer" as const };
    const pageReads = (query: object) => statementsSent(/from "cycles".*\blimit\b/is, () => listCycles({ actor: engineer, query }));
    expect(await pageReads({ page: 1 })).toBe(1);
    expect(await pageReads({ page: 1 })).toBe(0);
    expect(await pageReads({ page: 2 })).toBe(1);
    expect(await pageReads({ page: 1, status: "approved" })).toBe(1);
    expect(await pageReads({ page: 1, sort: "cycleNumber:asc" })).toBe(1);
    await recordAuditEvent({ action: "cycle.create", entityType: "cycle", entityId: "c2", siteId: "site-1" });
    expect(await pageReads({ page: 1 })).toBe(1);
  });
});

// List totals are counted once per site and filter and reused until the audit ledger moves on
// (every change to a record appends an event), so a page does not count every row each time (issue 12).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
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

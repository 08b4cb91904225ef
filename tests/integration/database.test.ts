import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { failureOf, useTemporaryDatabase } from "../support/test-db";

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
});
afterAll(() => ctx.cleanup());

describe("migrations on a new database file", () => {
  it("create every table of the product", async () => {
    const rows = await ctx.db.all<{ name: string }>(sql`select name from sqlite_master where type = 'table' order by name`);
    const names = rows.map((r) => r.name);
    for (const table of [
      "sites",
      "users",
      "sterilizers",
      "instruments",
      "calibration_certificates",
      "acceptance_profiles",
      "cycles",
      "logger_files",
      "analyses",
      "signatures",
      "audit_events",
      "mail_outbox",
      "periodic_tests",
      "test_schedules",
      "api_tokens",
      "reports",
    ]) {
      expect(names).toContain(table);
    }
    // Dropped in 0002: nothing ever read or wrote it.
    expect(names).not.toContain("settings");
  });

  it("apply twice without error (a restart re-runs them)", async () => {
    const { migrateDatabase } = await import("@/db/migrate");
    await expect(migrateDatabase(ctx.db)).resolves.toBeUndefined();
  });

  it("enforce foreign keys", async () => {
    expect(await failureOf(ctx.db.run(sql`insert into sterilizers (id, site_id, name, serial_number, chamber_volume_l) values ('s1', 'no-such-site', 'x', 'y', 10)`))).toMatch(/FOREIGN KEY/i);
  });
});

describe("the audit ledger", () => {
  it("chains events and verifies an untouched chain", async () => {
    const { recordAuditEvent } = await import("@/db/queries/audit");
    const { verifyAuditChain } = await import("@/lib/services/audit");
    await recordAuditEvent({ action: "test.one", entityType: "test", entityId: "a", newValue: { x: 1 } });
    await recordAuditEvent({ action: "test.two", entityType: "test", entityId: "b", oldValue: { x: 1 }, newValue: { x: 2 }, reason: "correction" });
    const state = await verifyAuditChain();
    expect(state).toMatchObject({ ok: true, events: 2 });
  });

  it("refuses UPDATE and DELETE through its triggers", async () => {
    expect(await failureOf(ctx.db.run(sql`update audit_events set reason = 'rewritten' where seq = 1`))).toMatch(/append-only/);
    expect(await failureOf(ctx.db.run(sql`delete from audit_events where seq = 1`))).toMatch(/append-only/);
  });

  it("names the first broken link when a row is altered behind the triggers' back", async () => {
    const { recordAuditEvent } = await import("@/db/queries/audit");
    const { verifyAuditChain } = await import("@/lib/services/audit");
    await recordAuditEvent({ action: "test.three", entityType: "test", entityId: "c" });
    await ctx.db.run(sql`drop trigger audit_events_no_update`);
    await ctx.db.run(sql`update audit_events set new_value = '{"x":3}' where seq = 2`);
    const state = await verifyAuditChain();
    expect(state.ok).toBe(false);
    expect(state.firstBrokenAt).toBe(2);
  });
});

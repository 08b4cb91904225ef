import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { useTemporaryDatabase } from "../support/test-db";

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
});
afterAll(() => ctx.cleanup());

const TABLES = [
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
  "reports",
  "audit_events",
  "periodic_tests",
  "test_schedules",
  "mail_outbox",
];

async function counts() {
  const out: Record<string, number> = {};
  for (const t of TABLES) out[t] = (await ctx.db.all<{ n: number }>(sql.raw(`select count(*) as n from ${t}`)))[0].n;
  return out;
}

describe("the demo loader", () => {
  it("fills an empty database with a site, one user per role, sterilizers, profiles and analysed cycles including failures", { timeout: 180_000 }, async () => {
    const { loadDemoSite } = await import("@/db/seed");
    const outcome = await loadDemoSite(ctx.db, { password: "demo password 1" });
    expect(outcome.loaded).toBe(true);
    const c = await counts();
    expect(c.sites).toBe(1);
    expect(c.users).toBe(4);
    expect(c.sterilizers).toBeGreaterThanOrEqual(3);
    expect(c.cycles).toBeGreaterThan(20);
    expect(c.analyses).toBe(c.cycles);
    expect(c.reports).toBeGreaterThan(0);
    const roles = await ctx.db.all<{ role: string }>(sql`select role from users order by role`);
    expect(roles.map((r) => r.role)).toEqual(["admin", "auditor", "engineer", "technician"]);
    const profiles = await ctx.db.all<{ t: number; h: number }>(sql`select sterilization_temp_c as t, holding_time_s as h from acceptance_profiles`);
    expect(profiles).toEqual(
      expect.arrayContaining([
        { t: 134, h: 180 },
        { t: 121, h: 900 },
      ]),
    );
    const verdicts = await ctx.db.all<{ verdict: string; n: number }>(sql`select verdict, count(*) as n from cycles group by verdict`);
    expect(verdicts.find((v) => v.verdict === "fail")?.n).toBeGreaterThanOrEqual(4);
    const kinds = await ctx.db.all<{ id: string }>(sql`select distinct j.value ->> 'id' as id from analyses, json_each(json_extract(result, '$.checks')) j where j.value ->> 'passed' = 0`);
    expect(kinds.map((k) => k.id)).toEqual(expect.arrayContaining(["holding-time", "saturation", "equilibration-time"]));
  });

  it("changes nothing when run a second time", async () => {
    const { loadDemoSite } = await import("@/db/seed");
    const before = await counts();
    const outcome = await loadDemoSite(ctx.db, { password: "demo password 1" });
    expect(outcome.loaded).toBe(false);
    expect(await counts()).toEqual(before);
  });

  it("leaves the audit chain intact", async () => {
    const { verifyAuditChain } = await import("@/lib/services/audit");
    expect((await verifyAuditChain()).ok).toBe(true);
  });
});

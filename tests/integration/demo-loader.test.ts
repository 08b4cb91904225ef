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
    // four roles; engineers three, since a qualification study is signed by its author, a reviewer and quality assurance (issue 14)
    expect(c.users).toBe(6);
    expect(c.sterilizers).toBeGreaterThanOrEqual(3);
    expect(c.cycles).toBeGreaterThan(20);
    expect(c.analyses).toBe(c.cycles);
    // Like intake (issue 12): each analysis stores its recording's columns, so a demo chart or report never re-parses the file.
    const withoutSeries = await ctx.db.all<{ id: string }>(
      sql`select c.id from cycles c left join analysis_series s on s.analysis_id = c.current_analysis_id where s.analysis_id is null or s.sample_count < 2`,
    );
    expect(withoutSeries).toEqual([]);
    expect(c.reports).toBeGreaterThan(0);
    const roles = await ctx.db.all<{ role: string }>(sql`select distinct role from users order by role`);
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

  it("tells the fitness story: exactly one sterilizer out of use after a confirmed Bowie-Dick failure, one released after a passing repeat", async () => {
    const { getStatusBoard, listSterilizerStatusHistory } = await import("@/lib/services/sterilizer-status");
    const [engineer] = await ctx.db.all<{ id: string; email: string; name: string; role: "engineer"; siteId: string }>(
      sql`select id, email, name, role, site_id as siteId from users where email = 'engineer@papin.example'`,
    );
    const board = await getStatusBoard({ actor: engineer });
    expect(board.length).toBe(4);
    const out = board.filter((b) => b.status === "out-of-use");
    expect(out.map((b) => b.name)).toEqual(["Porous load 2"]);
    // The status rule's sentence for a required test whose latest signed outcome is a failure (lib/periodic-tests/status.ts).
    expect(out[0].statusReason).toMatch(/^The Bowie-Dick test of \d{4}-\d{2}-\d{2} failed \(confirmed\); it must pass again before use\.$/);
    expect(Date.parse(out[0].statusSince)).toBeLessThanOrEqual(Date.now());

    // Each story record carries its photo (a PNG, by its first bytes) and the engineer's signature; the held one is failure-confirmed.
    const story = await ctx.db.all<{ sterilizer: string; result: string; status: string; meaning: string; signer: string; contentType: string; sha256: string; head: string }>(sql`
      select s.name as sterilizer, p.result, p.status, g.meaning, g.printed_name as signer, a.content_type as contentType, a.sha256, hex(substr(a.bytes, 1, 8)) as head
        from periodic_tests p join sterilizers s on s.id = p.sterilizer_id
        join periodic_test_signatures g on g.periodic_test_id = p.id
        join attachments a on a.owner_kind = 'periodic-test' and a.owner_id = p.id
       order by p.performed_at`);
    expect(story.map((r) => [r.sterilizer, r.result, r.status, r.meaning, r.signer])).toEqual(
      expect.arrayContaining([
        ["Porous load 2", "fail", "failure-confirmed", "failure-confirmed", "Amara Osei"],
        ["Theatre benchtop", "fail", "failure-confirmed", "failure-confirmed", "Amara Osei"],
        ["Theatre benchtop", "pass", "approved", "approved", "Amara Osei"],
      ]),
    );
    expect(story).toHaveLength(3);
    for (const r of story) {
      expect(r.contentType).toBe("image/png");
      expect(r.head).toBe("89504E470D0A1A0A"); // the PNG signature (PNG specification §5.2)
      expect(r.sha256).toMatch(/^[0-9a-f]{64}$/);
    }
    const pending = await ctx.db.all<{ n: number }>(sql`select count(*) as n from periodic_tests where performed_at > ${new Date().toISOString()}`);
    expect(pending[0].n).toBe(0); // nothing dated in the future

    // The released sterilizer's history: out of use on the confirmed failure, then in use on the approved repeat.
    const benchtop = board.find((b) => b.name === "Theatre benchtop")!;
    expect(benchtop.status).toBe("in-use");
    const history = await listSterilizerStatusHistory({ actor: engineer, sterilizerId: benchtop.id });
    expect(history.map((e) => [e.status, e.cause])).toEqual([
      ["in-use", "periodic-test.sign.approved"],
      ["out-of-use", "periodic-test.sign.failure-confirmed"],
    ]);
    expect(history[1].reason).toMatch(/hollow load test \(helix\) .* failed \(confirmed\)/i);
  });

  it("places the story's morning times today in the site's zone, in order, never after now", async () => {
    const { thisMorning } = await import("@/db/demo-story");
    // After 10:05 local the clock times stand: 06:40 BST is 05:40 UTC (Europe/London is UTC+1 in July).
    expect(thisMorning(new Date("2025-07-10T12:00:00Z"), "Europe/London", "06:40").toISOString()).toBe("2025-07-10T05:40:00.000Z");
    // Loaded at 02:00 GMT: the morning (10 h 05 min) is squeezed into the 2 h since midnight; 08:05 → 485 min × 120/605 = 96.2 min (worked by hand).
    const early = new Date("2025-03-10T02:00:00Z");
    const times = ["06:30", "06:40", "08:05"].map((t) => thisMorning(early, "Europe/London", t).getTime());
    expect(times[2]).toBeCloseTo(Date.parse("2025-03-10T00:00:00Z") + (485 * 120 * 60_000) / 605, -1);
    expect(times[0]).toBeLessThan(times[1]);
    expect(times[1]).toBeLessThan(times[2]);
    expect(times[2]).toBeLessThan(early.getTime());
  });

  it("marks every cycle it makes as demo data, so db:seed-load accepts the database without --force", async () => {
    const { nonDemoData } = await import("@/db/demo-data");
    const [site] = await ctx.db.all<{ id: string }>(sql`select id from sites`);
    const unmarked = await ctx.db.all<{ n: string }>(sql`select cycle_number as n from cycles where load_description not like '%(demo%'`);
    expect(unmarked).toEqual([]);
    expect(await nonDemoData(ctx.db, site.id)).toBeNull();
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

import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { useTemporaryDatabase } from "../support/test-db";

// The demo site a practitioner would believe (issue 13, item 6): schedules fit each sterilizer, nothing is dated after
// the demo's own clock, and the work is spread over the day shift.
let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
let clock: Date;
let loadedBy: Date;

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { loadDemoSite } = await import("@/db/seed");
  clock = new Date();
  await loadDemoSite(ctx.db, { password: "demo password 1", now: clock });
  loadedBy = new Date();
}, 180_000);
afterAll(() => ctx.cleanup());

const all = <T>(query: ReturnType<typeof sql>) => ctx.db.all<T>(query);

describe("the demo site", () => {
  it("dates no cycle or periodic test after the demo clock, and no signature, report or status event after the load", async () => {
    const dated = await all<{ at: string }>(sql`select started_at as at from cycles union all select created_at from cycles union all select submitted_at from cycles where submitted_at is not null
      union all select performed_at from periodic_tests`);
    expect(dated.length).toBeGreaterThan(100);
    for (const { at } of dated) expect(Date.parse(at)).toBeLessThanOrEqual(clock.getTime());
    // Signatures, reports and status events are made by the real workflow while the demo loads: at that moment, never later.
    const recorded = await all<{ at: string }>(sql`select signed_at as at from signatures union all select signed_at from periodic_test_signatures
      union all select at from sterilizer_status_events union all select since from sterilizer_status_events union all select at from audit_events`);
    expect(recorded.length).toBeGreaterThan(10);
    for (const { at } of recorded) expect(Date.parse(at)).toBeLessThanOrEqual(loadedBy.getTime());
  });

  it("schedules each sterilizer for the tests of its kind", async () => {
    const rows = await all<{ name: string; kinds: string }>(sql`select s.name, group_concat(t.kind) as kinds from sterilizers s join test_schedules t on t.sterilizer_id = s.id group by s.id`);
    const kinds = Object.fromEntries(rows.map((r) => [r.name, r.kinds.split(",").sort()]));
    // Porous load (EN 285): daily Bowie-Dick, weekly air leakage (HTM 01-01 Part C, common practice), quarterly small load, yearly steam quality.
    expect(kinds["Porous load 1"]).toEqual(["air-leakage", "bowie-dick", "steam-non-condensable-gas", "thermometric-small-load"]);
    // Fluids: no porous-load test (no Bowie-Dick, no air leakage, no steam-penetration); its yearly thermometric test.
    expect(kinds["Fluids and media"]).toEqual(["thermometric-full-load"]);
    // Type B benchtop, 23 l (EN 13060): its hollow load (helix) test instead of the porous-load Bowie-Dick, and air leakage.
    expect(kinds["Theatre benchtop"]).toEqual(["air-leakage", "hollow-load", "thermometric-small-load"]);
    const tests = await all<{ name: string; kind: string }>(sql`select distinct s.name, p.kind from periodic_tests p join sterilizers s on s.id = p.sterilizer_id`);
    for (const t of tests) expect(kinds[t.name]).toContain(t.kind);
  });

  it("judges the fluids sterilizer with a fluids profile and the benchtop with an EN 13060 one", async () => {
    const rows = await all<{
      name: string;
      profile: string;
      basis: string;
      hold: number;
      eq: number;
    }>(sql`select s.name, p.name as profile, p.basis, p.holding_time_s as hold, p.max_equilibration_s as eq
      from sterilizers s join acceptance_profiles p on p.id = s.default_profile_id`);
    const of = (name: string) => rows.find((r) => r.name === name)!;
    expect(of("Fluids and media")).toMatchObject({ profile: "121 °C / 15 min fluids (media bottles)", basis: "iso-17665", hold: 900 });
    expect(of("Fluids and media").eq).toBeGreaterThan(15); // not the porous-load 15 s of EN 285
    expect(of("Theatre benchtop")).toMatchObject({ basis: "en-13060" });
    const fluidsCycles = await all<{ kind: string }>(sql`select distinct c.test_kind as kind from cycles c join sterilizers s on s.id = c.sterilizer_id where s.name = 'Fluids and media'`);
    expect(fluidsCycles.map((c) => c.kind)).toEqual(["thermometric-full-load"]);
  });

  it("spreads the work over weekdays in the day shift, not all at one minute", async () => {
    const { localDate } = await import("@/lib/periodic-tests/schedule");
    const starts = (await all<{ at: string }>(sql`select started_at as at from cycles`)).map((r) => r.at);
    const local = (iso: string) => new Intl.DateTimeFormat("en-GB", { timeZone: "Europe/London", hour: "2-digit", minute: "2-digit", hourCycle: "h23" }).format(new Date(iso));
    for (const at of starts) {
      const weekday = new Date(`${localDate(at, "Europe/London")}T12:00:00Z`).getUTCDay();
      expect(weekday).not.toBe(0);
      expect(weekday).not.toBe(6);
      expect(local(at) >= "07:00" && local(at) <= "16:00").toBe(true);
    }
    expect(new Set(starts.map(local)).size).toBeGreaterThan(starts.length / 2);
    const morning = (await all<{ at: string }>(sql`select performed_at as at from periodic_tests where kind in ('bowie-dick', 'hollow-load')`)).map((r) => local(r.at));
    expect(new Set(morning).size).toBeGreaterThan(10);
  });
});

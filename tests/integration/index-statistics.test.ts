// A database that holds planner statistics (db:seed-load runs ANALYZE) gets a new index measured when it is migrated:
// without a sqlite_stat1 row SQLite guesses, and at 100,000 cycles it took migration 0019's sterilizer index for the
// cycles list sorted by sterilizer and sorted every row (issue 12). A database without statistics stays without.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { useTemporaryDatabase } from "../support/test-db";

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  await ctx.db.run(sql.raw(`insert into sites (id, name, code) values ('site-1', 'One', 'O')`));
  await ctx.db.run(sql.raw(`insert into users (id, site_id, email, name, role, password_hash) values ('u1', 'site-1', 'u@example.test', 'U', 'engineer', 'x')`));
  await ctx.db.run(sql.raw(`insert into acceptance_profiles (id, site_id, name, sterilization_temp_c, holding_time_s, basis) values ('p1', 'site-1', 'P', 134, 180, 'iso-17665')`));
  await ctx.db.run(sql.raw(`insert into sterilizers (id, site_id, name, serial_number, chamber_volume_l) values ('st-1', 'site-1', 'A', 'A', 100)`));
  await ctx.db.run(
    sql.raw(`insert into cycles (id, site_id, sterilizer_id, profile_id, cycle_number, status, verdict, started_at, created_by) values
      ('c1', 'site-1', 'st-1', 'p1', '1', 'approved', 'pass', '2026-01-01T08:00:00Z', 'u1'), ('c2', 'site-1', 'st-1', 'p1', '2', 'failure-confirmed', 'fail', '2026-01-02T08:00:00Z', 'u1')`),
  );
});
afterAll(() => ctx.cleanup());

const statsOf = (index: string) => ctx.db.all<{ stat: string }>(sql`select stat from sqlite_stat1 where idx = ${index}`);
const hasStatsTable = async () => (await ctx.db.all(sql`select 1 from sqlite_master where name = 'sqlite_stat1'`)).length > 0;

describe("statistics of a new index", () => {
  it("are not made in a database that has none", async () => {
    const { migrateDatabase } = await import("@/db/migrate");
    await migrateDatabase(ctx.db);
    expect(await hasStatsTable()).toBe(false);
  });

  it("are measured at migration when the database holds statistics for the index's table", async () => {
    await ctx.db.run(sql`ANALYZE`);
    expect(await statsOf("cycles_sterilizer_at_idx")).toEqual([{ stat: "2 2 1 1" }]);
    // As if the index had just been added: its table is measured, the index is not.
    await ctx.db.run(sql`delete from sqlite_stat1 where idx = 'cycles_sterilizer_at_idx'`);
    const { migrateDatabase } = await import("@/db/migrate");
    await migrateDatabase(ctx.db);
    expect(await statsOf("cycles_sterilizer_at_idx")).toEqual([{ stat: "2 2 1 1" }]);
  });
});

// The cycles list's free-text search (q) goes through the FTS5 trigram index of migration 0018 (issue 12): a text of
// three characters or more is found as a substring of the number, load description or sterilizer name, case and
// accents ignored; shorter text is compared row by row. Either way the text is taken as typed: no wildcard, no query
// syntax. Triggers keep the index in step with new, corrected and deleted cycles and renamed sterilizers.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { useTemporaryDatabase } from "../support/test-db";

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const actorOf = (siteId: string) => ({ id: "u1", email: "t@example.test", name: "T", role: "engineer" as const, siteId });
const north = actorOf("site-n");

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const run = (s: string) => ctx.db.run(sql.raw(s));
  await run(`insert into sites (id, name, code) values ('site-n', 'North', 'N'), ('site-s', 'South', 'S')`);
  await run(`insert into users (id, site_id, email, name, role, password_hash) values ('u1', 'site-n', 't@example.test', 'T', 'engineer', 'x')`);
  await run(`insert into acceptance_profiles (id, site_id, name, sterilization_temp_c, holding_time_s, basis) values ('p1', 'site-n', 'P', 134, 180, 'iso-17665')`);
  await run(
    `insert into sterilizers (id, site_id, name, serial_number, chamber_volume_l) values ('st-a', 'site-n', 'Autoclave Nord', 'A1', 100), ('st-b', 'site-n', 'Bench unit', 'B1', 20), ('st-s', 'site-s', 'Autoclave Süd', 'S1', 100)`,
  );
  const cycle = (id: string, site: string, sterilizer: string, number: string, load: string, day: number) =>
    `('${id}', '${site}', '${sterilizer}', 'p1', '${number}', '${load}', '2026-01-${String(day).padStart(2, "0")}T08:00:00Z', 'u1')`;
  await run(
    `insert into cycles (id, site_id, sterilizer_id, profile_id, cycle_number, load_description, started_at, created_by) values ${[
      cycle("c1", "site-n", "st-a", "BD-2024-001", "Wrapped instruments 50% full", 1),
      cycle("c2", "site-n", "st-a", "BD-2024-002", "Textile pack_7, Stérile", 2),
      cycle("c3", "site-n", "st-b", "LT-17", "Porous load", 3),
      cycle("c4", "site-n", "st-b", "X_1", "Empty chamber", 4),
      cycle("c5", "site-s", "st-s", "BD-2024-003", "Wrapped instruments", 5),
    ].join(", ")}`,
  );
});
afterAll(() => ctx.cleanup());

async function found(q: string, actor = north) {
  const { listCycles, countCycles } = await import("@/db/queries/cycles");
  const rows = await listCycles({ actor, filter: { q }, page: 1, pageSize: 50, sort: { key: "startedAt", direction: "asc" } });
  expect(await countCycles({ actor, filter: { q } })).toBe(rows.length);
  return rows.map((r) => r.id);
}

describe("cycle search", () => {
  it("finds a substring of the number, the load or the sterilizer name, in any case, on the actor's site only", async () => {
    expect(await found("bd-2024")).toEqual(["c1", "c2"]);
    expect(await found("024-00")).toEqual(["c1", "c2"]);
    expect(await found("INSTRUMENTS")).toEqual(["c1"]);
    expect(await found("autoclave")).toEqual(["c1", "c2"]);
    expect(await found("autoclave", actorOf("site-s"))).toEqual(["c5"]);
    expect(await found("ench un")).toEqual(["c3", "c4"]);
    // Accents are ignored both ways (worked by hand: "Stérile" holds "sterile").
    expect(await found("sterile")).toEqual(["c2"]);
    expect(await found("no such text")).toEqual([]);
  });

  it('takes % _ * " - and query words as characters, never as wildcards or syntax', async () => {
    expect(await found("50%")).toEqual(["c1"]);
    expect(await found("50_")).toEqual([]);
    expect(await found("pack_7")).toEqual(["c2"]);
    expect(await found("pack%7")).toEqual([]);
    expect(await found("BD*")).toEqual([]);
    expect(await found('"BD')).toEqual([]);
    expect(await found("2024 OR LT")).toEqual([]);
    expect(await found("NOT BD")).toEqual([]);
    expect(await found("-2024-00")).toEqual(["c1", "c2"]);
  });

  it("compares text of one or two characters row by row, still literally", async () => {
    expect(await found("17")).toEqual(["c3"]);
    expect(await found("_")).toEqual(["c2", "c4"]);
    expect(await found("%")).toEqual(["c1"]);
    expect(await found("x_")).toEqual(["c4"]);
  });

  it("reads a broad search (past the match cap, walked in the page's index order) exactly as a narrow one", async () => {
    const { listCycles, countCycles } = await import("@/db/queries/cycles");
    const sorts = [
      { key: "startedAt", direction: "desc" },
      { key: "sterilizer", direction: "asc" },
      { key: "cycleNumber", direction: "asc" },
    ] as const;
    // "sterile" is ASCII and finds "Stérile" only through the index (LIKE does not fold the accent); "STÉRILE" is not
    // ASCII; "50%", "pack_7" and "pack%7" keep their characters literal on the row-by-row path too.
    for (const q of ["autoclave", "2024", "wrapped", "ench un", "no such text", "sterile", "STÉRILE", "50%", "pack_7", "pack%7"]) {
      for (const sort of sorts) {
        const page = (broadSearchAt?: number) => listCycles({ actor: north, filter: { q }, page: 1, pageSize: 2, sort, broadSearchAt });
        // broadSearchAt 0: every indexed search counts as broad, so the other path reads the same page.
        expect(await page(0)).toEqual(await page());
      }
      expect(await countCycles({ actor: north, filter: { q }, broadSearchAt: 0 })).toBe(await countCycles({ actor: north, filter: { q } }));
    }
    const broadly = async (q: string) => (await listCycles({ actor: north, filter: { q }, page: 1, pageSize: 50, sort: sorts[0], broadSearchAt: 0 })).map((r) => r.id);
    expect(await broadly("2024")).toEqual(["c2", "c1"]);
    expect(await broadly("sterile")).toEqual(["c2"]);
    expect(await broadly("STÉRILE")).toEqual(["c2"]);
    expect(await broadly("pack%7")).toEqual([]);
  });

  it("follows a renamed sterilizer, a corrected cycle, a moved cycle and a deleted one", async () => {
    const run = (s: string) => ctx.db.run(sql.raw(s));
    await run(`update sterilizers set name = 'Steam chamber 2' where id = 'st-b'`);
    expect(await found("bench")).toEqual([]);
    expect(await found("chamber 2")).toEqual(["c3", "c4"]);
    await run(`update cycles set load_description = 'Hollow load', cycle_number = 'LT-18' where id = 'c3'`);
    expect(await found("porous")).toEqual([]);
    expect(await found("hollow")).toEqual(["c3"]);
    expect(await found("LT-18")).toEqual(["c3"]);
    await run(`update cycles set sterilizer_id = 'st-a' where id = 'c4'`);
    expect(await found("chamber 2")).toEqual(["c3"]);
    expect(await found("autoclave")).toEqual(["c1", "c2", "c4"]);
    await run(`delete from cycles where id = 'c4'`);
    expect(await found("autoclave")).toEqual(["c1", "c2"]);
    const [{ n }] = await ctx.db.all<{ n: number }>(sql`select count(*) as n from cycle_search_rows where cycle_id = 'c4'`);
    expect(n).toBe(0);
  });

  it("sorts by sterilizer name, then start time, in either direction", async () => {
    const { listCycles } = await import("@/db/queries/cycles");
    const order = async (direction: "asc" | "desc") =>
      (await listCycles({ actor: north, filter: {}, page: 1, pageSize: 50, sort: { key: "sterilizer", direction } })).map((r) => `${r.sterilizerName}:${r.id}`);
    expect(await order("asc")).toEqual(["Autoclave Nord:c1", "Autoclave Nord:c2", "Steam chamber 2:c3"]);
    expect(await order("desc")).toEqual(["Steam chamber 2:c3", "Autoclave Nord:c2", "Autoclave Nord:c1"]);
  });
});

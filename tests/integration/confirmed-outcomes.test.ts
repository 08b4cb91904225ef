// The status board's confirmed outcomes are read per sterilizer, kind and result through cycles_outcome_idx (issue 12,
// migration 0019) instead of ranking every confirmed cycle. The rule's input must not change: the rows are compared
// with the ranking query the status board used before (copied below as the reference), over a few hundred cycles and
// records of every kind, status and verdict, some without a start time, on two sites.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { useTemporaryDatabase } from "../support/test-db";

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
type Row = { sterilizerId: string; kind: string; at: string; result: string; sourceType: string; sourceId: string };

const KINDS = ["thermometric-small-load", "thermometric-full-load", "bowie-dick", "air-leakage", "routine-load"];
const STATUSES = ["draft", "submitted", "approved", "returned", "failure-confirmed"];
const VERDICTS = ["'pass'", "'fail'", "null"];
const STERILIZERS = ["st-1", "st-2", "st-3", "st-x"];

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const run = (s: string) => ctx.db.run(sql.raw(s));
  await run(`insert into sites (id, name, code) values ('site-1', 'One', 'O'), ('site-2', 'Two', 'T')`);
  await run(`insert into users (id, site_id, email, name, role, password_hash) values ('u1', 'site-1', 'u@example.test', 'U', 'engineer', 'x')`);
  await run(`insert into acceptance_profiles (id, site_id, name, sterilization_temp_c, holding_time_s, basis) values ('p1', 'site-1', 'P', 134, 180, 'iso-17665')`);
  await run(
    `insert into sterilizers (id, site_id, name, serial_number, chamber_volume_l) values ('st-1', 'site-1', 'A', 'A', 100), ('st-2', 'site-1', 'B', 'B', 100), ('st-3', 'site-1', 'C', 'C', 100), ('st-x', 'site-2', 'X', 'X', 100)`,
  );
  // A fixed walk through the combinations (no randomness), every timestamp distinct so "the latest" has one answer.
  const cycleRows: string[] = [];
  for (let i = 0; i < 400; i++) {
    const sterilizer = STERILIZERS[i % 4];
    const site = sterilizer === "st-x" ? "site-2" : "site-1";
    const at = new Date(Date.UTC(2025, 0, 1) + i * 7_919_000).toISOString();
    const started = i % 9 === 0 ? "null" : `'${at}'`;
    cycleRows.push(`('c${i}', '${site}', '${sterilizer}', 'p1', 'N${i}', '${KINDS[(i * 7) % 5]}', '${STATUSES[(i * 3) % 5]}', ${VERDICTS[(i * 5) % 3]}, ${started}, '${at}', 'u1')`);
  }
  await run(`insert into cycles (id, site_id, sterilizer_id, profile_id, cycle_number, test_kind, status, verdict, started_at, created_at, created_by) values ${cycleRows.join(", ")}`);
  const recordRows: string[] = [];
  for (let i = 0; i < 120; i++) {
    const sterilizer = STERILIZERS[(i + 1) % 4];
    const site = sterilizer === "st-x" ? "site-2" : "site-1";
    const at = new Date(Date.UTC(2025, 0, 1) + i * 26_399_000 + 500).toISOString();
    const status = ["approved", "failure-confirmed", "submitted", "returned"][i % 4];
    recordRows.push(`('r${i}', '${site}', '${sterilizer}', '${KINDS[(i * 3) % 4]}', '${at}', 'u1', '${i % 5 === 0 ? "fail" : "pass"}', '${status}')`);
  }
  await run(`insert into periodic_tests (id, site_id, sterilizer_id, kind, performed_at, performed_by, result, status) values ${recordRows.join(", ")}`);
});
afterAll(() => ctx.cleanup());

/** The ranking query listConfirmedOutcomes ran before migration 0019 (every confirmed row numbered per key). */
async function reference(siteId: string, sterilizerId?: string): Promise<Row[]> {
  const oneCycle = sterilizerId ? sql`and c.sterilizer_id = ${sterilizerId}` : sql``;
  const oneRecord = sterilizerId ? sql`and p.sterilizer_id = ${sterilizerId}` : sql``;
  return ctx.db.all<Row>(sql`
    select sterilizer_id as sterilizerId, kind, at, result, source_type as sourceType, source_id as sourceId from (
      select o.*, row_number() over (partition by sterilizer_id, kind, result order by at desc) as rn from (
        select c.sterilizer_id, c.test_kind as kind, coalesce(c.started_at, c.created_at) as at,
               case when c.status = 'failure-confirmed' then 'fail' else c.verdict end as result, 'cycle' as source_type, c.id as source_id
          from cycles c
         where c.site_id = ${siteId} ${oneCycle}
           and (c.status = 'failure-confirmed' or (c.status = 'approved' and c.verdict in ('pass', 'fail')))
        union all
        select p.sterilizer_id, p.kind, p.performed_at,
               case when p.status = 'failure-confirmed' then 'fail' else p.result end, 'periodic-test', p.id
          from periodic_tests p
         where p.site_id = ${siteId} ${oneRecord}
           and p.status in ('approved', 'failure-confirmed')
      ) o
    ) where rn = 1`);
}

const sorted = (rows: Row[]) => [...rows].map((r) => ({ ...r })).sort((a, b) => `${a.sterilizerId} ${a.kind} ${a.result}`.localeCompare(`${b.sterilizerId} ${b.kind} ${b.result}`));

describe("the status board's confirmed outcomes", () => {
  it.each([
    ["site-1", undefined],
    ["site-1", "st-2"],
    ["site-2", undefined],
    ["site-1", "st-x"],
  ])("are the rows the ranking over every confirmed cycle gave (site %s, sterilizer %s)", async (siteId, sterilizerId) => {
    const { listConfirmedOutcomes } = await import("@/db/queries/sterilizer-status");
    const expected = sorted(await reference(siteId, sterilizerId));
    expect(sorted(await listConfirmedOutcomes({ siteId, sterilizerId }))).toEqual(expected);
    if (sterilizerId !== "st-x") expect(expected.length).toBeGreaterThan(2);
  });

  it("include both sources, passes and failures, and nothing of another site", async () => {
    const { listConfirmedOutcomes } = await import("@/db/queries/sterilizer-status");
    const rows = await listConfirmedOutcomes({ siteId: "site-1" });
    expect(new Set(rows.map((r) => r.sourceType))).toEqual(new Set(["cycle", "periodic-test"]));
    expect(new Set(rows.map((r) => r.result))).toEqual(new Set(["pass", "fail"]));
    expect(rows.filter((r) => r.sterilizerId === "st-x")).toEqual([]);
  });
});

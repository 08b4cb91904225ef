// A profile's limits for issue 9 rules 2 and 3: the longest sampling interval inside the plateau
// (optional) and the free-space sensor's allowances, from the form through the audit ledger to the
// analysis, and migration 0005's defaults for profiles that existed before.
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { useTemporaryDatabase } from "../support/test-db";
import { loggerCsv, sampleTimes, saturationKpa, plateauChannel, TS_C } from "../support/logger-csv";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined, revalidateTag: () => undefined }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const ids: Record<string, string> = {};
const IDLE = { status: "idle" as const };

function form(values: Record<string, string>) {
  const fd = new FormData();
  for (const [k, v] of Object.entries(values)) fd.set(k, v);
  return fd;
}

// EN 285's figures at 134 °C (DOMAIN.md §2.2/§2.3, from memory).
const en285At134 = { sterilizationTempC: "134", bandK: "3", holdingTimeS: "180", maxEquilibrationS: "15", maxSpreadK: "2", saturationLimitK: "2", f0ReferenceC: "121.1", f0ZK: "10", basis: "en-285" };

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { users, sites } = await import("@/db/schema");
  const [site] = await ctx.db.insert(sites).values({ name: "Limits site", code: "L", timeZone: "Europe/London" }).returning();
  ids.site = site.id;
  const [u] = await ctx.db.insert(users).values({ email: "engineer@limits.example", name: "engineer", role: "engineer", passwordHash: "x", siteId: site.id }).returning();
  ids.engineer = u.id;
  session.current = { user: { id: u.id } };
});
afterAll(() => ctx.cleanup());

async function profileNamed(name: string) {
  const { acceptanceProfiles } = await import("@/db/schema");
  const { eq } = await import("drizzle-orm");
  return (await ctx.db.select().from(acceptanceProfiles).where(eq(acceptanceProfiles.name, name)))[0];
}

async function auditOf(entityId: string) {
  const { auditEvents } = await import("@/db/schema");
  const { eq } = await import("drizzle-orm");
  return ctx.db.select().from(auditEvents).where(eq(auditEvents.entityId, entityId));
}

describe("a profile's record and free-space limits", () => {
  it("a form that leaves them out gets EN 285's free-space figures (5 K for 60 s, then 2 K) and no interval of its own", async () => {
    const { createProfileAction } = await import("@/app/(portal)/profiles/actions");
    expect((await createProfileAction(IDLE, form({ ...en285At134, name: "Plain 134" }))).status).toBe("ok");
    // DOMAIN.md §2.3 e: 5 K in the first 60 s, 2 K after [memory].
    expect(await profileNamed("Plain 134")).toMatchObject({ maxSampleIntervalS: null, freeSpaceEarlyK: 5, freeSpaceEarlyS: 60, freeSpaceK: 2 });
  });

  it("stores the figures typed, audits them on creation, and audits a change with the old and the new value", async () => {
    const { createProfileAction, updateProfileAction } = await import("@/app/(portal)/profiles/actions");
    const typed = { ...en285At134, name: "Small load 134", maxSampleIntervalS: "2", freeSpaceEarlyK: "4", freeSpaceEarlyS: "45", freeSpaceK: "1,5" };
    expect((await createProfileAction(IDLE, form(typed))).status).toBe("ok");
    const row = await profileNamed("Small load 134");
    expect(row).toMatchObject({ maxSampleIntervalS: 2, freeSpaceEarlyK: 4, freeSpaceEarlyS: 45, freeSpaceK: 1.5 });
    const [created] = await auditOf(row.id);
    expect(JSON.parse(created.newValue!)).toMatchObject({ maxSampleIntervalS: 2, freeSpaceEarlyK: 4, freeSpaceEarlyS: 45, freeSpaceK: 1.5 });

    const state = await updateProfileAction(IDLE, form({ ...typed, id: row.id, maxSampleIntervalS: "", freeSpaceK: "2", reason: "Protocol rev. D: default gap rule" }));
    expect(state.status).toBe("ok");
    const update = (await auditOf(row.id)).find((e) => e.action === "profile.update")!;
    expect(JSON.parse(update.oldValue!)).toEqual({ maxSampleIntervalS: 2, freeSpaceK: 1.5 });
    expect(JSON.parse(update.newValue!)).toEqual({ maxSampleIntervalS: null, freeSpaceK: 2 });
  });

  it("refuses figures out of range beside their fields, and an empty free-space field as missing", async () => {
    const { createProfileAction } = await import("@/app/(portal)/profiles/actions");
    const state = await createProfileAction(IDLE, form({ ...en285At134, name: "Odd limits", maxSampleIntervalS: "0", freeSpaceEarlyK: "", freeSpaceK: "30" }));
    expect(state.status).toBe("error");
    expect(state.fieldErrors?.maxSampleIntervalS).toBe("The longest sampling interval must be between 0.1 and 600 s.");
    expect(state.fieldErrors?.freeSpaceEarlyK).toBe("Enter the free-space allowance at the plateau start.");
    expect(state.fieldErrors?.freeSpaceK).toBe("The free-space allowance after that must be between 0.1 and 20 K.");
    expect(await profileNamed("Odd limits")).toBeUndefined();
  });

  it("the analysis takes the profile's maximum interval when it is shorter than 3× the median, and lists the gap with its times", async () => {
    const { limitsOf, analyzeLoggerBytes } = await import("@/lib/cycles/analyze-file");
    const profile = await profileNamed("Plain 134");
    // A constructed 134 °C cycle, one sample a second, with the rows between 100 s and 104 s missing (a 4 s interval).
    const drain = plateauChannel({ tsC: TS_C, reachS: 30, levelC: 134.6, exhaustS: 330 });
    const csv = loggerCsv({ times: sampleTimes(400, 1, [[100, 104]]), channels: { Drain: drain, "Pack 1": drain }, pressure: { marker: "abs", kpaAbsAt: (t) => saturationKpa(drain(t)) } });
    const bytes = new TextEncoder().encode(csv);
    const check = (p: typeof profile) => analyzeLoggerBytes(bytes, p).result.checks.find((c) => c.id === "record-complete")!;

    expect(limitsOf(profile)).toMatchObject({ freeSpaceEarlyK: 5, freeSpaceEarlyS: 60, freeSpaceK: 2 });
    expect(limitsOf(profile).maxSampleIntervalS).toBeUndefined();
    // Median interval 1 s, so the 3× rule allows 3 s: a 4 s interval is a gap (issue 9 rule 3).
    expect(check(profile).passed).toBe(false);
    const strict = { ...profile, maxSampleIntervalS: 5 };
    expect(limitsOf(strict).maxSampleIntervalS).toBe(5);
    // The shorter of the profile's maximum and 3× the median applies: still 3 s.
    expect(analyzeLoggerBytes(bytes, strict).result.input?.maxIntervalS).toBe(3);
    const tighter = { ...profile, maxSampleIntervalS: 2 };
    expect(analyzeLoggerBytes(bytes, tighter).result.input?.maxIntervalS).toBe(2);
    expect(analyzeLoggerBytes(bytes, tighter).result.input?.gaps).toEqual([{ start: 100, end: 104, durationS: 4, channel: null }]);
  });
});

describe("migration 0005 on a database that already holds profiles", () => {
  it("gives existing profiles the free-space defaults and no maximum interval", async () => {
    const { createClient } = await import("@libsql/client");
    const { drizzle } = await import("drizzle-orm/libsql");
    const { migrate } = await import("drizzle-orm/libsql/migrator");
    const dir = mkdtempSync(path.join(tmpdir(), "papin-migration-"));
    try {
      const full = path.join(process.cwd(), "db", "migrations");
      const upTo4 = path.join(dir, "migrations");
      cpSync(full, upTo4, { recursive: true });
      const journal = JSON.parse(readFileSync(path.join(upTo4, "meta", "_journal.json"), "utf8"));
      journal.entries = journal.entries.filter((e: { tag: string }) => e.tag < "0005");
      writeFileSync(path.join(upTo4, "meta", "_journal.json"), JSON.stringify(journal));
      const client = createClient({ url: `file:${path.join(dir, "old.db")}` });
      const db = drizzle(client);
      await migrate(db, { migrationsFolder: upTo4 });
      await client.execute(`insert into sites (id, name, code) values ('s', 'Site', 'S')`);
      await client.execute(`insert into acceptance_profiles (id, site_id, name, sterilization_temp_c, holding_time_s, basis) values ('p', 's', '134', 134, 180, 'en-285')`);
      await migrate(db, { migrationsFolder: full });
      const rows = (await client.execute(`select max_sample_interval_s, free_space_early_k, free_space_early_s, free_space_k from acceptance_profiles`)).rows.map((r) => ({ ...r }));
      expect(rows).toEqual([{ max_sample_interval_s: null, free_space_early_k: 5, free_space_early_s: 60, free_space_k: 2 }]);
      client.close();
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

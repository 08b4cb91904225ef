import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { failureOf, useTemporaryDatabase } from "../support/test-db";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined, revalidateTag: () => undefined }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const ids: Record<string, string> = {};
const IDLE = { status: "idle" as const };
const as = (key: string) => (session.current = { user: { id: ids[key] } });

function form(values: Record<string, string>) {
  const fd = new FormData();
  for (const [k, v] of Object.entries(values)) fd.set(k, v);
  return fd;
}

// EN 285's own figures at 134 °C (DOMAIN.md §2.2/§2.3) [memory; 134 °C / 3 min also found in the Central Sterilising Club textbook].
const en285At134 = { sterilizationTempC: "134", bandK: "3", holdingTimeS: "180", maxEquilibrationS: "15", maxSpreadK: "2", saturationLimitK: "2", f0ReferenceC: "121.1", f0ZK: "10", basis: "en-285" };

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { users, sites } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const [site] = await ctx.db.insert(sites).values({ name: "Basis site", code: "B", timeZone: "Europe/London" }).returning();
  ids.site = site.id;
  const passwordHash = await hashPassword("a test password");
  for (const role of ["technician", "engineer"] as const) {
    const [u] = await ctx.db
      .insert(users)
      .values({ email: `${role}@basis.example`, name: role, role, passwordHash, siteId: site.id })
      .returning();
    ids[role] = u.id;
  }
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

describe("saving a profile against its basis", () => {
  it("refuses a 60 s hold at 134 °C under EN 285, naming the minimum beside the field, and stores nothing", async () => {
    as("engineer");
    const { createProfileAction } = await import("@/app/(portal)/profiles/actions");
    const state = await createProfileAction(IDLE, form({ ...en285At134, name: "Too short", holdingTimeS: "60" }));
    expect(state.status).toBe("error");
    expect(state.fieldErrors?.holdingTimeS).toBe("EN 285 requires a holding time of at least 3 min at 134 °C.");
    expect(await profileNamed("Too short")).toBeUndefined();
  });

  it("refuses weaker limits under each standard it knows", async () => {
    const { createProfileAction } = await import("@/app/(portal)/profiles/actions");
    as("engineer");
    // EN 13060 keeps 134 °C / 3 min (DOMAIN.md §2.10) [memory].
    const benchtop = await createProfileAction(IDLE, form({ ...en285At134, basis: "en-13060", name: "Bench short", holdingTimeS: "150" }));
    expect(benchtop.fieldErrors?.holdingTimeS).toBe("EN 13060 requires a holding time of at least 3 min at 134 °C.");
    // ANSI/AAMI ST79: 4 min at 132 °C, dynamic air removal (DOMAIN.md §2.11) [memory].
    const st79 = await createProfileAction(IDLE, form({ ...en285At134, basis: "ansi-aami-st79", name: "US short", sterilizationTempC: "132", holdingTimeS: "180" }));
    expect(st79.fieldErrors?.holdingTimeS).toBe("ANSI/AAMI ST79 requires a holding time of at least 4 min at 132 °C.");
    // EN 285: equilibration at most 30 s even for the largest chambers (DOMAIN.md §2.3 a) [found: HTM 2010 §13.14(c)].
    const slow = await createProfileAction(IDLE, form({ ...en285At134, name: "Slow", maxEquilibrationS: "60" }));
    expect(slow.fieldErrors?.maxEquilibrationS).toMatch(/^EN 285 allows an equilibration time of at most 30 s/);
    const unknownBasis = await createProfileAction(IDLE, form({ ...en285At134, name: "Which", basis: "EN 285 somewhere" }));
    expect(unknownBasis.fieldErrors?.basis).toMatch(/Choose the basis/);
  });

  it("the service refuses the same even when called without the form", async () => {
    const { createProfile } = await import("@/lib/services/profiles");
    const actor = { id: ids.engineer, email: "engineer@basis.example", name: "engineer", role: "engineer" as const, siteId: ids.site };
    const input = {
      name: "Direct",
      sterilizationTempC: 134,
      bandK: 3,
      holdingTimeS: 60,
      maxEquilibrationS: 15,
      maxSpreadK: 2,
      saturationLimitK: 2,
      f0ReferenceC: 121.1,
      f0ZK: 10,
      maxSampleIntervalS: null,
      freeSpaceEarlyK: 5,
      freeSpaceEarlyS: 60,
      freeSpaceK: 2,
      leakRateLimitKpaPerMin: 0.13,
      leakVacuumSetPointKpaAbs: 7,
      basis: "en-285" as const,
      basisReason: null,
    };
    await expect(createProfile({ actor, input })).rejects.toMatchObject({ status: 422, field: "holdingTimeS", message: "EN 285 requires a holding time of at least 3 min at 134 °C." });
  });

  it("accepts local practice with a reason, refuses it without one, and audits the new profile with its basis", async () => {
    as("engineer");
    const { createProfileAction } = await import("@/app/(portal)/profiles/actions");
    const bare = await createProfileAction(IDLE, form({ ...en285At134, basis: "local", name: "Flash", holdingTimeS: "60" }));
    expect(bare.fieldErrors?.basisReason).toMatch(/Local practice needs its reason/);
    const ok = await createProfileAction(IDLE, form({ ...en285At134, basis: "local", basisReason: "Validated flash cycle, report VR-2025-07", name: "Flash", holdingTimeS: "60" }));
    expect(ok.status).toBe("ok");
    const row = await profileNamed("Flash");
    expect(row).toMatchObject({ basis: "local", basisReason: "Validated flash cycle, report VR-2025-07", holdingTimeS: 60 });
    const [created] = await auditOf(row.id);
    expect(created.action).toBe("profile.create");
    expect(JSON.parse(created.newValue!)).toMatchObject({ basis: "local", basisReason: "Validated flash cycle, report VR-2025-07", holdingTimeS: 60 });
  });

  it("audits a change of basis with the old and the new value", async () => {
    as("engineer");
    const { createProfileAction, updateProfileAction } = await import("@/app/(portal)/profiles/actions");
    expect((await createProfileAction(IDLE, form({ ...en285At134, name: "Porous 134" }))).status).toBe("ok");
    const before = await profileNamed("Porous 134");
    expect(before).toMatchObject({ basis: "en-285", basisReason: null });
    const weakened = await updateProfileAction(IDLE, form({ ...en285At134, id: before.id, name: "Porous 134", holdingTimeS: "120", reason: "shorter hold" }));
    expect(weakened.fieldErrors?.holdingTimeS).toBe("EN 285 requires a holding time of at least 3 min at 134 °C.");
    const state = await updateProfileAction(
      IDLE,
      form({ ...en285At134, id: before.id, name: "Porous 134", basis: "local", basisReason: "Site protocol SP-12 rev. C", reason: "Protocol SP-12 now governs this cycle" }),
    );
    expect(state.status).toBe("ok");
    const events = await auditOf(before.id);
    const update = events.find((e) => e.action === "profile.update")!;
    expect(update.reason).toBe("Protocol SP-12 now governs this cycle");
    expect(JSON.parse(update.oldValue!)).toEqual({ basis: "en-285", basisReason: null });
    expect(JSON.parse(update.newValue!)).toEqual({ basis: "local", basisReason: "Site protocol SP-12 rev. C" });
  });

  it("the database itself refuses an unknown basis and local practice without a reason", async () => {
    const { sql } = await import("drizzle-orm");
    const insert = (basis: string, reason: string | null) =>
      ctx.db.run(
        sql`insert into acceptance_profiles (id, site_id, name, sterilization_temp_c, holding_time_s, basis, basis_reason) values (${crypto.randomUUID()}, ${ids.site}, 'raw', 134, 180, ${basis}, ${reason})`,
      );
    expect(await failureOf(insert("EN 285", null))).toMatch(/CHECK constraint failed/);
    expect(await failureOf(insert("local", " "))).toMatch(/CHECK constraint failed/);
  });
});

describe("migration 0004 on a database that already holds profiles", () => {
  it("gives the demo's profiles the standard their sterilizers fit and every other profile local practice with the old text kept", async () => {
    const { createClient } = await import("@libsql/client");
    const { drizzle } = await import("drizzle-orm/libsql");
    const { migrate } = await import("drizzle-orm/libsql/migrator");
    const dir = mkdtempSync(path.join(tmpdir(), "papin-migration-"));
    try {
      const full = path.join(process.cwd(), "db", "migrations");
      const upTo3 = path.join(dir, "migrations");
      cpSync(full, upTo3, { recursive: true });
      const journal = JSON.parse(readFileSync(path.join(upTo3, "meta", "_journal.json"), "utf8"));
      journal.entries = journal.entries.filter((e: { tag: string }) => e.tag < "0004");
      writeFileSync(path.join(upTo3, "meta", "_journal.json"), JSON.stringify(journal));
      const client = createClient({ url: `file:${path.join(dir, "old.db")}` });
      const db = drizzle(client);
      await migrate(db, { migrationsFolder: upTo3 });
      const run = (text: string) => client.execute(text);
      await run(`insert into sites (id, name, code) values ('demo', 'Demo', 'MBG-SSD'), ('real', 'Real', 'RH-1')`);
      await run(`insert into acceptance_profiles (id, site_id, name, sterilization_temp_c, holding_time_s, max_equilibration_s, basis) values
        ('d-large', 'demo', '134 porous', 134, 180, 15, 'EN 285 thermometric test'),
        ('d-bench', 'demo', '134 bench', 134, 180, 15, 'EN 285 band'),
        ('d-short', 'demo', '134 short', 134, 60, 15, ''),
        ('r-1', 'real', 'Our 134', 134, 180, 15, 'EN 285 / HTM 01-01'),
        ('r-2', 'real', 'Our 121', 121, 900, 15, '')`);
      await run(`insert into sterilizers (id, site_id, name, serial_number, chamber_volume_l, default_profile_id) values
        ('s-large', 'demo', 'Large', 'L', 445, 'd-large'), ('s-bench', 'demo', 'Bench', 'B', 23, 'd-bench')`);

      await migrate(db, { migrationsFolder: full });
      const rows = (await run(`select id, basis, basis_reason from acceptance_profiles order by id`)).rows.map((r) => ({ ...r }));
      expect(rows).toEqual([
        { id: "d-bench", basis: "en-13060", basis_reason: null },
        { id: "d-large", basis: "en-285", basis_reason: null },
        { id: "d-short", basis: "local", basis_reason: "set before bases were recorded" },
        { id: "r-1", basis: "local", basis_reason: "set before bases were recorded (was: EN 285 / HTM 01-01)" },
        { id: "r-2", basis: "local", basis_reason: "set before bases were recorded" },
      ]);
      // The sterilizers still point at their profiles through the rebuilt table.
      expect((await run(`pragma foreign_key_check`)).rows).toHaveLength(0);
      expect((await run(`select default_profile_id from sterilizers order by id`)).rows.map((r) => r.default_profile_id)).toEqual(["d-bench", "d-large"]);
      client.close();
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { useTemporaryDatabase } from "../support/test-db";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const ids: Record<string, string> = {};
const as = (key: string) => (session.current = { user: { id: ids[key] } });

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { users, sites, sterilizers, acceptanceProfiles } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const passwordHash = await hashPassword("a test password");
  // Two sites in zones away from UTC: New York (UTC−4 in July) and Berlin (UTC+2 in July).
  for (const [key, timeZone] of [
    ["ny", "America/New_York"],
    ["berlin", "Europe/Berlin"],
  ] as const) {
    const [site] = await ctx.db
      .insert(sites)
      .values({ name: `Site ${key}`, code: key.toUpperCase(), timeZone })
      .returning();
    const [tech] = await ctx.db
      .insert(users)
      .values({ email: `tech@${key}.example`, name: `Tech ${key}`, role: "technician", passwordHash, siteId: site.id })
      .returning();
    const [profile] = await ctx.db.insert(acceptanceProfiles).values({ siteId: site.id, name: "134 °C / 3 min", sterilizationTempC: 134, holdingTimeS: 180, basis: "en-285" }).returning();
    const [st] = await ctx.db
      .insert(sterilizers)
      .values({ siteId: site.id, name: "Porous 1", serialNumber: `${key}-S1`, chamberVolumeL: 445, defaultProfileId: profile.id })
      .returning();
    Object.assign(ids, { [`${key}Tech`]: tech.id, [`${key}Profile`]: profile.id, [`${key}Sterilizer`]: st.id });
  }
});
afterAll(() => ctx.cleanup());

// Each upload is a file of its own: a file another cycle of the site holds is refused without a reason.
let nextSeed = 21;

/** A simulated cycle whose logger clock reads 08:00:00 on 14 July 2026 (the simulator writes the wall clock without a zone). */
async function loggerFile(timeFormat: "iso" | "elapsed-seconds") {
  const { simulateCycle, toLoggerCsv } = await import("@/lib/simulator");
  const sim = simulateCycle({ scenario: "pass", sterilizationTempC: 134.6, holdingTimeS: 210, seed: nextSeed++, startedAt: new Date("2026-07-14T08:00:00Z") });
  return toLoggerCsv(sim, { delimiter: ",", timeFormat });
}

async function upload(site: "ny" | "berlin", bytes: Uint8Array, extra: Record<string, string> = {}) {
  const { POST } = await import("@/app/api/cycles/route");
  const form = new FormData();
  form.set("sterilizerId", ids[`${site}Sterilizer`]);
  form.set("profileId", ids[`${site}Profile`]);
  for (const [k, v] of Object.entries(extra)) form.set(k, v);
  form.append("files", new Blob([bytes as BlobPart], { type: "text/csv" }), "cycle.csv");
  return POST(new Request("http://papin.test/api/cycles", { method: "POST", body: form }), undefined);
}

async function cycleRow(id: string) {
  const { cycles } = await import("@/db/schema");
  const { eq } = await import("drizzle-orm");
  return (await ctx.db.select().from(cycles).where(eq(cycles.id, id)))[0];
}

describe("when a cycle started", () => {
  it("reads a logger clock without a zone in the site's zone, not the server's", async () => {
    as("nyTech");
    const res = await upload("ny", await loggerFile("iso"));
    expect(res.status).toBe(201);
    const row = await cycleRow((await res.json()).id);
    // 08:00 on a New York clock in July is 12:00 UTC (EDT, UTC−4; US rule of the Energy Policy Act 2005) [found].
    expect(row.startedAt).toBe("2026-07-14T12:00:00.000Z");
    // The default cycle number carries the site's wall clock.
    expect(row.cycleNumber).toBe("ny-S1-202607140800");

    as("berlinTech");
    const berlin = await cycleRow((await (await upload("berlin", await loggerFile("iso"))).json()).id);
    // 08:00 in Berlin in July is 06:00 UTC (CEST, UTC+2; EU Directive 2000/84/EC) [found].
    expect(berlin.startedAt).toBe("2026-07-14T06:00:00.000Z");
  });

  it("refuses a file of elapsed times without startedAt with 422 naming the field, and stores nothing", async () => {
    as("nyTech");
    const { cycles } = await import("@/db/schema");
    const before = (await ctx.db.select().from(cycles)).length;
    const res = await upload("ny", await loggerFile("elapsed-seconds"));
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.field).toBe("startedAt");
    expect(body.error).toMatch(/elapsed times without a date.*startedAt.*America\/New_York/);
    expect((await ctx.db.select().from(cycles)).length).toBe(before);
  });

  it("takes startedAt for a file of elapsed times, a local time read in the site's zone", async () => {
    as("nyTech");
    const local = await upload("ny", await loggerFile("elapsed-seconds"), { startedAt: "2026-07-14T09:15" });
    expect(local.status).toBe(201);
    expect((await cycleRow((await local.json()).id)).startedAt).toBe("2026-07-14T13:15:00.000Z");
    const zoned = await upload("ny", await loggerFile("elapsed-seconds"), { startedAt: "2026-07-14T09:15:00+01:00", cycleNumber: "ZONED" });
    expect((await cycleRow((await zoned.json()).id)).startedAt).toBe("2026-07-14T08:15:00.000Z");
    const bad = await upload("ny", await loggerFile("elapsed-seconds"), { startedAt: "14/07/2026 09:15" });
    expect(bad.status).toBe(400);
    expect((await bad.json()).field).toBe("startedAt");
  });

  it("shows the chart's clock times from that start", async () => {
    as("nyTech");
    const created = await (await upload("ny", await loggerFile("elapsed-seconds"), { startedAt: "2026-07-14T09:15", cycleNumber: "CHART" })).json();
    const { GET } = await import("@/app/api/cycles/[id]/series/route");
    const series = await (await GET(new Request(`http://papin.test/api/cycles/${created.id}/series?points=100`), { params: Promise.resolve({ id: created.id }) })).json();
    expect(series.startedAt).toBe("2026-07-14T13:15:00.000Z");
    const { clockTimeAt } = await import("@/lib/cycles/chart-model");
    expect(clockTimeAt(series.startedAt, 60, "America/New_York")).toBe("09:16:00");
  });
});

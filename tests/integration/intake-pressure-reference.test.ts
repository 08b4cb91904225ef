import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { useTemporaryDatabase } from "../support/test-db";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const ids: Record<string, string> = {};

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { loadDemoSite } = await import("@/db/seed");
  await loadDemoSite(ctx.db, { password: "a demo password" });
  const { users, sterilizers, acceptanceProfiles, instruments } = await import("@/db/schema");
  ids.technician = (await ctx.db.select().from(users)).find((u) => u.role === "technician")!.id;
  ids.sterilizer = (await ctx.db.select().from(sterilizers).limit(1))[0].id;
  ids.profile = (await ctx.db.select().from(acceptanceProfiles)).find((p) => p.sterilizationTempC === 134 && p.maxEquilibrationS === 15)!.id;
  ids.instrument = (await ctx.db.select().from(instruments)).find((i) => i.kind === "logger")!.id;
  session.current = { user: { id: ids.technician } };
}, 180_000);
afterAll(() => ctx.cleanup());

/**
 * A passing 134 °C cycle from the simulator with its pressure header stripped of the abs/gauge
 * marker ("Chamber (kPa)"), and the sixth pack probe renamed as a free-space sensor. The readings
 * stay absolute kPa, so "absolute" is the true answer.
 */
// Each call gives a file of its own (another seed): a file another cycle of the site holds is refused without a reason.
let nextSeed = 31;

async function unmarkedFile(): Promise<Uint8Array> {
  const { simulateCycle, toLoggerCsv } = await import("@/lib/simulator");
  const sim = simulateCycle({ scenario: "pass", sterilizationTempC: 134.6, holdingTimeS: 210, seed: nextSeed++, startedAt: new Date("2026-11-20T08:00:00Z") });
  const text = new TextDecoder().decode(toLoggerCsv(sim, { delimiter: ",", timeFormat: "iso" }));
  expect(text).toContain("Chamber (kPa abs)");
  return new TextEncoder().encode(text.replace("Chamber (kPa abs)", "Chamber (kPa)").replace("Pack 6 (°C)", "Free space (°C)"));
}

async function inspect(bytes: Uint8Array, instrumentId?: string) {
  const { POST } = await import("@/app/api/logger-files/inspect/route");
  const form = new FormData();
  form.append("file", new Blob([bytes as BlobPart]), "unmarked.csv");
  if (instrumentId) form.append("instrumentId", instrumentId);
  const res = await POST(new Request("http://papin.test/api/logger-files/inspect", { method: "POST", body: form }), undefined);
  expect(res.status).toBe(200);
  return res.json();
}

async function create(bytes: Uint8Array, mapping: Record<string, unknown> | null, extra: Record<string, string> = {}) {
  const { POST } = await import("@/app/api/cycles/route");
  const form = new FormData();
  form.set("sterilizerId", ids.sterilizer);
  form.set("profileId", ids.profile);
  if (mapping) form.set("mapping", JSON.stringify(mapping));
  for (const [k, v] of Object.entries(extra)) form.set(k, v);
  form.append("files", new Blob([bytes as BlobPart], { type: "text/csv" }), "unmarked.csv");
  const res = await POST(new Request("http://papin.test/api/cycles", { method: "POST", body: form }), undefined);
  expect(res.status, await res.clone().text()).toBe(201);
  return res.json();
}

async function savedMappingOf(instrumentId: string) {
  const { instruments } = await import("@/db/schema");
  const { eq } = await import("drizzle-orm");
  return (await ctx.db.select().from(instruments).where(eq(instruments.id, instrumentId)))[0].savedMapping as Record<string, unknown> | null;
}

/** The mapping the intake screen sends for this file, before anyone says absolute or gauge. */
const screenMapping = { timeColumn: "Time", pressureColumn: "Chamber (kPa)", pressureUnit: "kPa", referenceColumn: "Drain (°C)" };

describe("absolute or gauge at intake (issue 9, rule 5)", () => {
  it("inspection of a pressure header without a marker says the reference is assumed, and finds the free-space sensor by its header", async () => {
    const body = await inspect(await unmarkedFile());
    expect(body.pressureReference).toEqual({ kind: "absolute", source: "assumed" });
    expect(body.freeSpaceColumn).toBe("Free space (°C)");
    const pressure = body.columns.find((c: { role: string }) => c.role === "pressure");
    expect(pressure.header).toBe("Chamber (kPa)");
    expect(pressure.unsure.join(" ")).toMatch(/no abs\/gauge marker/);
  });

  it("a marked header is reported as the header's", async () => {
    const { simulateCycle, toLoggerCsv } = await import("@/lib/simulator");
    const sim = simulateCycle({ scenario: "pass", sterilizationTempC: 134.6, holdingTimeS: 210, seed: 32 });
    const body = await inspect(toLoggerCsv(sim, { delimiter: ",", pressureUnit: "bar", gauge: true }));
    expect(body.pressureReference).toEqual({ kind: "gauge", source: "header" });
  });

  it("a script's mapping without a choice is analysed as assumed absolute, with the warning on the record", async () => {
    const created = await create(await unmarkedFile(), screenMapping);
    expect(created.analysis.input.pressureReference).toEqual({ kind: "absolute", source: "assumed" });
    expect(created.analysis.input.warnings.join(" ")).toMatch(/"Chamber \(kPa\)" has no abs\/gauge marker/);
  });

  it("the user's choice is recorded as theirs and kept with the instrument's saved mapping, free-space sensor included", async () => {
    const mapping = { ...screenMapping, pressureGauge: false, freeSpaceColumn: "Free space (°C)", columns: { "Chamber (kPa)": { role: "pressure", unit: "kPa", gauge: false } } };
    const created = await create(await unmarkedFile(), mapping, { instrumentId: ids.instrument, saveMapping: "true" });
    expect(created.analysis.input.pressureReference).toEqual({ kind: "absolute", source: "user" });
    expect(created.analysis.input.warnings.join(" ")).not.toMatch(/no abs\/gauge marker/);
    expect(created.analysis.verdict).toBe("pass");
    expect(created.analysis.checks.map((c: { id: string }) => c.id)).toContain("free-space");
    expect(created.analysis.channels.find((c: { header: string }) => c.header === "Free space (°C)").role).toBe("free-space");

    const saved = await savedMappingOf(ids.instrument);
    expect(saved).toMatchObject({ pressureGauge: false, freeSpaceColumn: "Free space (°C)" });

    // The instrument's next file comes back with the confirmed answer, as the user's, for the screen to pre-fill.
    const next = await inspect(await unmarkedFile(), ids.instrument);
    expect(next.savedMapping).toMatchObject({ pressureGauge: false });
    expect(next.pressureReference).toEqual({ kind: "absolute", source: "user" });
    expect(next.freeSpaceColumn).toBe("Free space (°C)");
  });

  it("an empty free-space column in the mapping means no free-space sensor, even under a free-space header", async () => {
    const created = await create(await unmarkedFile(), { ...screenMapping, pressureGauge: false, freeSpaceColumn: "" });
    expect(created.analysis.checks.map((c: { id: string }) => c.id)).not.toContain("free-space");
    expect(created.analysis.channels.every((c: { role: string }) => c.role !== "free-space")).toBe(true);
  });
});

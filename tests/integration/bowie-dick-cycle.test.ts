import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { createHash } from "node:crypto";
import { eq } from "drizzle-orm";
import { useTemporaryDatabase } from "../support/test-db";
import { GIF_START, indicatorSheetPng, photoFile } from "../support/indicator-photo";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));

const PASSWORD = "a test password";
let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const ids: Record<string, string> = {};
const as = (key: string | null) => (session.current = key ? { user: { id: ids[key] } } : null);
const params = (id: string) => ({ params: Promise.resolve({ id }) });
const sha256 = (b: Uint8Array) => createHash("sha256").update(b).digest("hex");

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { users, sites, sterilizers, acceptanceProfiles } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const passwordHash = await hashPassword(PASSWORD);
  const [site] = await ctx.db.insert(sites).values({ name: "Test site", code: "T", timeZone: "UTC" }).returning();
  const [other] = await ctx.db.insert(sites).values({ name: "Other site", code: "O" }).returning();
  for (const [key, role, siteId] of [
    ["technician", "technician", site.id],
    ["engineer", "engineer", site.id],
    ["engineer2", "engineer", site.id],
    ["foreignTechnician", "technician", other.id],
  ] as const) {
    const [u] = await ctx.db
      .insert(users)
      .values({ email: `${key}@test.example`, name: `The ${key}`, role, passwordHash, siteId })
      .returning();
    ids[key] = u.id;
  }
  const [profile] = await ctx.db.insert(acceptanceProfiles).values({ siteId: site.id, name: "134 °C / 3 min", sterilizationTempC: 134, holdingTimeS: 180, basis: "en-285" }).returning();
  ids.profile = profile.id;
  const [st] = await ctx.db.insert(sterilizers).values({ siteId: site.id, name: "Porous load 1", serialNumber: "S-1", chamberVolumeL: 445, defaultProfileId: profile.id }).returning();
  ids.sterilizer = st.id;
}, 120_000);
afterAll(() => ctx.cleanup());

/** A Bowie-Dick cycle whose logged file passes the thermometric analysis (the simulator's "pass" scenario at 134.6 °C for 210 s against 134 °C / 3 min). */
async function uploadBowieDickCycle() {
  const { simulateCycle, toLoggerCsv } = await import("@/lib/simulator");
  const { POST } = await import("@/app/api/cycles/route");
  const sim = simulateCycle({ scenario: "pass", sterilizationTempC: 134.6, holdingTimeS: 210, seed: 5, startedAt: new Date("2026-11-25T07:00:00Z") });
  const form = new FormData();
  form.set("sterilizerId", ids.sterilizer);
  form.set("profileId", ids.profile);
  form.set("testKind", "bowie-dick");
  // The same simulated file serves each test's cycle; a file another cycle holds needs a reason.
  form.set("duplicateReason", "test: one simulated file for several cycles");
  form.append("files", new Blob([toLoggerCsv(sim) as BlobPart]), "bd-cycle.csv");
  as("technician");
  const res = await POST(new Request("http://papin.test/api/cycles", { method: "POST", body: form }), undefined);
  expect(res.status).toBe(201);
  const body = await res.json();
  expect(body.analysis.verdict).toBe("pass");
  return body.id as string;
}

async function recordSheet(id: string, who: string, fields: { outcome: string; photo?: File; reason?: string }) {
  const { POST } = await import("@/app/api/cycles/[id]/indicator-sheet/route");
  const form = new FormData();
  form.set("outcome", fields.outcome);
  form.set("indicatorLot", "BD-LOT-9");
  if (fields.photo) form.set("photo", fields.photo);
  if (fields.reason) form.set("reason", fields.reason);
  as(who);
  const res = await POST(new Request(`http://papin.test/api/cycles/${id}/indicator-sheet`, { method: "POST", body: form }), params(id));
  return { status: res.status, body: await res.json() };
}

async function submit(id: string) {
  const { POST } = await import("@/app/api/cycles/[id]/submit/route");
  as("technician");
  return (await POST(new Request(`http://papin.test/api/cycles/${id}/submit`, { method: "POST" }), params(id))).status;
}

async function sign(id: string, who: string, meaning: string) {
  const { POST } = await import("@/app/api/cycles/[id]/signatures/route");
  as(who);
  const res = await POST(
    new Request(`http://papin.test/api/cycles/${id}/signatures`, { method: "POST", body: JSON.stringify({ password: PASSWORD, meaning }), headers: { "content-type": "application/json" } }),
    params(id),
  );
  return { status: res.status, body: await res.json() };
}

async function cycleRow(id: string) {
  const { cycles } = await import("@/db/schema");
  const [row] = await ctx.db.select().from(cycles).where(eq(cycles.id, id));
  return row;
}

describe("a Bowie-Dick cycle is judged by its indicator sheet", () => {
  it("a passing thermometric file gives no verdict by itself, and approval without a sheet and photo is refused", async () => {
    const id = await uploadBowieDickCycle();
    expect((await cycleRow(id)).verdict).toBeNull();
    expect(await submit(id)).toBe(200);
    const refused = await sign(id, "engineer", "approved");
    expect(refused.status).toBe(409);
    expect(refused.body.error).toMatch(/record the sheet's result, lot and photo/);
    expect((await cycleRow(id)).status).toBe("submitted");
  });

  it('a passing thermometric file with a "not uniform" sheet fails, and cannot be approved', async () => {
    const id = await uploadBowieDickCycle();
    const png = indicatorSheetPng({ rgb: [120, 120, 60] });
    const recorded = await recordSheet(id, "technician", { outcome: "non-uniform", photo: photoFile(png, "pale-centre.png") });
    expect(recorded).toMatchObject({ status: 201, body: { verdict: "fail", photoSha256: sha256(png) } });
    expect((await cycleRow(id)).verdict).toBe("fail");
    const { auditEvents } = await import("@/db/schema");
    const events = await ctx.db.select().from(auditEvents).where(eq(auditEvents.entityId, id));
    expect(events.find((e) => e.action === "cycle.indicator-sheet")).toBeTruthy();
    expect(await submit(id)).toBe(200);
    const refused = await sign(id, "engineer", "approved");
    expect(refused.status).toBe(409);
  });

  it("the sheet's photo must be a JPEG or PNG; a second reading needs a reason; another site's cycle is not found", async () => {
    const id = await uploadBowieDickCycle();
    const gif = await recordSheet(id, "technician", { outcome: "uniform", photo: photoFile(GIF_START, "sheet.gif", "image/gif") });
    expect(gif).toMatchObject({ status: 422, body: { field: "photo", error: "sheet.gif is a GIF image; the photo of the indicator sheet must be a JPEG or PNG image." } });
    const none = await recordSheet(id, "technician", { outcome: "uniform" });
    expect(none).toMatchObject({ status: 400, body: { field: "photo" } });
    expect((await recordSheet(id, "foreignTechnician", { outcome: "uniform", photo: photoFile(indicatorSheetPng(), "s.png") })).status).toBe(404);
    expect((await recordSheet(id, "technician", { outcome: "uniform", photo: photoFile(indicatorSheetPng(), "s.png") })).status).toBe(201);
    const again = await recordSheet(id, "technician", { outcome: "non-uniform", photo: photoFile(indicatorSheetPng(), "s2.png") });
    expect(again).toMatchObject({ status: 422, body: { field: "reason" } });
    const corrected = await recordSheet(id, "technician", { outcome: "non-uniform", photo: photoFile(indicatorSheetPng(), "s2.png"), reason: "The first photo was of yesterday's sheet." });
    expect(corrected).toMatchObject({ status: 201, body: { verdict: "fail" } });
    const { indicatorSheets } = await import("@/db/schema");
    expect(await ctx.db.select().from(indicatorSheets).where(eq(indicatorSheets.cycleId, id))).toHaveLength(2);
  });

  it("a uniform sheet passes: whoever read the sheet cannot sign; another engineer approves and the signature binds the photo", async () => {
    const id = await uploadBowieDickCycle();
    expect((await recordSheet(id, "engineer", { outcome: "uniform", photo: photoFile(indicatorSheetPng(), "uniform.png") })).status).toBe(201);
    expect((await cycleRow(id)).verdict).toBe("pass");
    expect(await submit(id)).toBe(200);
    const own = await sign(id, "engineer", "approved");
    expect(own).toMatchObject({ status: 403, body: { error: "You recorded this cycle's indicator sheet yourself; another engineer must sign it." } });
    const approved = await sign(id, "engineer2", "approved");
    expect(approved.status).toBe(201);
    const { buildRecordBundle } = await import("@/lib/services/record-bundle");
    const row = await cycleRow(id);
    const bundle = await buildRecordBundle({ cycleId: id, analysisId: row.currentAnalysisId! });
    expect(bundle?.indicatorSheet).toMatchObject({ result: "uniform", indicatorLot: "BD-LOT-9", photoSha256: sha256(indicatorSheetPng()) });
    expect(row.status).toBe("approved");
  });
});

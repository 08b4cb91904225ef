import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { createHash } from "node:crypto";
import { eq, sql } from "drizzle-orm";
import { failureOf, useTemporaryDatabase } from "../support/test-db";
import { GIF_START, indicatorSheetPng, JPEG_START, photoFile } from "../support/indicator-photo";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined, revalidateTag: () => undefined }));

const PASSWORD = "a test password";
const IDLE = { status: "idle" as const };
let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const ids: Record<string, string> = {};
const as = (key: string | null) => (session.current = key ? { user: { id: ids[key] } } : null);
const params = (id: string) => ({ params: Promise.resolve({ id }) });
const sha256 = (b: Uint8Array) => createHash("sha256").update(b).digest("hex");
const hourAgo = () => new Date(Date.now() - 3_600_000).toISOString();

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { users, sites, sterilizers, testSchedules } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const passwordHash = await hashPassword(PASSWORD);
  const [site] = await ctx.db.insert(sites).values({ name: "Test site", code: "T", timeZone: "UTC" }).returning();
  const [other] = await ctx.db.insert(sites).values({ name: "Other site", code: "O" }).returning();
  for (const [key, role, siteId] of [
    ["technician", "technician", site.id],
    ["engineer", "engineer", site.id],
    ["engineer2", "engineer", site.id],
    ["auditor", "auditor", site.id],
    ["foreignEngineer", "engineer", other.id],
  ] as const) {
    const [u] = await ctx.db
      .insert(users)
      .values({ email: `${key}@test.example`, name: `The ${key}`, role, passwordHash, siteId })
      .returning();
    ids[key] = u.id;
  }
  const [st] = await ctx.db.insert(sterilizers).values({ siteId: site.id, name: "Porous load 1", serialNumber: "S-1", chamberVolumeL: 445 }).returning();
  ids.sterilizer = st.id;
  await ctx.db.insert(testSchedules).values({ sterilizerId: st.id, kind: "bowie-dick", intervalDays: 7 });
});
afterAll(() => ctx.cleanup());

function bowieDickForm(photo: File | null, outcome = "uniform") {
  const fd = new FormData();
  fd.set("sterilizerId", ids.sterilizer);
  fd.set("performedAt", hourAgo());
  fd.set("outcome", outcome);
  fd.set("indicatorLot", "LOT-77");
  if (photo) fd.set("photo", photo);
  return fd;
}

async function recordBowieDick(who: string, photo: File | null, outcome = "uniform") {
  as(who);
  const { recordBowieDickAction } = await import("@/app/(portal)/periodic-tests/actions");
  return recordBowieDickAction(IDLE, bowieDickForm(photo, outcome));
}

async function latestRecord() {
  const { periodicTests } = await import("@/db/schema");
  const [row] = await ctx.db
    .select()
    .from(periodicTests)
    .orderBy(sql`rowid desc`)
    .limit(1);
  return row;
}

async function countRecords() {
  const { periodicTests } = await import("@/db/schema");
  return (await ctx.db.select().from(periodicTests)).length;
}

async function sign(id: string, who: string, body: Record<string, unknown>) {
  const { POST } = await import("@/app/api/periodic-tests/[id]/signatures/route");
  as(who);
  const res = await POST(
    new Request(`http://papin.test/api/periodic-tests/${id}/signatures`, { method: "POST", body: JSON.stringify(body), headers: { "content-type": "application/json" } }),
    params(id),
  );
  return { status: res.status, body: await res.json() };
}

async function bowieDickSchedule() {
  const { getScheduleOverview } = await import("@/lib/services/periodic-tests");
  const { getUserById } = await import("@/db/queries/users");
  const { rows } = await getScheduleOverview({ actor: (await getUserById({ id: ids.engineer }))! });
  return rows.find((r) => r.kind === "bowie-dick")!;
}

describe("the photo of a Bowie-Dick indicator sheet", () => {
  it("a PNG is stored with its SHA-256 and served inline, typed by its content, never sniffed", async () => {
    const png = indicatorSheetPng();
    const state = await recordBowieDick("technician", photoFile(png, "sheet.png"));
    expect(state).toMatchObject({ status: "ok" });
    const record = await latestRecord();
    expect(record).toMatchObject({ kind: "bowie-dick", result: "pass", status: "submitted", performedBy: ids.technician });
    const { attachments, auditEvents } = await import("@/db/schema");
    const [photo] = await ctx.db.select().from(attachments).where(eq(attachments.ownerId, record.id));
    expect(photo).toMatchObject({ ownerKind: "periodic-test", contentType: "image/png", sizeBytes: png.byteLength, sha256: sha256(png) });
    const [event] = await ctx.db.select().from(auditEvents).where(eq(auditEvents.entityId, record.id));
    expect(JSON.parse(event.newValue!)).toMatchObject({ status: "submitted", photo: { sha256: sha256(png) } });

    const { GET } = await import("@/app/api/attachments/[id]/route");
    as("auditor");
    const res = await GET(new Request(`http://papin.test/api/attachments/${photo.id}`), params(photo.id));
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("image/png");
    expect(res.headers.get("content-disposition")).toMatch(/^inline/);
    expect(res.headers.get("x-content-type-options")).toBe("nosniff");
    expect(sha256(new Uint8Array(await res.arrayBuffer()))).toBe(sha256(png));
    as("foreignEngineer");
    expect((await GET(new Request(`http://papin.test/api/attachments/${photo.id}`), params(photo.id))).status).toBe(404);
    as(null);
    expect((await GET(new Request(`http://papin.test/api/attachments/${photo.id}`), params(photo.id))).status).toBe(401);
  });

  it("a JPEG is accepted by its content even when the browser calls it something else", async () => {
    const jpeg = new Uint8Array([...JPEG_START, ...new Uint8Array(200)]);
    expect(await recordBowieDick("technician", photoFile(jpeg, "IMG_0001.JPG", "application/octet-stream"))).toMatchObject({ status: "ok" });
    const { attachments } = await import("@/db/schema");
    const [photo] = await ctx.db
      .select()
      .from(attachments)
      .where(eq(attachments.ownerId, (await latestRecord()).id));
    expect(photo.contentType).toBe("image/jpeg");
  });

  it("a GIF, a text file named .png, a photo over 10 MB and no photo at all are refused beside the field, and nothing is saved", async () => {
    const before = await countRecords();
    const gif = await recordBowieDick("technician", photoFile(GIF_START, "sheet.gif", "image/gif"));
    expect(gif).toMatchObject({ status: "error", fieldErrors: { photo: "sheet.gif is a GIF image; the photo of the indicator sheet must be a JPEG or PNG image." } });
    const text = await recordBowieDick("technician", photoFile(new TextEncoder().encode("uniform change, lot 77"), "sheet.png"));
    expect(text.fieldErrors?.photo).toBe("sheet.png is not a JPEG or PNG image (its content does not begin like one, whatever its name says); save the photo as JPEG or PNG.");
    // 10 MB = 10 × 1024 × 1024 bytes (the limit); one byte more is refused.
    const big = new Uint8Array(10 * 1024 * 1024 + 1);
    big.set(indicatorSheetPng());
    const tooBig = await recordBowieDick("technician", photoFile(big, "huge.png"));
    expect(tooBig.fieldErrors?.photo).toBe("huge.png is 10.0 MB; the photo of the indicator sheet may be at most 10 MB.");
    const none = await recordBowieDick("technician", null);
    expect(none.fieldErrors?.photo).toBe("Attach a photo of the indicator sheet (JPEG or PNG, up to 10 MB).");
    expect(await countRecords()).toBe(before);
  });
});

describe("signing a periodic-test record", () => {
  it("submitted → approved by an engineer who did not record it; then it counts for the schedule", async () => {
    // Everything recorded above waits for a signature, so the daily Bowie-Dick test has never been passed yet.
    expect((await bowieDickSchedule()).status.state).toBe("never");
    await recordBowieDick("technician", photoFile(indicatorSheetPng(), "today.png"));
    const { id } = await latestRecord();

    expect((await sign(id, "technician", { password: PASSWORD, meaning: "approved" })).status).toBe(403);
    expect((await sign(id, "auditor", { password: PASSWORD, meaning: "approved" })).status).toBe(403);
    expect((await sign(id, "foreignEngineer", { password: PASSWORD, meaning: "approved" })).status).toBe(404);
    expect((await sign(id, "engineer", { password: "wrong", meaning: "approved" })).status).toBe(401);

    const signed = await sign(id, "engineer", { password: PASSWORD, meaning: "approved" });
    expect(signed.status).toBe(201);
    expect(signed.body).toMatchObject({ status: "approved", printedName: "The engineer", meaning: "approved" });
    expect((await sign(id, "engineer2", { password: PASSWORD, meaning: "approved" })).status).toBe(409);

    const { periodicTestSignatures, auditEvents } = await import("@/db/schema");
    const [row] = await ctx.db.select().from(periodicTestSignatures).where(eq(periodicTestSignatures.periodicTestId, id));
    expect(row).toMatchObject({ userId: ids.engineer, printedName: "The engineer", role: "engineer", meaning: "approved", reason: null });
    expect(row.recordHash).toMatch(/^[0-9a-f]{64}$/);
    const events = await ctx.db.select().from(auditEvents).where(eq(auditEvents.entityId, id));
    expect(events.map((e) => e.action)).toEqual(["periodic-test.record", "signature.failed", "periodic-test.sign.approved"]);

    const { getPeriodicTestRecord } = await import("@/lib/services/periodic-test-review");
    const { getUserById } = await import("@/db/queries/users");
    const view = await getPeriodicTestRecord({ actor: (await getUserById({ id: ids.auditor }))!, id });
    expect(view).toMatchObject({ status: "approved", signatures: [{ printedName: "The engineer", valid: true }] });
    expect(view!.photos).toHaveLength(1);

    expect((await bowieDickSchedule()).status.state).toBe("ok");
  });

  it("the engineer who recorded a test cannot sign it", async () => {
    await recordBowieDick("engineer", photoFile(indicatorSheetPng(), "mine.png"));
    const { id } = await latestRecord();
    const own = await sign(id, "engineer", { password: PASSWORD, meaning: "approved" });
    expect(own).toMatchObject({ status: 403, body: { error: "You recorded this test yourself; another engineer must sign it." } });
    expect((await sign(id, "engineer2", { password: PASSWORD, meaning: "approved" })).status).toBe(201);
  });

  it("returned needs a reason, and a returned record does not count", async () => {
    await recordBowieDick("technician", photoFile(indicatorSheetPng(), "wrong-steriliser.png"));
    const { id } = await latestRecord();
    const bare = await sign(id, "engineer", { password: PASSWORD, meaning: "returned" });
    expect(bare).toMatchObject({ status: 422, body: { field: "reason" } });
    const returned = await sign(id, "engineer", { password: PASSWORD, meaning: "returned", reason: "The photo shows another sterilizer's sheet." });
    expect(returned).toMatchObject({ status: 201, body: { status: "returned" } });
    const { periodicTestSignatures } = await import("@/db/schema");
    const [row] = await ctx.db.select().from(periodicTestSignatures).where(eq(periodicTestSignatures.periodicTestId, id));
    expect(row.reason).toBe("The photo shows another sterilizer's sheet.");
    expect((await bowieDickSchedule()).status.state).toBe("ok");
  });

  it("a failing test cannot be approved, only confirmed as a failure; the confirmed failure counts", async () => {
    await recordBowieDick("technician", photoFile(indicatorSheetPng(), "pale-centre.png"), "non-uniform");
    const failed = await latestRecord();
    expect(failed).toMatchObject({ result: "fail", status: "submitted" });
    // Unsigned, the failure does not yet change the schedule.
    expect((await bowieDickSchedule()).status.state).toBe("ok");
    expect((await sign(failed.id, "engineer", { password: PASSWORD, meaning: "approved" })).status).toBe(409);
    const confirmed = await sign(failed.id, "engineer", { password: PASSWORD, meaning: "failure-confirmed" });
    expect(confirmed).toMatchObject({ status: 201, body: { status: "failure-confirmed" } });
    expect((await bowieDickSchedule()).status.state).toBe("failed");

    await recordBowieDick("technician", photoFile(indicatorSheetPng(), "retest.png"));
    const passed = await latestRecord();
    expect((await sign(passed.id, "engineer", { password: PASSWORD, meaning: "failure-confirmed" })).status).toBe(409);
  });

  it("signatures and photos are append-only", async () => {
    expect(await failureOf(ctx.db.run(sql`update periodic_test_signatures set meaning = 'approved'`))).toMatch(/signatures cannot be changed/);
    expect(await failureOf(ctx.db.run(sql`delete from periodic_test_signatures`))).toMatch(/signatures cannot be deleted/);
    expect(await failureOf(ctx.db.run(sql`update attachments set name = 'other.png'`))).toMatch(/attachments cannot be changed/);
    expect(await failureOf(ctx.db.run(sql`delete from attachments`))).toMatch(/attachments cannot be deleted/);
    const { verifyAuditChain } = await import("@/lib/services/audit");
    expect((await verifyAuditChain()).ok).toBe(true);
  });
});

import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { useTemporaryDatabase } from "../support/test-db";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined, revalidateTag: () => undefined }));

const PASSWORD = "a test password";
let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const ids: Record<string, string> = {};
const as = (key: string | null) => (session.current = key ? { user: { id: ids[key] } } : null);
const params = (id: string) => ({ params: Promise.resolve({ id }) });
const hoursAgo = (h: number) => new Date(Date.now() - h * 3_600_000).toISOString();

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { users, sites, sterilizers, acceptanceProfiles } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const passwordHash = await hashPassword(PASSWORD);
  const [site] = await ctx.db.insert(sites).values({ name: "Test site", code: "T" }).returning();
  const [other] = await ctx.db.insert(sites).values({ name: "Other site", code: "O" }).returning();
  ids.site = site.id;
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
  const [profile] = await ctx.db.insert(acceptanceProfiles).values({ siteId: site.id, name: "134 °C / 3 min", sterilizationTempC: 134, holdingTimeS: 180, basis: "en-285" }).returning();
  ids.profile = profile.id;
  const [fluids] = await ctx.db.insert(sterilizers).values({ siteId: site.id, name: "Fluids", serialNumber: "F-1", chamberVolumeL: 320 }).returning();
  ids.fluids = fluids.id;
  const [foreign] = await ctx.db.insert(sterilizers).values({ siteId: other.id, name: "Elsewhere", serialNumber: "X-1", chamberVolumeL: 300 }).returning();
  ids.foreign = foreign.id;
});
afterAll(() => ctx.cleanup());

async function engineerActor() {
  const { getUserById } = await import("@/db/queries/users");
  const u = (await getUserById({ id: ids.engineer }))!;
  return { id: u.id, email: u.email, name: u.name, role: u.role, siteId: u.siteId };
}

async function listApi() {
  const { GET } = await import("@/app/api/sterilizers/route");
  const res = await GET(new Request("http://papin.test/api/sterilizers"), undefined);
  expect(res.status).toBe(200);
  return (await res.json()).items as Array<{ id: string; name: string; status: string; statusReason: string; statusSince: string }>;
}

async function postStatus(key: string, sterilizerId: string, body: Record<string, unknown>) {
  const { POST } = await import("@/app/api/sterilizers/[id]/status/route");
  as(key);
  const res = await POST(
    new Request(`http://papin.test/api/sterilizers/${sterilizerId}/status`, { method: "POST", body: JSON.stringify(body), headers: { "content-type": "application/json" } }),
    params(sterilizerId),
  );
  return { status: res.status, body: await res.json() };
}

async function ledger(action: string, entityId: string) {
  const { auditEvents } = await import("@/db/schema");
  const { and, eq } = await import("drizzle-orm");
  return ctx.db
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.action, action), eq(auditEvents.entityId, entityId)));
}

async function statusMails() {
  const { mailOutbox } = await import("@/db/schema");
  return (await ctx.db.select().from(mailOutbox)).filter((m) => / is (out of use|back in use)$/.test(m.subject));
}

async function events(sterilizerId: string) {
  const { sterilizerStatusEvents } = await import("@/db/schema");
  const { eq } = await import("drizzle-orm");
  return ctx.db.select().from(sterilizerStatusEvents).where(eq(sterilizerStatusEvents.sterilizerId, sterilizerId));
}

async function recordBowieDick(result: "pass" | "fail", status: "submitted" | "approved" | "failure-confirmed", at: string) {
  const { periodicTests } = await import("@/db/schema");
  const [row] = await ctx.db.insert(periodicTests).values({ siteId: ids.site, sterilizerId: ids.porous, kind: "bowie-dick", performedAt: at, performedBy: ids.technician, result, status }).returning();
  return row.id;
}

describe("a vacuum sterilizer's required tests", () => {
  it("a new vacuum sterilizer starts with Bowie-Dick daily and air leakage weekly required before use, and is out of use until they pass (never done = overdue)", async () => {
    as("engineer");
    const { createSterilizerAction } = await import("@/app/(portal)/sterilizers/actions");
    const form = new FormData();
    for (const [k, v] of Object.entries({ name: "Porous 1", serialNumber: "P-1", chamberVolumeL: "445", vacuumAirRemoval: "on" })) form.set(k, v);
    expect((await createSterilizerAction({ status: "idle" }, form)).status).toBe("ok");
    const { sterilizers, testSchedules } = await import("@/db/schema");
    const { eq } = await import("drizzle-orm");
    const [porous] = await ctx.db.select().from(sterilizers).where(eq(sterilizers.serialNumber, "P-1"));
    ids.porous = porous.id;
    const schedule = await ctx.db.select().from(testSchedules).where(eq(testSchedules.sterilizerId, porous.id));
    expect(schedule.map((s) => [s.kind, s.intervalDays, s.requiredBeforeUse]).sort()).toEqual([
      ["air-leakage", 7, true],
      ["bowie-dick", 1, true],
    ]);
    expect(porous.status).toBe("out-of-use");
    expect(porous.statusReason).toContain("No signed passing Bowie-Dick test is on record; it is required before use.");
    expect(await ledger("sterilizer.out-of-use", porous.id)).toHaveLength(1);
    const mails = await statusMails();
    expect(mails).toHaveLength(1);
    expect(mails[0]).toMatchObject({ subject: "Porous 1 is out of use", siteId: ids.site });
    // The site's engineers, not the other site's.
    expect([...mails[0].to].sort()).toEqual(["engineer2@test.example", "engineer@test.example"]);
  });

  it("GET /api/sterilizers carries status, statusReason and statusSince; a second read changes nothing", async () => {
    as("technician");
    const items = await listApi();
    const porous = items.find((i) => i.id === ids.porous)!;
    expect(porous).toMatchObject({ status: "out-of-use" });
    expect(porous.statusReason).toMatch(/required before use/);
    expect(Number.isNaN(Date.parse(porous.statusSince))).toBe(false);
    expect(items.find((i) => i.id === ids.fluids)).toMatchObject({ status: "in-use" });
    expect(items.some((i) => i.id === ids.foreign)).toBe(false);
    await listApi();
    expect(await events(ids.porous)).toHaveLength(1);
    expect(await statusMails()).toHaveLength(1);
  });

  it("passes that are not yet signed do not count; approved passes of both tests bring it back into use", async () => {
    await recordBowieDick("pass", "submitted", hoursAgo(2));
    const { periodicTests } = await import("@/db/schema");
    await ctx.db
      .insert(periodicTests)
      .values({ siteId: ids.site, sterilizerId: ids.porous, kind: "air-leakage", performedAt: hoursAgo(2), performedBy: ids.technician, result: "pass", status: "approved" });
    const { refreshSterilizerStatus } = await import("@/lib/services/sterilizer-status");
    await refreshSterilizerStatus({ sterilizerId: ids.porous, cause: "test" });
    as("technician");
    expect((await listApi()).find((i) => i.id === ids.porous)).toMatchObject({ status: "out-of-use", statusReason: expect.stringMatching(/Bowie-Dick/) });

    await recordBowieDick("pass", "approved", hoursAgo(1));
    await refreshSterilizerStatus({ sterilizerId: ids.porous, actor: await engineerActor(), cause: "periodic test signed" });
    const item = (await listApi()).find((i) => i.id === ids.porous)!;
    expect(item.status).toBe("in-use");
    const [audit] = await ledger("sterilizer.in-use", ids.porous);
    expect(audit).toMatchObject({ actorId: ids.engineer });
    expect(JSON.parse(audit.oldValue!)).toMatchObject({ status: "out-of-use" });
    expect(JSON.parse(audit.newValue!)).toMatchObject({ status: "in-use", cause: "periodic test signed" });
    expect((await statusMails()).map((m) => m.subject)).toContain("Porous 1 is back in use");
  });

  it("a confirmed failure takes it out of use; a release cannot stand in for the required test; an approved retest brings it back", async () => {
    await recordBowieDick("fail", "failure-confirmed", hoursAgo(0.5));
    const { refreshSterilizerStatus } = await import("@/lib/services/sterilizer-status");
    await refreshSterilizerStatus({ sterilizerId: ids.porous, cause: "periodic test signed" });
    as("technician");
    const out = (await listApi()).find((i) => i.id === ids.porous)!;
    expect(out.status).toBe("out-of-use");
    expect(out.statusReason).toMatch(/^The Bowie-Dick test of \d{4}-\d{2}-\d{2} failed \(confirmed\); it must pass again before use\.$/);
    expect(await ledger("sterilizer.out-of-use", ids.porous)).toHaveLength(2);

    // Bowie-Dick is required daily: after its failure only a passing retest makes it current.
    const refused = await postStatus("engineer", ids.porous, { status: "in-use", reason: "indicator batch suspect", password: PASSWORD });
    expect(refused.status).toBe(409);
    expect(refused.body.error).toMatch(/cannot make a required test current/);
    expect((await events(ids.porous)).filter((e) => e.kind === "manual")).toHaveLength(0);

    await recordBowieDick("pass", "approved", hoursAgo(0.1));
    await refreshSterilizerStatus({ sterilizerId: ids.porous, cause: "periodic test signed" });
    expect((await listApi()).find((i) => i.id === ids.porous)).toMatchObject({ status: "in-use" });
  });
});

describe("an engineer's signed decision", () => {
  it("a technician is refused (403), an engineer of another site gets 404, a wrong password is refused and nothing changes", async () => {
    const body = { status: "out-of-use", reason: "door seal leaking", password: PASSWORD };
    expect((await postStatus("technician", ids.fluids, body)).status).toBe(403);
    expect((await postStatus("auditor", ids.fluids, body)).status).toBe(403);
    expect((await postStatus("foreignEngineer", ids.fluids, body)).status).toBe(404);
    const wrong = await postStatus("engineer", ids.fluids, { ...body, password: "not it" });
    expect(wrong.status).toBe(401);
    expect(wrong.body.field).toBe("password");
    expect(await ledger("signature.failed", ids.fluids)).toHaveLength(1);
    const noReason = await postStatus("engineer", ids.fluids, { status: "out-of-use", password: PASSWORD });
    expect(noReason.status).toBe(422);
    expect(noReason.body.field).toBe("reason");
    as("technician");
    expect((await listApi()).find((i) => i.id === ids.fluids)).toMatchObject({ status: "in-use" });
    expect(await events(ids.fluids)).toHaveLength(0);
  });

  it("takes a sterilizer out of use with a signed event, a ledger entry and a mail; the hold outlasts passing tests", async () => {
    const mailsBefore = (await statusMails()).length;
    const res = await postStatus("engineer", ids.fluids, { status: "out-of-use", reason: "door seal leaking", password: PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ status: "out-of-use", statusReason: "Taken out of use by The engineer: door seal leaking." });
    const [event] = await events(ids.fluids);
    expect(event).toMatchObject({
      kind: "manual",
      status: "out-of-use",
      reason: "door seal leaking",
      userId: ids.engineer,
      printedName: "The engineer",
      role: "engineer",
      passwordReauthenticated: true,
    });
    const [audit] = await ledger("sterilizer.out-of-use", ids.fluids);
    expect(audit).toMatchObject({ actorId: ids.engineer, reason: "door seal leaking" });
    expect(JSON.parse(audit.oldValue!)).toMatchObject({ status: "in-use" });
    expect((await statusMails()).length).toBe(mailsBefore + 1);
    // Taking it out twice is refused: the hold stands until released.
    expect((await postStatus("engineer2", ids.fluids, { status: "out-of-use", reason: "again", password: PASSWORD })).status).toBe(409);

    const { cycles } = await import("@/db/schema");
    await ctx.db
      .insert(cycles)
      .values({ siteId: ids.site, sterilizerId: ids.fluids, profileId: ids.profile, cycleNumber: "F-1", createdBy: ids.technician, status: "approved", verdict: "pass", startedAt: hoursAgo(0.2) });
    const { refreshSterilizerStatus } = await import("@/lib/services/sterilizer-status");
    await refreshSterilizerStatus({ sterilizerId: ids.fluids, cause: "cycle signed" });
    as("technician");
    expect((await listApi()).find((i) => i.id === ids.fluids)).toMatchObject({ status: "out-of-use" });
  });

  it("a release clears the hold and acknowledges a confirmed failure of a cycle, signed", async () => {
    const { cycles } = await import("@/db/schema");
    // F's final status name; until it lands the column's type does not list it yet.
    const [failed] = await ctx.db
      .insert(cycles)
      .values({
        siteId: ids.site,
        sterilizerId: ids.fluids,
        profileId: ids.profile,
        cycleNumber: "F-2",
        createdBy: ids.technician,
        status: "failure-confirmed" as never,
        verdict: "fail",
        startedAt: hoursAgo(0.1),
      })
      .returning();
    const { refreshSterilizerStatus } = await import("@/lib/services/sterilizer-status");
    await refreshSterilizerStatus({ sterilizerId: ids.fluids, cause: "cycle signed" });
    as("technician");
    const reason = (await listApi()).find((i) => i.id === ids.fluids)!.statusReason;
    expect(reason).toContain("Taken out of use by The engineer: door seal leaking.");
    expect(reason).toMatch(/Thermometric test, small load of \d{4}-\d{2}-\d{2} failed \(confirmed\)\./);

    const res = await postStatus("engineer2", ids.fluids, { status: "in-use", reason: "seal replaced; load F-2 reprocessed", password: PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ status: "in-use", statusReason: "Released by The engineer2: seal replaced; load F-2 reprocessed." });
    const release = (await events(ids.fluids)).find((e) => e.kind === "manual" && e.status === "in-use")!;
    expect(release).toMatchObject({ printedName: "The engineer2", role: "engineer", passwordReauthenticated: true, acknowledged: [`cycle:${failed.id}`] });
    const [audit] = await ledger("sterilizer.in-use", ids.fluids);
    expect(audit).toMatchObject({ actorId: ids.engineer2, reason: "seal replaced; load F-2 reprocessed" });
    expect((await statusMails()).filter((m) => m.subject === "Fluids is back in use")).toHaveLength(1);
    // Releasing an in-use sterilizer is refused.
    expect((await postStatus("engineer", ids.fluids, { status: "in-use", reason: "again", password: PASSWORD })).status).toBe(409);
  });

  it("the same decision works as a server action; a technician's is refused", async () => {
    const { setSterilizerStatusAction } = await import("@/app/(portal)/sterilizers/actions");
    const form = (values: Record<string, string>) => {
      const fd = new FormData();
      for (const [k, v] of Object.entries(values)) fd.set(k, v);
      return fd;
    };
    as("technician");
    const refused = await setSterilizerStatusAction({ status: "idle" }, form({ sterilizerId: ids.fluids, status: "out-of-use", reason: "steam leak", password: PASSWORD }));
    expect(refused).toMatchObject({ status: "error" });
    expect(refused.message).toMatch(/role does not allow/);
    as("engineer");
    const missing = await setSterilizerStatusAction({ status: "idle" }, form({ sterilizerId: ids.fluids, status: "out-of-use", reason: "", password: PASSWORD }));
    expect(missing.fieldErrors?.reason).toMatch(/reason/);
    const done = await setSterilizerStatusAction({ status: "idle" }, form({ sterilizerId: ids.fluids, status: "out-of-use", reason: "steam leak at the door", password: PASSWORD }));
    expect(done).toMatchObject({ status: "ok" });
    expect(done.message).toMatch(/^Fluids is out of use\./);
  });

  it("the home board shows every role the same statuses, and the ledger's chain still holds", async () => {
    const { getHomeDashboard } = await import("@/lib/services/dashboard");
    const { getUserById } = await import("@/db/queries/users");
    for (const key of ["technician", "auditor", "engineer"]) {
      const u = (await getUserById({ id: ids[key] }))!;
      const home = await getHomeDashboard({ actor: { id: u.id, email: u.email, name: u.name, role: u.role, siteId: u.siteId } });
      expect(home.board.map((b) => [b.name, b.status])).toEqual([
        ["Fluids", "out-of-use"],
        ["Porous 1", "in-use"],
      ]);
    }
    const { verifyAuditChain } = await import("@/lib/services/audit");
    expect((await verifyAuditChain()).ok).toBe(true);
  });

  it("status events are append-only", async () => {
    const { failureOf } = await import("../support/test-db");
    const { sterilizerStatusEvents } = await import("@/db/schema");
    expect(await failureOf(ctx.db.update(sterilizerStatusEvents).set({ reason: "edited" }))).toMatch(/append-only/);
    expect(await failureOf(ctx.db.delete(sterilizerStatusEvents))).toMatch(/append-only/);
  });
});

import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { createHash } from "node:crypto";
import { API_TOKEN_SHOWN_CHARS } from "@/lib/domain";
import { useTemporaryDatabase } from "../support/test-db";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));
vi.mock("next/cache", () => ({ revalidatePath: () => {} }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const people: Record<string, { id: string; email: string; name: string; role: "technician" | "engineer" | "auditor" | "admin"; siteId: string }> = {};
const ids = { site: "", otherSite: "", washer: "", autoclave: "", profile: "" };
const DAY_MS = 86_400_000;

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { sites, users, sterilizers, acceptanceProfiles } = await import("@/db/schema");
  const [site] = await ctx.db.insert(sites).values({ name: "Token site", code: "TOK" }).returning();
  const [other] = await ctx.db.insert(sites).values({ name: "Other site", code: "OTH" }).returning();
  ids.site = site.id;
  ids.otherSite = other.id;
  const accounts = [
    ["engineer", site.id],
    ["technician", site.id],
    ["auditor", site.id],
    ["admin", site.id],
    ["otherEngineer", other.id],
    ["leaver", site.id],
  ] as const;
  for (const [key, siteId] of accounts) {
    const role = key === "otherEngineer" || key === "leaver" ? "engineer" : key;
    const [u] = await ctx.db
      .insert(users)
      .values({ email: `${key}@tokens.example`, name: key, role, passwordHash: "not used", siteId })
      .returning();
    people[key] = { id: u.id, email: u.email, name: u.name, role: u.role, siteId };
  }
  const [profile] = await ctx.db.insert(acceptanceProfiles).values({ siteId: site.id, name: "134 °C small load", sterilizationTempC: 134, holdingTimeS: 180, basis: "en-13060" }).returning();
  ids.profile = profile.id;
  const [a] = await ctx.db.insert(sterilizers).values({ siteId: site.id, name: "Chamber A", serialNumber: "A-1", chamberVolumeL: 23, defaultProfileId: profile.id }).returning();
  const [b] = await ctx.db.insert(sterilizers).values({ siteId: site.id, name: "Chamber B", serialNumber: "B-1", chamberVolumeL: 23, defaultProfileId: profile.id }).returning();
  ids.autoclave = a.id;
  ids.washer = b.id;
}, 120_000);
afterAll(() => ctx.cleanup());

async function issue(as: string, input: Partial<{ name: string; expiresInDays: number; sterilizerIds: string[] }> = {}, now?: Date) {
  const { issueApiToken } = await import("@/lib/services/api-tokens");
  return issueApiToken({ actor: people[as], input: { name: "Gateway 1", expiresInDays: 90, sterilizerIds: [], ...input }, now });
}

const bearer = (token: string) => ({ authorization: `Bearer ${token}` });

async function uploadRequest(token: string, sterilizerId: string) {
  const { simulateCycle, toLoggerCsv } = await import("@/lib/simulator");
  const sim = simulateCycle({ scenario: "pass", sterilizationTempC: 134.6, holdingTimeS: 210, seed: 5, startedAt: new Date("2026-11-20T08:00:00Z") });
  const form = new FormData();
  form.set("sterilizerId", sterilizerId);
  form.set("profileId", ids.profile);
  form.append("files", new Blob([toLoggerCsv(sim) as BlobPart], { type: "text/csv" }), "gateway.csv");
  return new Request("http://papin.test/api/cycles", { method: "POST", body: form, headers: bearer(token) });
}

async function ledger(action: string) {
  const { auditEvents } = await import("@/db/schema");
  const { eq } = await import("drizzle-orm");
  return ctx.db.select().from(auditEvents).where(eq(auditEvents.action, action));
}

describe("issuing and listing API tokens", () => {
  it("shows the token once and stores only its SHA-256, with a ledger event", async () => {
    const issued = await issue("engineer", { name: "Issued once" });
    expect(issued.token).toMatch(/^papin_gw_[A-Za-z0-9_-]{43}$/);
    const { apiTokens } = await import("@/db/schema");
    const { eq } = await import("drizzle-orm");
    const [row] = await ctx.db.select().from(apiTokens).where(eq(apiTokens.id, issued.id));
    expect(row.tokenHash).toBe(createHash("sha256").update(issued.token).digest("hex"));
    expect(JSON.stringify(row)).not.toContain(issued.token.slice(API_TOKEN_SHOWN_CHARS));
    expect(row.siteId).toBe(ids.site);
    expect(row.createdBy).toBe(people.engineer.id);
    // 90 days after issue by default (the form's default), to the millisecond
    expect(Date.parse(row.expiresAt) - Date.parse(row.createdAt)).toBeGreaterThan(90 * DAY_MS - 5_000);
    expect(Date.parse(row.expiresAt) - Date.parse(row.createdAt)).toBeLessThan(90 * DAY_MS + 5_000);
    const events = (await ledger("api-token.issue")).filter((e) => e.entityId === issued.id);
    expect(events).toHaveLength(1);
    expect(events[0].newValue).not.toContain(issued.token);

    const { listApiTokens } = await import("@/lib/services/api-tokens");
    const { tokens } = await listApiTokens({ actor: people.admin });
    const listed = tokens.find((t) => t.id === issued.id)!;
    expect(listed).toMatchObject({ name: "Issued once", prefix: issued.prefix, scope: "gateway", issuedBy: "engineer", state: "active", lastUsedAt: null, sterilizerNames: null });
    expect(Object.keys(listed)).not.toContain("tokenHash");
  });

  it("lets engineers and admins issue, not technicians or auditors (403)", async () => {
    for (const role of ["technician", "auditor"]) await expect(issue(role)).rejects.toMatchObject({ status: 403 });
    await expect(issue("admin", { name: "By the admin" })).resolves.toMatchObject({ prefix: expect.stringMatching(/^papin_gw_/) });
  });

  it("requires an expiry of at most one year, 90 days when the form leaves it out", async () => {
    const { issueApiTokenSchema } = await import("@/lib/validations/api-tokens");
    expect(issueApiTokenSchema.parse({ name: "Default" }).expiresInDays).toBe(90);
    const tooLong = issueApiTokenSchema.safeParse({ name: "Long", expiresInDays: "366" });
    expect(tooLong.success).toBe(false);
    expect(tooLong.error?.issues[0].message).toMatch(/365 days/);
    await expect(issue("engineer", { expiresInDays: 366 })).rejects.toMatchObject({ status: 422, field: "expiresInDays" });
  });

  it("refuses a sterilizer of another site", async () => {
    await expect(issue("otherEngineer", { sterilizerIds: [ids.autoclave] })).rejects.toMatchObject({ status: 404, field: "sterilizerIds" });
  });
});

describe("a gateway token on the three routes", () => {
  it("lists only its sterilizers, and the site's profiles, without a session", async () => {
    session.current = null;
    const { token } = await issue("engineer", { name: "Limited", sterilizerIds: [ids.autoclave] });
    const { GET: sterilizers } = await import("@/app/api/sterilizers/route");
    const { GET: profiles } = await import("@/app/api/profiles/route");
    const s = await sterilizers(new Request("http://papin.test/api/sterilizers", { headers: bearer(token) }), undefined);
    expect(s.status).toBe(200);
    expect((await s.json()).items.map((i: { name: string }) => i.name)).toEqual(["Chamber A"]);
    const p = await profiles(new Request("http://papin.test/api/profiles", { headers: bearer(token) }), undefined);
    expect(p.status).toBe(200);
    expect((await p.json()).items.map((i: { id: string }) => i.id)).toEqual([ids.profile]);
  });

  it("uploads a cycle as its issuer, names the token in the cycle's event, and writes each use to the ledger", async () => {
    session.current = null;
    const { id: tokenId, token } = await issue("engineer", { name: "Uploader", sterilizerIds: [ids.autoclave] });
    const { POST } = await import("@/app/api/cycles/route");
    const response = await POST(await uploadRequest(token, ids.autoclave), undefined);
    expect(response.status).toBe(201);
    const { id: cycleId } = await response.json();
    const { cycles, apiTokens } = await import("@/db/schema");
    const { eq } = await import("drizzle-orm");
    const [cycle] = await ctx.db.select().from(cycles).where(eq(cycles.id, cycleId));
    expect(cycle.createdBy).toBe(people.engineer.id);
    const [created] = (await ledger("cycle.create")).filter((e) => e.entityId === cycleId);
    expect(JSON.parse(created.newValue!).apiToken).toMatchObject({ id: tokenId, name: "Uploader" });
    const uses = (await ledger("api-token.used")).filter((e) => e.entityId === tokenId);
    expect(uses).toHaveLength(1);
    expect(JSON.parse(uses[0].newValue!).route).toBe("POST /api/cycles");
    expect(uses[0].entityType).toBe("api-token");
    const [row] = await ctx.db.select().from(apiTokens).where(eq(apiTokens.id, tokenId));
    expect(row.lastUsedAt).not.toBeNull();
  });

  it("refuses a cycle for a sterilizer the token was not issued for (403), storing nothing", async () => {
    const { token } = await issue("engineer", { name: "Only A", sterilizerIds: [ids.autoclave] });
    const { POST } = await import("@/app/api/cycles/route");
    const { cycles } = await import("@/db/schema");
    const before = (await ctx.db.select().from(cycles)).length;
    const response = await POST(await uploadRequest(token, ids.washer), undefined);
    expect(response.status).toBe(403);
    expect((await response.json()).error).toMatch(/only for the sterilizers it was issued for/);
    expect((await ctx.db.select().from(cycles)).length).toBe(before);
  });

  it("is refused with 401 on any other route, naming the routes it opens", async () => {
    const { token } = await issue("engineer", { name: "Elsewhere" });
    const { GET: cycles } = await import("@/app/api/cycles/route");
    const { GET: instruments } = await import("@/app/api/instruments/route");
    for (const [handler, url] of [
      [cycles, "http://papin.test/api/cycles"],
      [instruments, "http://papin.test/api/instruments"],
    ] as const) {
      session.current = { user: { id: people.engineer.id } };
      const response = await handler(new Request(url, { headers: bearer(token) }), undefined);
      expect(response.status).toBe(401);
      expect((await response.json()).error).toMatch(/API tokens are accepted only on POST \/api\/cycles, GET \/api\/sterilizers, GET \/api\/profiles/);
    }
    session.current = null;
  });
});

describe("refused tokens answer 401 with a plain sentence", () => {
  async function listWith(token: string) {
    const { GET } = await import("@/app/api/sterilizers/route");
    const response = await GET(new Request("http://papin.test/api/sterilizers", { headers: bearer(token) }), undefined);
    return { status: response.status, error: (await response.json()).error as string };
  }

  it("an expired token", async () => {
    const { token } = await issue("engineer", { name: "Old", expiresInDays: 30 }, new Date(Date.now() - 31 * DAY_MS));
    expect(await listWith(token)).toMatchObject({ status: 401, error: expect.stringMatching(/"Old"\) expired on/) });
  });

  it("a revoked token, revoked by an engineer of its own site with a reason in the ledger", async () => {
    const { id, token } = await issue("engineer", { name: "Lost gateway" });
    expect((await listWith(token)).status).toBe(200);
    const { revokeApiToken } = await import("@/lib/services/api-tokens");
    await expect(revokeApiToken({ actor: people.otherEngineer, id, reason: "not mine" })).rejects.toMatchObject({ status: 404 });
    await expect(revokeApiToken({ actor: people.technician, id, reason: "not allowed" })).rejects.toMatchObject({ status: 403 });
    await revokeApiToken({ actor: people.admin, id, reason: "gateway stolen" });
    await expect(revokeApiToken({ actor: people.engineer, id, reason: "again" })).rejects.toMatchObject({ status: 409 });
    expect(await listWith(token)).toMatchObject({ status: 401, error: expect.stringMatching(/was revoked on/) });
    const [event] = (await ledger("api-token.revoke")).filter((e) => e.entityId === id);
    expect(event).toMatchObject({ actorId: people.admin.id, reason: "gateway stolen" });
  });

  it("an unknown or malformed token, without a ledger event", async () => {
    const before = (await ledger("api-token.used")).length;
    expect(await listWith(`papin_gw_${"A".repeat(43)}`)).toMatchObject({ status: 401, error: expect.stringMatching(/not known/) });
    expect(await listWith("hunter2")).toMatchObject({ status: 401, error: expect.stringMatching(/does not hold a Papin API token/) });
    expect((await ledger("api-token.used")).length).toBe(before);
  });

  it("a token whose issuer was disabled", async () => {
    const { token } = await issue("leaver", { name: "Leaver's gateway" });
    expect((await listWith(token)).status).toBe(200);
    const { users } = await import("@/db/schema");
    const { eq } = await import("drizzle-orm");
    await ctx.db.update(users).set({ disabled: true }).where(eq(users.id, people.leaver.id));
    expect(await listWith(token)).toMatchObject({ status: 401, error: expect.stringMatching(/account that issued this API token/) });
  });
});

import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { execFileSync } from "node:child_process";
import { writeFileSync } from "node:fs";
import path from "node:path";
import { eq, sql } from "drizzle-orm";
import { useTemporaryDatabase } from "../support/test-db";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));

const PASSWORD = "a demo password";
let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const people: Record<string, { id: string; name: string }> = {};
let secondEngineer = "";
let sterilizerId = "";
let profileId = "";

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { loadDemoSite } = await import("@/db/seed");
  await loadDemoSite(ctx.db, { password: PASSWORD });
  const { users, sterilizers, acceptanceProfiles, sites } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  for (const u of await ctx.db.select().from(users)) people[u.role] = { id: u.id, name: u.name };
  const [site] = await ctx.db.select().from(sites);
  const [e2] = await ctx.db
    .insert(users)
    .values({ email: "second.engineer@papin.example", name: "Second Engineer", role: "engineer", passwordHash: await hashPassword(PASSWORD), siteId: site.id })
    .returning();
  secondEngineer = e2.id;
  sterilizerId = (await ctx.db.select().from(sterilizers).limit(1))[0].id;
  profileId = (await ctx.db.select().from(acceptanceProfiles)).find((p) => p.sterilizationTempC === 134 && p.maxEquilibrationS === 15)!.id;
}, 180_000);
afterAll(() => ctx.cleanup());

const as = (id: string | null) => (session.current = id ? { user: { id } } : null);
const params = (id: string) => ({ params: Promise.resolve({ id }) });

async function upload(asUser: string, scenario: "pass" | "air" = "pass") {
  const { simulateCycle, toLoggerCsv } = await import("@/lib/simulator");
  const { POST } = await import("@/app/api/cycles/route");
  const sim = simulateCycle({ scenario, sterilizationTempC: 134.6, holdingTimeS: 210, seed: 5, startedAt: new Date("2026-11-25T07:00:00Z") });
  const form = new FormData();
  form.set("sterilizerId", sterilizerId);
  form.set("profileId", profileId);
  form.append("files", new Blob([toLoggerCsv(sim) as BlobPart]), "cycle.csv");
  as(asUser);
  const res = await POST(new Request("http://papin.test/api/cycles", { method: "POST", body: form }), undefined);
  expect(res.status).toBe(201);
  return (await res.json()).id as string;
}

async function submit(id: string, asUser: string) {
  const { POST } = await import("@/app/api/cycles/[id]/submit/route");
  as(asUser);
  return POST(new Request(`http://papin.test/api/cycles/${id}/submit`, { method: "POST" }), params(id));
}

async function sign(id: string, asUser: string, body: Record<string, unknown>) {
  const { POST } = await import("@/app/api/cycles/[id]/signatures/route");
  as(asUser);
  return POST(new Request(`http://papin.test/api/cycles/${id}/signatures`, { method: "POST", body: JSON.stringify(body), headers: { "content-type": "application/json" } }), params(id));
}

async function detail(id: string) {
  const { GET } = await import("@/app/api/cycles/[id]/route");
  as(people.auditor.id);
  return (await GET(new Request("http://papin.test"), params(id))).json();
}

describe("the review workflow on the server", () => {
  it("technician submits; an auditor may neither submit nor sign; a technician may not sign", async () => {
    const id = await upload(people.technician.id);
    expect((await submit(id, people.auditor.id)).status).toBe(403);
    expect((await submit(id, people.technician.id)).status).toBe(200);
    expect((await submit(id, people.technician.id)).status).toBe(409);
    expect((await sign(id, people.technician.id, { password: PASSWORD, meaning: "approved" })).status).toBe(403);
    expect((await sign(id, people.auditor.id, { password: PASSWORD, meaning: "approved" })).status).toBe(403);
    expect((await sign(id, people.admin.id, { password: PASSWORD, meaning: "approved" })).status).toBe(403);
  });

  it("an engineer cannot approve a cycle they uploaded themselves, but another engineer can", async () => {
    const id = await upload(people.engineer.id);
    expect((await submit(id, people.engineer.id)).status).toBe(200);
    const own = await sign(id, people.engineer.id, { password: PASSWORD, meaning: "approved" });
    expect(own.status).toBe(403);
    expect((await own.json()).error).toMatch(/uploaded this cycle yourself/);
    const other = await sign(id, secondEngineer, { password: PASSWORD, meaning: "approved" });
    expect(other.status).toBe(201);
    const d = await detail(id);
    expect(d.status).toBe("approved");
    expect(d.signatures).toHaveLength(1);
    expect(d.signatures[0]).toMatchObject({ printedName: "Second Engineer", meaning: "approved", valid: true });
    expect(d.report.reportNumber).toMatch(/^PR-/);
  });

  it("a wrong password refuses the signature (401) and is recorded; five in a row lock signing (423)", async () => {
    const id = await upload(people.technician.id);
    await submit(id, people.technician.id);
    for (let i = 0; i < 4; i++) expect((await sign(id, people.engineer.id, { password: "wrong", meaning: "approved" })).status).toBe(401);
    const fifth = await sign(id, people.engineer.id, { password: "wrong", meaning: "approved" });
    expect(fifth.status).toBe(423);
    const locked = await sign(id, people.engineer.id, { password: PASSWORD, meaning: "approved" });
    expect(locked.status).toBe(423);
    const { auditEvents, users } = await import("@/db/schema");
    const failures = await ctx.db.select().from(auditEvents).where(eq(auditEvents.entityId, id));
    expect(failures.filter((e) => e.action === "signature.failed")).toHaveLength(4);
    expect(failures.filter((e) => e.action === "signature.locked")).toHaveLength(1);
    await ctx.db.update(users).set({ signingLockedUntil: null, failedSigningAttempts: 0 }).where(eq(users.id, people.engineer.id));
  });

  it("rejecting needs a reason; a rejected cycle is corrected with a new file and submitted again; the old analysis is kept", async () => {
    const id = await upload(people.technician.id, "air");
    await submit(id, people.technician.id);
    const noReason = await sign(id, people.engineer.id, { password: PASSWORD, meaning: "rejected" });
    expect(noReason.status).toBe(400);
    expect((await noReason.json()).error).toMatch(/reason/i);
    expect((await sign(id, people.engineer.id, { password: PASSWORD, meaning: "rejected", reason: "Air in the chamber: check the door seal and repeat." })).status).toBe(201);
    expect((await detail(id)).status).toBe("rejected");

    const { simulateCycle, toLoggerCsv } = await import("@/lib/simulator");
    const { POST } = await import("@/app/api/cycles/[id]/analyses/route");
    const form = new FormData();
    form.append("file", new Blob([toLoggerCsv(simulateCycle({ scenario: "pass", sterilizationTempC: 134.6, holdingTimeS: 210, seed: 6 })) as BlobPart]), "repeat.csv");
    as(people.technician.id);
    const corrected = await POST(new Request(`http://papin.test/api/cycles/${id}/analyses`, { method: "POST", body: form }), params(id));
    expect(corrected.status).toBe(201);
    const d = await detail(id);
    expect(d.analysis.verdict).toBe("pass");
    expect(d.analysisHistory).toHaveLength(2);
    expect(d.files).toHaveLength(2);
    expect((await submit(id, people.technician.id)).status).toBe(200);
    expect((await sign(id, people.engineer.id, { password: PASSWORD, meaning: "approved" })).status).toBe(201);
    expect((await detail(id)).status).toBe("approved");
  });

  it("approved records are locked: no new analysis, no second approval", async () => {
    const id = await upload(people.technician.id);
    await submit(id, people.technician.id);
    await sign(id, people.engineer.id, { password: PASSWORD, meaning: "approved" });
    const { POST } = await import("@/app/api/cycles/[id]/analyses/route");
    const form = new FormData();
    form.set("mapping", JSON.stringify({ temperatureUnit: "C" }));
    as(people.technician.id);
    expect((await POST(new Request(`http://papin.test/api/cycles/${id}/analyses`, { method: "POST", body: form }), params(id))).status).toBe(409);
    expect((await sign(id, secondEngineer, { password: PASSWORD, meaning: "approved" })).status).toBe(409);
  });

  it("a signature no longer verifies after the stored analysis is altered", async () => {
    const id = await upload(people.technician.id);
    await submit(id, people.technician.id);
    await sign(id, people.engineer.id, { password: PASSWORD, meaning: "reviewed" });
    expect((await detail(id)).signatures[0].valid).toBe(true);
    await ctx.db.run(sql`update analyses set result = json_set(result, '$.holdingTime', 999) where cycle_id = ${id}`);
    expect((await detail(id)).signatures[0].valid).toBe(false);
  });

  it("the archived PDF verifies byte for byte; one altered byte does not", async () => {
    const id = await upload(people.technician.id);
    await submit(id, people.technician.id);
    await sign(id, people.engineer.id, { password: PASSWORD, meaning: "approved" });
    const { GET } = await import("@/app/api/cycles/[id]/report/route");
    as(people.auditor.id);
    const res = await GET(new Request("http://papin.test"), params(id));
    expect(res.headers.get("content-type")).toBe("application/pdf");
    const pdf = new Uint8Array(await res.arrayBuffer());
    expect(Buffer.from(pdf.slice(0, 5)).toString()).toBe("%PDF-");
    const again = new Uint8Array(await (await GET(new Request("http://papin.test"), params(id))).arrayBuffer());
    expect(Buffer.compare(Buffer.from(pdf), Buffer.from(again))).toBe(0);

    const file = path.join(ctx.dir, "report.pdf");
    writeFileSync(file, pdf);
    const text = execFileSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" });
    expect(text).toContain(people.engineer.name);
    expect(text).toMatch(/competent person/i);
    expect(text).toMatch(/PASS/i);

    const { POST } = await import("@/app/api/reports/verify/route");
    const verify = async (bytes: Uint8Array) => {
      const form = new FormData();
      form.append("file", new Blob([bytes as BlobPart], { type: "application/pdf" }), "r.pdf");
      return (await POST(new Request("http://papin.test/api/reports/verify", { method: "POST", body: form }), undefined)).json();
    };
    expect(await verify(pdf)).toMatchObject({ match: true, cycleId: id });
    const altered = pdf.slice();
    altered[Math.floor(altered.length / 2)] ^= 0x01;
    expect(await verify(altered)).toMatchObject({ match: false });

    const { listArchivedReports } = await import("@/db/queries/reviews");
    const auditor = { id: people.auditor.id, email: "auditor@papin.example", name: "", role: "auditor" as const, siteId: (await detail(id)).site.id };
    const { report } = await detail(id);
    expect((await listArchivedReports({ actor: auditor, q: report.reportNumber })).map((r) => r.cycleId)).toEqual([id]);
    expect(await listArchivedReports({ actor: auditor, q: "no such report" })).toEqual([]);
    expect(await listArchivedReports({ actor: auditor, to: "2000-01-01" })).toEqual([]);
  });

  it("the ledger verifies after the whole workflow, and the verifier names a row altered behind the triggers' back", async () => {
    const { GET } = await import("@/app/api/audit/verify/route");
    as(people.auditor.id);
    const ok = await (await GET(new Request("http://papin.test"), undefined)).json();
    expect(ok.ok).toBe(true);
    expect(ok.events).toBeGreaterThan(20);
    as(people.technician.id);
    expect((await GET(new Request("http://papin.test"), undefined)).status).toBe(403);
    await ctx.db.run(sql`drop trigger audit_events_no_update`);
    await ctx.db.run(sql`update audit_events set reason = 'nothing happened' where seq = 7`);
    as(people.auditor.id);
    const broken = await (await GET(new Request("http://papin.test"), undefined)).json();
    expect(broken).toMatchObject({ ok: false, firstBrokenAt: 7 });
  });
});

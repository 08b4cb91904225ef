import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq, sql } from "drizzle-orm";
import { useTemporaryDatabase } from "../support/test-db";
import { loadReviewSite, loggerFile, reviewFlow, type ReviewSite } from "../support/review-flow";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
let site: ReviewSite;
let flow: ReturnType<typeof reviewFlow>;

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  site = await loadReviewSite(ctx.db);
  flow = reviewFlow(session, site);
}, 120_000);
afterAll(() => ctx.cleanup());

const passing = async (asUser = site.people.technician) => flow.register(asUser, { bytes: await loggerFile() });

describe("the review workflow on the server", () => {
  it("technician submits; an auditor may neither submit nor sign; a technician and an administrator may not sign", async () => {
    const id = await passing();
    expect((await flow.submit(id, site.people.auditor)).status).toBe(403);
    expect((await flow.submit(id, site.people.technician)).status).toBe(200);
    expect((await flow.submit(id, site.people.technician)).status).toBe(409);
    for (const who of [site.people.technician, site.people.auditor, site.people.admin]) expect((await flow.sign(id, who, { meaning: "approved" })).status).toBe(403);
    expect((await flow.detail(id)).status).toBe("submitted");
  });

  it("an engineer cannot approve a cycle they registered themselves, but another engineer can", async () => {
    const id = await passing(site.people.engineer);
    expect((await flow.submit(id, site.people.engineer)).status).toBe(200);
    const own = await flow.sign(id, site.people.engineer, { meaning: "approved" });
    expect(own.status).toBe(403);
    expect((await own.json()).error).toMatch(
      /Segregation of duties: you registered this cycle, uploaded a file of it and made one of its analyses, so another engineer must approve it or confirm its failure/,
    );
    const other = await flow.sign(id, site.people.engineer2, { meaning: "approved" });
    expect(other.status).toBe(201);
    const d = await flow.detail(id);
    expect(d.status).toBe("approved");
    expect(d.signatures).toHaveLength(1);
    expect(d.signatures[0]).toMatchObject({ printedName: "Review engineer2", meaning: "approved", valid: true });
    expect(d.report.reportNumber).toMatch(/^PR-/);
  });

  it("a wrong password refuses the signature (401) and is recorded; five in a row lock signing (423)", async () => {
    const id = await passing();
    await flow.submit(id, site.people.technician);
    for (let i = 0; i < 4; i++) expect((await flow.sign(id, site.people.engineer, { password: "wrong", meaning: "approved" })).status).toBe(401);
    expect((await flow.sign(id, site.people.engineer, { password: "wrong", meaning: "approved" })).status).toBe(423);
    expect((await flow.sign(id, site.people.engineer, { meaning: "approved" })).status).toBe(423);
    const { auditEvents, users } = await import("@/db/schema");
    const events = await ctx.db.select().from(auditEvents).where(eq(auditEvents.entityId, id));
    expect(events.filter((e) => e.action === "signature.failed")).toHaveLength(4);
    expect(events.filter((e) => e.action === "signature.locked")).toHaveLength(1);
    await ctx.db.update(users).set({ signingLockedUntil: null, failedSigningAttempts: 0 }).where(eq(users.id, site.people.engineer));
  });

  it("returning needs a reason; a returned cycle is corrected with a new file and its reason, submitted again and approved; the old analysis is kept", async () => {
    const id = await flow.register(site.people.technician, { bytes: await loggerFile({ scenario: "air" }) });
    await flow.submit(id, site.people.technician);
    const noReason = await flow.sign(id, site.people.engineer, { meaning: "returned" });
    expect(noReason.status).toBe(400);
    expect((await noReason.json()).error).toMatch(/reason/i);
    expect((await flow.sign(id, site.people.engineer, { meaning: "returned", reason: "The drain probe was outside the drain: refit it and repeat." })).status).toBe(201);
    expect((await flow.detail(id)).status).toBe("returned");

    const corrected = await flow.correct(id, site.people.technician, { file: await loggerFile(), fileName: "repeat.csv", reason: "Repeated with the drain probe refitted." });
    expect(corrected.status).toBe(201);
    const d = await flow.detail(id);
    expect(d.analysis.verdict).toBe("pass");
    expect(d.analysisHistory).toHaveLength(2);
    expect(d.analysisHistory[0]).toMatchObject({ reason: "Repeated with the drain probe refitted.", fileName: "repeat.csv", createdByName: "Review technician" });
    expect(d.files).toHaveLength(2);
    expect((await flow.submit(id, site.people.technician)).status).toBe(200);
    expect((await flow.sign(id, site.people.engineer, { meaning: "approved" })).status).toBe(201);
    expect((await flow.detail(id)).status).toBe("approved");
  });

  it("approved records are locked: no new analysis, no second signature, no submission", async () => {
    const id = await passing();
    await flow.submit(id, site.people.technician);
    expect((await flow.sign(id, site.people.engineer, { meaning: "approved" })).status).toBe(201);
    expect((await flow.correct(id, site.people.technician, { mapping: { temperatureUnit: "C" }, reason: "Temperatures read in °C." })).status).toBe(409);
    expect((await flow.sign(id, site.people.engineer2, { meaning: "approved" })).status).toBe(409);
    expect((await flow.submit(id, site.people.technician)).status).toBe(409);
  });

  it("a signature no longer verifies after the stored analysis is altered", async () => {
    const id = await passing();
    await flow.submit(id, site.people.technician);
    await flow.sign(id, site.people.engineer, { meaning: "reviewed" });
    expect((await flow.detail(id)).signatures[0].valid).toBe(true);
    await ctx.db.run(sql`update analyses set result = json_set(result, '$.holdingTime', 999) where cycle_id = ${id}`);
    expect((await flow.detail(id)).signatures[0].valid).toBe(false);
  });

  it("the archived PDF verifies byte for byte; one altered byte does not", async () => {
    const id = await passing();
    await flow.submit(id, site.people.technician);
    await flow.sign(id, site.people.engineer, { meaning: "approved" });
    const { GET } = await import("@/app/api/cycles/[id]/report/route");
    flow.as(site.people.auditor);
    const params = { params: Promise.resolve({ id }) };
    const res = await GET(new Request("http://papin.test"), params);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    const pdf = new Uint8Array(await res.arrayBuffer());
    expect(Buffer.from(pdf.slice(0, 5)).toString()).toBe("%PDF-");
    const again = new Uint8Array(await (await GET(new Request("http://papin.test"), { params: Promise.resolve({ id }) })).arrayBuffer());
    expect(Buffer.compare(Buffer.from(pdf), Buffer.from(again))).toBe(0);

    const { text } = await flow.reportText(id, ctx.dir);
    expect(text).toContain("Review engineer");
    expect(text).toMatch(/competent person/i);
    expect(text).toMatch(/PASS/);
    // The instrument and its certificate in force on the cycle's date (25 Nov 2026): CAL-26-0001, due 1 Jan 2027.
    expect(text).toContain("Certificate CAL-26-0001");
    expect(text).toContain("Calibration due 2027-01-01");

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
    const auditor = { id: site.people.auditor, email: "auditor@review.example", name: "", role: "auditor" as const, siteId: site.siteId };
    const { report } = await flow.detail(id);
    expect((await listArchivedReports({ actor: auditor, q: report.reportNumber })).map((r) => r.cycleId)).toEqual([id]);
    expect(await listArchivedReports({ actor: auditor, q: "no such report" })).toEqual([]);
    expect(await listArchivedReports({ actor: auditor, to: "2000-01-01" })).toEqual([]);
  });

  it("the ledger verifies after the whole workflow, and the verifier names a row altered behind the triggers' back", async () => {
    const { GET } = await import("@/app/api/audit/verify/route");
    flow.as(site.people.auditor);
    const ok = await (await GET(new Request("http://papin.test"), undefined)).json();
    expect(ok.ok).toBe(true);
    expect(ok.events).toBeGreaterThan(20);
    flow.as(site.people.technician);
    expect((await GET(new Request("http://papin.test"), undefined)).status).toBe(403);
    await ctx.db.run(sql`drop trigger audit_events_no_update`);
    await ctx.db.run(sql`update audit_events set reason = 'nothing happened' where seq = 7`);
    flow.as(site.people.auditor);
    const broken = await (await GET(new Request("http://papin.test"), undefined)).json();
    expect(broken).toMatchObject({ ok: false, firstBrokenAt: 7 });
  });
});

import { execFileSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, eq, sql } from "drizzle-orm";
import { useTemporaryDatabase } from "../support/test-db";
import { loadReviewSite, REVIEW_PASSWORD, reviewFlow, type ReviewSite } from "../support/review-flow";
import { studyFlow } from "../support/study-flow";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
let site: ReviewSite;
let studies: ReturnType<typeof studyFlow>;
let qa: string;
let outsider: string;
let studyId: string;
const work = mkdtempSync(path.join(tmpdir(), "papin-study-report-api-"));
const URL_BASE = "http://papin.test";
const as = (userId: string) => (session.current = { user: { id: userId } });

async function report(id: string, asUser: string) {
  const { GET } = await import("@/app/api/studies/[id]/report/route");
  as(asUser);
  return GET(new Request(`${URL_BASE}/api/studies/${id}/report`), { params: Promise.resolve({ id }) });
}
const textOf = (bytes: Uint8Array, name: string) => {
  const file = path.join(work, `${name}.pdf`);
  writeFileSync(file, bytes);
  return execFileSync("pdftotext", [file, "-"], { encoding: "utf8" }).replace(/\s+/g, " ");
};
async function verify(bytes: Uint8Array, asUser: string) {
  const { POST } = await import("@/app/api/reports/verify/route");
  as(asUser);
  const form = new FormData();
  form.set("file", new Blob([bytes as BlobPart], { type: "application/pdf" }), "report.pdf");
  const res = await POST(new Request(`${URL_BASE}/api/reports/verify`, { method: "POST", body: form }), undefined);
  expect(res.status).toBe(200);
  return res.json();
}
async function studyEvents(action: string) {
  const { auditEvents } = await import("@/db/schema");
  return ctx.db
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.entityId, studyId), eq(auditEvents.action, action)));
}

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  site = await loadReviewSite(ctx.db);
  studies = studyFlow(session, site, reviewFlow(session, site));
  const { users, sites } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const passwordHash = await hashPassword(REVIEW_PASSWORD);
  const [u] = await ctx.db.insert(users).values({ email: "qa@review.example", name: "Review QA", role: "engineer", passwordHash, siteId: site.siteId }).returning();
  qa = u.id;
  const [other] = await ctx.db.insert(sites).values({ name: "Other hospital", code: "OTHER" }).returning();
  const [o] = await ctx.db.insert(users).values({ email: "auditor@other.example", name: "Other auditor", role: "auditor", passwordHash, siteId: other.id }).returning();
  outsider = o.id;
  studyId = await studies.createId(site.people.engineer, { runsRequired: 1, indicatorsRequired: false, maxSpreadK: 3, title: "Textile pack report test" });
  expect((await studies.sign(studyId, site.people.engineer2, { meaning: "protocol-approved" })).status).toBe(201);
  expect((await studies.attach(studyId, site.people.technician, { cycleId: await studies.signedCycle() })).status).toBe(201);
}, 240_000);
afterAll(() => ctx.cleanup());

describe("GET /api/studies/{id}/report", () => {
  it("serves a running study's report as a draft marked NOT APPROVED, audited; another site's study is 404", async () => {
    const res = await report(studyId, site.people.technician);
    expect(res.status).toBe(200);
    expect(res.headers.get("x-papin-report")).toBe("draft");
    const text = textOf(new Uint8Array(await res.arrayBuffer()), "draft");
    expect(text).toContain("DRAFT — NOT APPROVED");
    expect(text).toContain("Textile pack, one per basket");
    expect(text).toContain("The study is not concluded");
    expect(await studyEvents("study.report-draft")).toHaveLength(1);
    expect((await report(studyId, outsider)).status).toBe(404);
  }, 120_000);

  it("after QA approval serves the archived bytes, which the checker recognises as the study's report; one changed byte does not verify", async () => {
    expect((await studies.sign(studyId, site.people.engineer, { meaning: "submitted-for-review" })).status).toBe(201);
    expect((await studies.sign(studyId, site.people.engineer2, { meaning: "reviewed" })).status).toBe(201);
    expect((await studies.sign(studyId, qa, { meaning: "qa-approved" })).status).toBe(201);
    const d = await studies.detail(studyId, site.people.auditor);

    const res = await report(studyId, site.people.auditor);
    expect(res.status).toBe(200);
    expect(res.headers.get("x-papin-report")).toBe("archived");
    const bytes = new Uint8Array(await res.arrayBuffer());
    const { studyReports } = await import("@/db/schema");
    const [stored] = await ctx.db.select().from(studyReports).where(eq(studyReports.studyId, studyId));
    expect(Buffer.compare(Buffer.from(stored.bytes), Buffer.from(bytes))).toBe(0);
    const text = textOf(bytes, "archived");
    expect(text).toContain(`Study ${d.studyNumber}`);
    expect(text).toContain("APPROVED");
    expect(text).not.toContain("DRAFT");
    expect(text).toContain("Review QA");
    expect(text).toContain("Approved for quality assurance:");

    const match = await verify(bytes, site.people.technician);
    expect(match).toMatchObject({ match: true, kind: "study-report", studyId, studyNumber: d.studyNumber, reportNumber: `${d.studyNumber}-R`, archivedAt: stored.createdAt });
    expect((await studyEvents("study.report-verify")).map((e) => JSON.parse(e.newValue!).match)).toEqual([true]);

    const changed = new Uint8Array(bytes);
    changed[Math.floor(changed.length / 2)] ^= 0x01;
    const refused = await verify(changed, site.people.technician);
    expect(refused.match).toBe(false);
    expect(refused.kind).toBeUndefined();

    // Another site's archive does not hold it.
    expect((await verify(bytes, outsider)).match).toBe(false);
  }, 240_000);

  it("refuses archived bytes changed behind the ledger's back, and says so in the ledger", async () => {
    const definitions = await ctx.db.all<{ sql: string }>(sql`select sql from sqlite_master where type = 'trigger' and name = 'study_reports_no_update'`);
    await ctx.db.run(sql.raw("drop trigger study_reports_no_update"));
    try {
      const { studyReports } = await import("@/db/schema");
      const { sha256Hex } = await import("@/lib/integrity");
      const [stored] = await ctx.db.select().from(studyReports).where(eq(studyReports.studyId, studyId));
      const forged = Buffer.from(stored.bytes);
      forged[forged.length - 10] ^= 0x01;
      // Bytes and hash changed together: only the ledger event of the QA approval still names the true hash.
      await ctx.db
        .update(studyReports)
        .set({ bytes: forged, sha256: sha256Hex(new Uint8Array(forged)) })
        .where(eq(studyReports.id, stored.id));
      const res = await report(studyId, site.people.auditor);
      expect(res.status).toBe(409);
      expect((await res.json()).error).toMatch(/does not match the SHA-256 the audit ledger recorded/);
      const check = await verify(new Uint8Array(forged), site.people.auditor);
      expect(check).toMatchObject({ match: false });
      expect(check.problem).toMatch(/audit ledger/);
      expect((await studyEvents("study.report-integrity-failed")).length).toBeGreaterThanOrEqual(2);
    } finally {
      for (const d of definitions) await ctx.db.run(sql.raw(d.sql));
    }
  }, 120_000);
});

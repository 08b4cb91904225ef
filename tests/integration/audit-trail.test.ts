import { execFileSync } from "node:child_process";
import { writeFileSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import Papa from "papaparse";
import { useTemporaryDatabase } from "../support/test-db";
import { loadReviewSite, loggerFile, reviewFlow, type ReviewSite } from "../support/review-flow";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
let site: ReviewSite;
let flow: ReturnType<typeof reviewFlow>;
let cycleId: string;
let cycleNumber: string;
let otherSiteCycleEvent: number;

const URL_BASE = "http://papin.test";
const actorOf = async (id: string) => {
  const { users } = await import("@/db/schema");
  const [u] = await ctx.db.select().from(users).where(eq(users.id, id));
  return { id: u.id, email: u.email, name: u.name, role: u.role, siteId: u.siteId };
};

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  site = await loadReviewSite(ctx.db);
  flow = reviewFlow(session, site);
  cycleId = await flow.register(site.people.technician, { bytes: await loggerFile() });
  expect((await flow.submit(cycleId, site.people.technician)).status).toBe(200);
  expect((await flow.sign(cycleId, site.people.engineer, { meaning: "approved" })).status).toBe(201);
  cycleNumber = (await flow.detail(cycleId)).cycleNumber;
  // An event of another site, which no reader of this site may see.
  const { sites } = await import("@/db/schema");
  const [other] = await ctx.db.insert(sites).values({ name: "Other hospital", code: "OTHER" }).returning();
  const { recordAuditEvent } = await import("@/db/queries/audit");
  await recordAuditEvent({ actorId: null, actorEmail: "someone@other.example", siteId: other.id, action: "cycle.submit", entityType: "cycle", entityId: cycleId });
  const { getLedgerHead } = await import("@/db/queries/audit");
  otherSiteCycleEvent = (await getLedgerHead()).lastSeq;
}, 180_000);
afterAll(() => ctx.cleanup());

describe("the audit trail service", () => {
  it("lets an engineer read the site's trail in words, filtered by a cycle number, without other sites' events", async () => {
    const { getAuditTrail } = await import("@/lib/services/audit-trail");
    const engineer = await actorOf(site.people.engineer);
    const trail = await getAuditTrail({ actor: engineer, query: { record: cycleNumber }, page: 1 });
    const whats = trail.lines.map((l) => l.what);
    expect(whats).toContain(`approved cycle ${cycleNumber}`);
    expect(whats).toContain(`submitted cycle ${cycleNumber} for review`);
    expect(whats).toContain(`registered and analysed cycle ${cycleNumber}`);
    expect(trail.lines.map((l) => l.seq)).not.toContain(otherSiteCycleEvent);
    const approval = trail.lines.find((l) => l.what.startsWith("approved"))!;
    expect(approval).toMatchObject({ who: "Review engineer", role: "Validation engineer", record: { href: `/cycles/${cycleId}` } });
    expect(trail.filterWords).toEqual([`record ${cycleNumber}`]);
  });

  it("filters by person and action, and by site dates", async () => {
    const { getAuditTrail } = await import("@/lib/services/audit-trail");
    const auditor = await actorOf(site.people.auditor);
    const byTech = await getAuditTrail({ actor: auditor, query: { person: site.people.technician }, page: 1 });
    expect(byTech.total).toBeGreaterThan(0);
    expect(new Set(byTech.lines.map((l) => l.who))).toEqual(new Set(["Review technician"]));
    const approvals = await getAuditTrail({ actor: auditor, query: { action: "cycle.sign.approved" }, page: 1 });
    expect(approvals.lines.map((l) => l.what)).toEqual([`approved cycle ${cycleNumber}`]);
    const future = await getAuditTrail({ actor: auditor, query: { from: "2099-01-01" }, page: 1 });
    expect(future.total).toBe(0);
    const todays = await getAuditTrail({ actor: auditor, query: { from: "2000-01-01", to: "2099-12-31" }, page: 1 });
    expect(todays.total).toBeGreaterThanOrEqual(approvals.total);
  });

  it("shows a filter it cannot read as a problem with no events, never the whole trail", async () => {
    const { getAuditTrail } = await import("@/lib/services/audit-trail");
    const trail = await getAuditTrail({ actor: await actorOf(site.people.auditor), query: { from: "12/11/2026" }, page: 1 });
    expect(trail.problem).toMatch(/start date "12\/11\/2026" is not a date/);
    expect(trail.lines).toEqual([]);
    const unknownCycle = await getAuditTrail({ actor: await actorOf(site.people.auditor), query: { record: "NO-SUCH-CYCLE" }, page: 1 });
    expect(unknownCycle.total).toBe(0);
  });

  it("refuses a technician (403)", async () => {
    const { getAuditTrail } = await import("@/lib/services/audit-trail");
    await expect(getAuditTrail({ actor: await actorOf(site.people.technician), query: {}, page: 1 })).rejects.toMatchObject({ status: 403 });
  });
});

describe("the exports", () => {
  it("streams the filtered events as CSV with the columns in words and records the export", async () => {
    const { GET } = await import("@/app/api/audit/export/route");
    session.current = { user: { id: site.people.auditor } };
    const res = await GET(new Request(`${URL_BASE}/api/audit/export?record=${encodeURIComponent(cycleNumber)}`), undefined);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-disposition")).toMatch(/^attachment; filename="?papin-audit-trail-\d{8}-\d{6}\.csv"?$/);
    const text = (await res.text()).replace(/^\uFEFF/, "");
    const rows = Papa.parse<string[]>(text.trim()).data;
    expect(rows[0]).toEqual(["sequence", "UTC time", "site time", "person", "role", "action", "record", "reason", "old", "new", "event hash"]);
    const approval = rows.find((r) => r[5] === `approved cycle ${cycleNumber}`);
    expect(approval).toBeDefined();
    expect(approval!.slice(3, 7)).toEqual(["Review engineer", "Validation engineer", `approved cycle ${cycleNumber}`, `cycle ${cycleNumber}`]);
    expect(approval![8]).toBe("Status: Awaiting review");
    expect(approval![10]).toMatch(/^[0-9a-f]{64}$/);
    const { auditEvents } = await import("@/db/schema");
    const [stored] = await ctx.db
      .select()
      .from(auditEvents)
      .where(eq(auditEvents.seq, Number(approval![0])));
    expect(stored.hash).toBe(approval![10]);
    expect(rows.length - 1).toBe(Number(res.headers.get("x-papin-events")));
    const [exported] = await ctx.db.select().from(auditEvents).where(eq(auditEvents.action, "audit.export"));
    expect(JSON.parse(exported.newValue!)).toMatchObject({ format: "csv", events: rows.length - 1, filter: `record ${cycleNumber}` });
  });

  it("refuses an export over the limit with a sentence asking to narrow the filter, and writes nothing", async () => {
    const { AUDIT_CSV_LIMIT, AUDIT_PDF_LIMIT, exportAuditCsv, exportAuditPdf } = await import("@/lib/services/audit-export");
    expect(AUDIT_CSV_LIMIT).toBe(50_000);
    expect(AUDIT_PDF_LIMIT).toBeLessThan(AUDIT_CSV_LIMIT);
    const auditor = await actorOf(site.people.auditor);
    const { getLedgerHead } = await import("@/db/queries/audit");
    const before = (await getLedgerHead()).lastSeq;
    // three events match this cycle (registered, submitted, approved): a limit of 2 is exceeded
    await expect(exportAuditCsv({ actor: auditor, query: { record: cycleNumber }, limit: 2 })).rejects.toMatchObject({
      status: 422,
      message: expect.stringMatching(/^The filter matches \d+ events; a CSV export holds at most 2\. Narrow the filter/),
    });
    await expect(exportAuditPdf({ actor: auditor, query: { record: cycleNumber }, limit: 2 })).rejects.toMatchObject({ status: 422 });
    expect((await getLedgerHead()).lastSeq).toBe(before);
  });

  it("renders a signed PDF extract, writes its SHA-256 to the ledger, and the report checker recognises it", async () => {
    const { GET } = await import("@/app/api/audit/extract/route");
    session.current = { user: { id: site.people.engineer } };
    const res = await GET(new Request(`${URL_BASE}/api/audit/extract?record=${encodeURIComponent(cycleNumber)}`), undefined);
    expect(res.status).toBe(200);
    const bytes = new Uint8Array(await res.arrayBuffer());
    const { sha256Hex } = await import("@/lib/integrity");
    const sha256 = sha256Hex(bytes);
    expect(res.headers.get("x-papin-sha256")).toBe(sha256);
    const file = path.join(ctx.dir, "extract.pdf");
    writeFileSync(file, bytes);
    const text = execFileSync("pdftotext", [file, "-"], { encoding: "utf8" }).replace(/\s+/g, " ");
    expect(text).toContain("Audit trail of Review test hospital");
    expect(text).toContain("Review engineer (Validation engineer, engineer@review.example)");
    expect(text).toContain(`record ${cycleNumber}`);
    expect(text).toContain(`approved cycle ${cycleNumber}`);
    const head = /(\d+) events in the whole ledger; the last is event (\d+), chain hash \(SHA-256\): ([0-9a-f]{64})/.exec(text);
    expect(head).not.toBeNull();
    const { auditEvents } = await import("@/db/schema");
    const [headEvent] = await ctx.db
      .select()
      .from(auditEvents)
      .where(eq(auditEvents.seq, Number(head![2])));
    expect(headEvent.hash).toBe(head![3]);
    const hashes = [...text.matchAll(/event hash ([0-9a-f]{64})/g)].map((m) => m[1]);
    expect(hashes.length).toBeGreaterThanOrEqual(3);

    const events = await ctx.db.select().from(auditEvents).where(eq(auditEvents.action, "audit.export"));
    const pdfEvent = events.find((e) => JSON.parse(e.newValue!).format === "pdf")!;
    expect(JSON.parse(pdfEvent.newValue!)).toMatchObject({ sha256, events: hashes.length });

    const { POST } = await import("@/app/api/reports/verify/route");
    const form = new FormData();
    form.append("file", new Blob([bytes as BlobPart], { type: "application/pdf" }), "extract.pdf");
    session.current = { user: { id: site.people.auditor } };
    const verified = await (await POST(new Request(`${URL_BASE}/api/reports/verify`, { method: "POST", body: form }), undefined)).json();
    expect(verified).toMatchObject({ match: true, kind: "audit-extract", sha256, seq: pdfEvent.seq, exportedBy: "engineer@review.example" });

    const altered = new Uint8Array(bytes);
    altered[altered.length - 10] ^= 1;
    const form2 = new FormData();
    form2.append("file", new Blob([altered as BlobPart], { type: "application/pdf" }), "extract.pdf");
    expect(await (await POST(new Request(`${URL_BASE}/api/reports/verify`, { method: "POST", body: form2 }), undefined)).json()).toMatchObject({ match: false });
  }, 60_000);
});

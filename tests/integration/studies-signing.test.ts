import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, eq } from "drizzle-orm";
import { useTemporaryDatabase } from "../support/test-db";
import { loadReviewSite, REVIEW_PASSWORD, reviewFlow, type ReviewSite } from "../support/review-flow";
import { studyFlow } from "../support/study-flow";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
let site: ReviewSite;
let studies: ReturnType<typeof studyFlow>;
/** a third engineer: quality assurance, neither author (engineer) nor reviewer (engineer2) */
let qa: string;

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  site = await loadReviewSite(ctx.db);
  studies = studyFlow(session, site, reviewFlow(session, site));
  const { users } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const [u] = await ctx.db
    .insert(users)
    .values({ email: "qa@review.example", name: "Review QA", role: "engineer", passwordHash: await hashPassword(REVIEW_PASSWORD), siteId: site.siteId })
    .returning();
  qa = u.id;
}, 120_000);
afterAll(() => ctx.cleanup());

const errorOf = async (res: Response) => (await res.json()).error as string;
const BI = {
  kind: "biological",
  organism: "Geobacillus stearothermophilus",
  lot: "BI-2611-A",
  population: 1.5e6,
  incubation: "56 °C, 48 h",
  readBy: "Review technician",
  readAt: "2026-11-27T09:00:00Z",
};

async function events(studyId: string) {
  const { auditEvents } = await import("@/db/schema");
  return ctx.db
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.entityType, "study"), eq(auditEvents.entityId, studyId)));
}

/** Protocol approved by engineer2, `runs` passing runs attached by the technician (spread allowed 3 K: see studies.test.ts). */
async function running(runs: number, body: Record<string, unknown> = {}) {
  const id = await studies.createId(site.people.engineer, { runsRequired: runs, indicatorsRequired: false, maxSpreadK: 3, ...body });
  expect((await studies.sign(id, site.people.engineer2, { meaning: "protocol-approved" })).status).toBe(201);
  const runIds: string[] = [];
  for (let i = 0; i < runs; i++) {
    const res = await studies.attach(id, site.people.technician, { cycleId: await studies.signedCycle() });
    runIds.push((await res.json()).runId);
  }
  return { id, runIds };
}

describe("signature rules per role", () => {
  it("the author cannot approve the protocol; technicians, auditors and administrators cannot sign; another engineer can, with the password", async () => {
    const id = await studies.createId(site.people.engineer);
    const own = await studies.sign(id, site.people.engineer, { meaning: "protocol-approved" });
    expect(own.status).toBe(403);
    expect(await errorOf(own)).toMatch(/Segregation of duties: you wrote this study/);
    for (const who of [site.people.technician, site.people.auditor, site.people.admin]) expect((await studies.sign(id, who, { meaning: "protocol-approved" })).status).toBe(403);
    expect((await studies.sign(id, site.people.engineer2, { meaning: "protocol-approved", password: "wrong" })).status).toBe(401);
    expect((await studies.sign(id, site.people.engineer2, { meaning: "protocol-approved" })).status).toBe(201);
    const d = await studies.detail(id, site.people.auditor);
    expect(d.status).toBe("protocol-approved");
    expect(d.signatures).toHaveLength(1);
    expect(d.signatures[0]).toMatchObject({ meaning: "protocol-approved", printedName: "Review engineer2", role: "engineer" });
    expect(d.signatures[0].contentHash).toMatch(/^[0-9a-f]{64}$/);
    const ledger = await events(id);
    expect(ledger.find((e) => e.action === "study.sign.protocol-approved")).toBeTruthy();
    // The wrong password is in the study's ledger too (lib/services/reauthenticate.ts).
    expect(ledger.filter((e) => e.action === "signature.failed")).toHaveLength(1);
  });

  it("only the author submits, and only a complete series; the author cannot review or QA-approve; QA must differ from the reviewer; the study is approved, its report archived and the pattern's requalification date set", async () => {
    const { id } = await running(1);
    expect((await studies.sign(id, site.people.engineer2, { meaning: "submitted-for-review" })).status).toBe(403);
    expect((await studies.sign(id, site.people.engineer, { meaning: "submitted-for-review" })).status).toBe(201);
    expect((await studies.detail(id, site.people.engineer)).status).toBe("ready-for-review");
    expect((await studies.sign(id, site.people.engineer, { meaning: "reviewed" })).status).toBe(403);
    const early = await studies.sign(id, qa, { meaning: "qa-approved" });
    expect(early.status).toBe(409);
    expect(await errorOf(early)).toMatch(/must be reviewed/);
    expect((await studies.sign(id, site.people.engineer2, { meaning: "reviewed" })).status).toBe(201);
    expect((await studies.sign(id, site.people.engineer, { meaning: "qa-approved" })).status).toBe(403);
    const sameAsReviewer = await studies.sign(id, site.people.engineer2, { meaning: "qa-approved" });
    expect(sameAsReviewer.status).toBe(403);
    expect(await errorOf(sameAsReviewer)).toMatch(/you reviewed this study/);
    expect((await studies.detail(id, qa)).allowed.sign).toEqual(["qa-approved", "failed", "returned"]);
    const approved = await studies.sign(id, qa, { meaning: "qa-approved" });
    expect(approved.status).toBe(201);
    const body = await approved.json();
    const d = await studies.detail(id, site.people.auditor);
    expect(d.status).toBe("approved");
    expect(d.report).toMatchObject({ reportNumber: `${d.studyNumber}-R`, sha256: body.report.sha256 });
    // The site calendar is UTC here; 12 months after today (the approval), the same day of the month or the month's last day.
    const { addMonths } = await import("@/lib/studies/dates");
    expect(d.loadingPattern.requalificationDueOn).toBe(addMonths(new Date().toISOString().slice(0, 10), 12));
    const { studyReports } = await import("@/db/schema");
    const { sha256Hex } = await import("@/lib/integrity");
    const [stored] = await ctx.db.select().from(studyReports).where(eq(studyReports.studyId, id));
    expect(sha256Hex(new Uint8Array(stored.bytes))).toBe(d.report.sha256);
    expect(Buffer.from(stored.bytes).subarray(0, 5).toString()).toBe("%PDF-");
    const qaEvent = (await events(id)).find((e) => e.action === "study.sign.qa-approved")!;
    expect(JSON.parse(qaEvent.newValue!)).toMatchObject({ status: "approved", reportSha256: d.report.sha256, requalificationDueOn: d.loadingPattern.requalificationDueOn });
    // Closed: nothing more changes.
    expect((await studies.sign(id, site.people.engineer2, { meaning: "failed", reason: "late" })).status).toBe(409);
    expect((await studies.raise(id, site.people.technician, { what: "late" })).status).toBe(409);
  });

  it("returned (with a reason) sends the study back to running; a new round needs a new review", async () => {
    const { id } = await running(1);
    await studies.sign(id, site.people.engineer, { meaning: "submitted-for-review" });
    await studies.sign(id, site.people.engineer2, { meaning: "reviewed" });
    expect((await studies.sign(id, qa, { meaning: "returned" })).status).toBe(400);
    expect((await studies.sign(id, qa, { meaning: "returned", reason: "Attach the chart of run 1's BI incubator." })).status).toBe(201);
    expect((await studies.detail(id, site.people.engineer)).status).toBe("running");
    await studies.sign(id, site.people.engineer, { meaning: "submitted-for-review" });
    const res = await studies.sign(id, qa, { meaning: "qa-approved" });
    expect(res.status).toBe(409);
    expect(await errorOf(res)).toMatch(/must be reviewed/);
  });
});

describe("indicators and the deviation gate", () => {
  it("a run waits (pending) for its biological indicators; a positive one fails the run and opens a deviation; QA approval is refused while it is open and allowed after it is closed with a reason", async () => {
    const { id, runIds } = await running(1, { indicatorsRequired: true });
    let d = await studies.detail(id, site.people.technician);
    expect(d.summary.runs[0].judgement).toBe("pending");
    expect((await studies.sign(id, site.people.engineer, { meaning: "submitted-for-review" })).status).toBe(409);
    for (const positionId of ["P1", "P2"]) expect((await studies.indicator(id, site.people.technician, { ...BI, runId: runIds[0], positionId, result: "no-growth" })).status).toBe(201);
    expect((await studies.indicator(id, site.people.auditor, { ...BI, runId: runIds[0], positionId: "P3", result: "no-growth" })).status).toBe(403);
    const positive = await studies.indicator(id, site.people.technician, { ...BI, runId: runIds[0], positionId: "P3", result: "growth" });
    expect(positive.status).toBe(201);
    d = await studies.detail(id, site.people.technician);
    expect(d.summary.runs[0].judgement).toBe("fail");
    const deviation = d.deviations.find((x: { source: string }) => x.source === "positive-indicator");
    expect(deviation).toMatchObject({ status: "open", runId: runIds[0] });
    expect(deviation.what).toMatch(/position P3 \(Pack side\).*Growth/);

    // A correction of the same reading needs a reason; the latest counts.
    expect((await studies.indicator(id, site.people.technician, { ...BI, runId: runIds[0], positionId: "P3", result: "no-growth" })).status).toBe(400);
    expect((await studies.indicator(id, site.people.technician, { ...BI, runId: runIds[0], positionId: "P3", result: "no-growth", reason: "Read against the wrong carrier; re-read." })).status).toBe(
      201,
    );
    d = await studies.detail(id, site.people.technician);
    expect(d.summary.runs[0].judgement).toBe("pass");
    expect(d.indicators.filter((i: { positionId: string; current: boolean }) => i.positionId === "P3").map((i: { current: boolean }) => i.current)).toEqual([false, true]);

    // The open deviation blocks submission (and so QA approval) until an engineer closes it.
    const blocked = await studies.sign(id, site.people.engineer, { meaning: "submitted-for-review" });
    expect(blocked.status).toBe(409);
    expect(await errorOf(blocked)).toMatch(/deviation is open/);
    const tooEarly = await studies.patchDeviation(id, deviation.id, site.people.engineer2, { close: true, reason: "Investigated." });
    expect(tooEarly.status).toBe(409);
    expect(await errorOf(tooEarly)).toMatch(/impact assessment and the root cause/);
    expect((await studies.patchDeviation(id, deviation.id, site.people.technician, { impact: "None: the re-read is negative.", rootCause: "Carrier mix-up at reading." })).status).toBe(200);
    expect((await studies.patchDeviation(id, deviation.id, site.people.technician, { close: true, reason: "Technicians cannot." })).status).toBe(403);
    expect((await studies.patchDeviation(id, deviation.id, site.people.engineer2, { close: true, reason: "Re-read negative; reading procedure retrained." })).status).toBe(200);
    expect((await studies.patchDeviation(id, deviation.id, site.people.engineer2, { impact: "changed after closing" })).status).toBe(409);
    expect((await studies.sign(id, site.people.engineer, { meaning: "submitted-for-review" })).status).toBe(201);

    // A deviation raised during review blocks QA approval until it is closed.
    const raised = await studies.raise(id, site.people.technician, { what: "The BI incubator's log has a gap on 27 November.", impact: "Incubation may have been interrupted." });
    expect(raised.status).toBe(201);
    const raisedId = (await raised.json()).id;
    await studies.sign(id, site.people.engineer2, { meaning: "reviewed" });
    const refused = await studies.sign(id, qa, { meaning: "qa-approved" });
    expect(refused.status).toBe(409);
    expect(await errorOf(refused)).toMatch(/deviation is open/);
    await studies.patchDeviation(id, raisedId, site.people.technician, { rootCause: "Logger battery change; incubator ran throughout.", capaReference: "CAPA-26-114" });
    expect((await studies.patchDeviation(id, raisedId, site.people.engineer2, { close: true, reason: "Temperature chart shows no interruption." })).status).toBe(200);
    expect((await studies.sign(id, qa, { meaning: "qa-approved" })).status).toBe(201);

    const actions = (await events(id)).map((e) => e.action);
    for (const action of [
      "study.create",
      "study.sign.protocol-approved",
      "study-run.attach",
      "study-indicator.record",
      "study-indicator.correct",
      "study-deviation.open",
      "study-deviation.edit",
      "study-deviation.close",
      "study.sign.submitted-for-review",
      "study.sign.reviewed",
      "study.sign.qa-approved",
    ])
      expect(actions).toContain(action);
    // The audit trail reads them in words, with the study's number for its id.
    const { describeEvents } = await import("@/lib/services/audit-trail");
    const lines = await describeEvents({ siteId: site.siteId, timeZone: "UTC", events: await events(id) });
    const studyNumber = (await studies.detail(id, site.people.auditor)).studyNumber;
    expect(lines.map((l) => l.what)).toEqual(
      expect.arrayContaining([
        `approved study ${studyNumber} for quality assurance, archiving report ${studyNumber}-R`,
        expect.stringMatching(new RegExp(`^attached cycle .+ as run 1 of study ${studyNumber} \\(judged pending\\)$`)),
        `corrected a biological indicator at P3 of run 1 of study ${studyNumber}: no growth (negative)`,
        `closed a deviation of study ${studyNumber}`,
      ]),
    );
    expect(lines.find((l) => l.what.startsWith("approved study"))!.record).toEqual({ label: `study ${studyNumber}`, href: `/studies/${id}` });
    const correction = (await events(id)).find((e) => e.action === "study-indicator.correct")!;
    expect(correction.reason).toBe("Read against the wrong carrier; re-read.");
    expect(JSON.parse(correction.oldValue!).result).toBe("growth");
    const edit = (await events(id)).find((e) => e.action === "study-deviation.edit")!;
    expect(JSON.parse(edit.oldValue!)).toMatchObject({ impact: "", rootCause: "" });
  });

  it("failed (engineer, not the author, with a reason) closes a running study", async () => {
    const { id } = await running(1);
    expect((await studies.sign(id, site.people.engineer, { meaning: "failed", reason: "x" })).status).toBe(403);
    expect((await studies.sign(id, site.people.engineer2, { meaning: "failed" })).status).toBe(400);
    expect((await studies.sign(id, site.people.engineer2, { meaning: "failed", reason: "The load was changed mid-study." })).status).toBe(201);
    expect((await studies.detail(id, site.people.auditor)).status).toBe("failed");
    expect((await studies.attach(id, site.people.technician, { cycleId: await studies.signedCycle() })).status).toBe(409);
  });
});

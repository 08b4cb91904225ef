import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, eq } from "drizzle-orm";
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

/** A cycle registered by the technician and submitted for review. */
async function submitted(scenario: "pass" | "air", instrumentId: string | null = site.calibratedId) {
  const id = await flow.register(site.people.technician, { bytes: await loggerFile({ scenario }), instrumentId });
  expect((await flow.submit(id, site.people.technician)).status).toBe(200);
  return id;
}

const errorOf = async (res: Response) => (await res.json()).error as string;

describe("review outcomes with their GMP meaning", () => {
  it("refuses the legacy meaning rejected with 422 and says which words to use", async () => {
    const id = await submitted("air");
    const res = await flow.sign(id, site.people.engineer, { meaning: "rejected", reason: "Air in the chamber." });
    expect(res.status).toBe(422);
    expect(await errorOf(res)).toMatch(/use returned .* or failure-confirmed/);
    expect((await flow.detail(id)).status).toBe("submitted");
  });

  it("never approves a failing analysis, and never confirms the failure of a passing one", async () => {
    const failing = await submitted("air");
    const approve = await flow.sign(failing, site.people.engineer, { meaning: "approved" });
    expect(approve.status).toBe(409);
    expect(await errorOf(approve)).toMatch(/failed cannot be approved: confirm the failure .* or return it/);
    const passing = await submitted("pass");
    const confirm = await flow.sign(passing, site.people.engineer, { meaning: "failure-confirmed" });
    expect(confirm.status).toBe(409);
    expect(await errorOf(confirm)).toMatch(/passed, so there is no failure to confirm/);
    expect((await flow.detail(failing)).status).toBe("submitted");
    expect((await flow.detail(passing)).status).toBe("submitted");
  });

  it("whoever registered the failing cycle cannot confirm its failure (403); a technician cannot sign at all", async () => {
    const id = await flow.register(site.people.engineer, { bytes: await loggerFile({ scenario: "air" }) });
    await flow.submit(id, site.people.engineer);
    const own = await flow.sign(id, site.people.engineer, { meaning: "failure-confirmed" });
    expect(own.status).toBe(403);
    expect(await errorOf(own)).toMatch(/^Segregation of duties: you registered this cycle/);
    expect((await flow.sign(id, site.people.technician, { meaning: "failure-confirmed" })).status).toBe(403);
    // Returning is not a decision on the outcome: the one who registered it may still send it back.
    expect((await flow.sign(id, site.people.engineer, { meaning: "returned", reason: "Wrong sterilizer chosen." })).status).toBe(201);
  });

  it("a confirmed failure closes the record as a signed failure: locked, its report archived marked FAIL, the submitter mailed", async () => {
    const id = await submitted("air");
    const res = await flow.sign(id, site.people.engineer, { meaning: "failure-confirmed", reason: "Air in the chamber: door seal to be replaced before the retest." });
    expect(res.status).toBe(201);
    expect(await res.json()).toMatchObject({ meaning: "failure-confirmed", status: "failure-confirmed" });
    const d = await flow.detail(id);
    expect(d).toMatchObject({ status: "failure-confirmed", verdict: "fail" });
    expect(d.report.reportNumber).toMatch(/^PR-/);

    expect((await flow.correct(id, site.people.technician, { mapping: { temperatureUnit: "C" }, reason: "Try another reading." })).status).toBe(409);
    expect((await flow.submit(id, site.people.technician)).status).toBe(409);
    expect((await flow.sign(id, site.people.engineer2, { meaning: "approved" })).status).toBe(409);

    const { archived, text } = await flow.reportText(id, ctx.dir);
    expect(archived).toBe(true);
    expect(text).toContain("FAIL · FAILURE CONFIRMED");
    expect(text).toMatch(/Failure confirmed by Review engineer \(engineer\) on \d{1,2} \w{3} 2026/);
    expect(text).not.toContain("DRAFT");

    const { mailOutbox, auditEvents } = await import("@/db/schema");
    const mails = await ctx.db.select().from(mailOutbox).where(eq(mailOutbox.relatedCycleId, id));
    expect(mails.find((m) => /failure confirmed/.test(m.subject))?.to).toEqual(["technician@review.example"]);
    const [event] = await ctx.db
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.entityId, id), eq(auditEvents.action, "cycle.sign.failure-confirmed")));
    expect(JSON.parse(event.newValue!)).toMatchObject({ status: "failure-confirmed", report: d.report.id });
    expect(event.reason).toMatch(/door seal/);
  });

  it("returned needs a reason, goes back to the technician, who may correct it and submit it again", async () => {
    const id = await submitted("air");
    const bare = await flow.sign(id, site.people.engineer, { meaning: "returned", reason: "  " });
    expect(bare.status).toBe(400);
    expect(await errorOf(bare)).toMatch(/reason/);
    expect((await flow.sign(id, site.people.engineer, { meaning: "returned", reason: "The file is from the wrong sterilizer." })).status).toBe(201);
    const d = await flow.detail(id);
    expect(d.status).toBe("returned");
    expect(d.signatures.at(-1)).toMatchObject({ meaning: "returned", reason: "The file is from the wrong sterilizer." });
    expect((await flow.submit(id, site.people.technician)).status).toBe(200);
  });

  it("lists the new statuses through the API filter", async () => {
    const { GET } = await import("@/app/api/cycles/route");
    flow.as(site.people.auditor);
    const confirmed = await (await GET(new Request("http://papin.test/api/cycles?status=failure-confirmed"), undefined)).json();
    expect(confirmed.items.length).toBeGreaterThan(0);
    expect(confirmed.items.every((c: { status: string; verdict: string }) => c.status === "failure-confirmed" && c.verdict === "fail")).toBe(true);
    expect((await GET(new Request("http://papin.test/api/cycles?status=rejected"), undefined)).status).toBe(400);
  });
});

describe("instruments are evidence only while calibrated", () => {
  it("refuses approval of a thermometric test that names no instrument, in a plain sentence", async () => {
    const id = await submitted("pass", null);
    const res = await flow.sign(id, site.people.engineer, { meaning: "approved" });
    expect(res.status).toBe(409);
    expect(await errorOf(res)).toMatch(/evidence only with the instrument that measured it, and this cycle names none/);
  });

  it("refuses approval when the calibration had lapsed on the cycle's date, naming the certificate and its due date", async () => {
    const id = await submitted("pass", site.lapsedId);
    const res = await flow.sign(id, site.people.engineer, { meaning: "approved" });
    expect(res.status).toBe(409);
    // Certificate CAL-25-0777 was due on 18 Nov 2026; the cycle ran on 25 Nov 2026 (7 days later).
    expect(await errorOf(res)).toBe(
      "The calibration of Logger unit B (serial TL12-B) had lapsed on the cycle's date (2026-11-25): certificate CAL-25-0777 was due on 2026-11-18. A test measured with it is not evidence, so it cannot be approved.",
    );
    const d = await flow.detail(id);
    expect(d.instrument.calibration).toMatchObject({ certificateNumber: "CAL-25-0777", dueOn: "2026-11-18", testDate: "2026-11-25", lapsed: true });
  });

  it("a returned cycle corrected to name a calibrated instrument (with its reason) can then be approved", async () => {
    const id = await submitted("pass", site.lapsedId);
    await flow.sign(id, site.people.engineer, { meaning: "returned", reason: "Logger B's calibration had lapsed; name the logger actually used." });
    const corrected = await flow.correct(id, site.people.technician, { instrumentId: site.calibratedId, reason: "Logger A was used; B was named by mistake." });
    expect(corrected.status).toBe(201);
    const d = await flow.detail(id);
    expect(d.instrument).toMatchObject({ id: site.calibratedId, calibration: { certificateNumber: "CAL-26-0001", lapsed: false } });
    expect(d.analysisHistory[0].reason).toBe("Logger A was used; B was named by mistake.");
    await flow.submit(id, site.people.technician);
    expect((await flow.sign(id, site.people.engineer, { meaning: "approved" })).status).toBe(201);
  });
});

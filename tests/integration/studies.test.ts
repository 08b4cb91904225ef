import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, eq } from "drizzle-orm";
import { useTemporaryDatabase } from "../support/test-db";
import { loadReviewSite, reviewFlow, type ReviewSite } from "../support/review-flow";
import { PACK_PATTERN, studyFlow } from "../support/study-flow";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
let site: ReviewSite;
let studies: ReturnType<typeof studyFlow>;

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  site = await loadReviewSite(ctx.db);
  studies = studyFlow(session, site, reviewFlow(session, site));
}, 120_000);
afterAll(() => ctx.cleanup());

const errorOf = async (res: Response) => (await res.json()).error as string;

async function events(studyId: string) {
  const { auditEvents } = await import("@/db/schema");
  return ctx.db
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.entityType, "study"), eq(auditEvents.entityId, studyId)));
}

/**
 * A study whose protocol another engineer approved, without indicators unless asked. The spread is the highest maximum
 * minus the lowest minimum over the whole hold (an upper bound), which for the simulator's probes comes to about 2 K:
 * the protocol allows 3 K.
 */
async function approvedProtocol(body: Record<string, unknown> = {}) {
  const id = await studies.createId(site.people.engineer, { runsRequired: 2, indicatorsRequired: false, maxSpreadK: 3, ...body });
  const res = await studies.sign(id, site.people.engineer2, { meaning: "protocol-approved" });
  if (res.status !== 201) throw new Error(await res.text());
  return id;
}

describe("planning a study through the API", () => {
  it("POST /api/studies answers 201 { id }; the study is a draft with its number, the profile's criteria and the pattern; the ledger has both", async () => {
    const res = await studies.create(site.people.engineer, { runsRequired: 3 });
    expect(res.status).toBe(201);
    const { id, studyNumber } = await res.json();
    expect(typeof id).toBe("string");
    // QS-<year>-<nnn>: the site's first study of the year (the site calendar is UTC in this test site).
    expect(studyNumber).toBe(`QS-${new Date().toISOString().slice(0, 4)}-001`);
    const d = await studies.detail(id, site.people.auditor);
    expect(d).toMatchObject({ status: "draft", kind: "heat-penetration", requalificationMonths: 12, author: { id: site.people.engineer, name: "Review engineer" } });
    expect(d.loadingPattern.positions.map((p: { id: string }) => p.id)).toEqual(["P1", "P2", "P3"]);
    // Default minimum F0: 180 s at 134 °C, Tref 121.1 °C, z 10 K → 3 × 10^1.29 = 58.49 min (worked by hand, DOMAIN.md §3).
    expect(d.criteria.minF0Min).toBeCloseTo(58.49, 1);
    expect(d.criteria).toMatchObject({ minF0Source: "profile", maxSpreadK: 2, maxSpreadSource: "profile", runsRequired: 3, indicatorsRequired: true });
    expect(d.allowed).toMatchObject({ attach: false, record: false, sign: [] });
    const actions = (await events(id)).map((e) => e.action);
    expect(actions).toContain("study.create");
    const { auditEvents } = await import("@/db/schema");
    const [patternEvent] = await ctx.db
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.action, "loading-pattern.create"), eq(auditEvents.entityId, d.loadingPattern.id)));
    expect(JSON.parse(patternEvent.newValue!).name).toBe(PACK_PATTERN.name);
  });

  it("refuses bad input with a sentence naming the field; technicians and auditors cannot plan; an administrator sees nothing", async () => {
    const twice = await studies.create(site.people.engineer, { loadingPattern: { ...PACK_PATTERN, positions: [PACK_PATTERN.positions[0], PACK_PATTERN.positions[0]] } });
    expect(twice.status).toBe(400);
    expect(await errorOf(twice)).toMatch(/same id/);
    const noPositions = await studies.create(site.people.engineer, { loadingPattern: { ...PACK_PATTERN, positions: [] } });
    expect(noPositions.status).toBe(400);
    expect((await studies.create(site.people.engineer, { sterilizerId: "nope" })).status).toBe(404);
    for (const who of [site.people.technician, site.people.auditor, site.people.admin]) expect((await studies.create(who, {})).status).toBe(403);
    const id = await studies.createId(site.people.engineer);
    expect((await studies.get(id, site.people.admin)).status).toBe(403);
  });

  it("a draft is edited old → new in the ledger, and frozen once the protocol is approved", async () => {
    const id = await studies.createId(site.people.engineer);
    const { PATCH } = await import("@/app/api/studies/[id]/route");
    const patch = (body: unknown) => PATCH(new Request("http://papin.test", { method: "PATCH", body: JSON.stringify(body) }), { params: Promise.resolve({ id }) });
    session.current = { user: { id: site.people.engineer } };
    expect((await patch({ changes: { minF0Min: 60, protocol: "Three runs, BIs at P1–P3." }, reason: "Protocol written" })).status).toBe(200);
    const edit = (await events(id)).find((e) => e.action === "study.edit")!;
    expect(JSON.parse(edit.oldValue!)).toEqual({ minF0Min: null, protocol: "" });
    expect(JSON.parse(edit.newValue!)).toEqual({ minF0Min: 60, protocol: "Three runs, BIs at P1–P3." });
    expect((await studies.detail(id, site.people.engineer)).criteria).toMatchObject({ minF0Min: 60, minF0Source: "study" });
    expect((await studies.sign(id, site.people.engineer2, { meaning: "protocol-approved" })).status).toBe(201);
    session.current = { user: { id: site.people.engineer } };
    const late = await patch({ changes: { minF0Min: 10 } });
    expect(late.status).toBe(409);
    expect(await errorOf(late)).toMatch(/frozen/);
  });
});

describe("attaching runs", () => {
  it("refuses a draft study, an unsigned cycle, another sterilizer's or profile's cycle, the same cycle twice, and a map missing a position (409 naming it)", async () => {
    const draft = await studies.createId(site.people.engineer, { indicatorsRequired: false });
    const signed = await studies.signedCycle();
    const early = await studies.attach(draft, site.people.technician, { cycleId: signed });
    expect(early.status).toBe(409);
    expect(await errorOf(early)).toMatch(/protocol must be approved/);

    const id = await approvedProtocol();
    const { register, submit } = reviewFlow(session, site);
    const { loggerFile } = await import("../support/review-flow");
    const unsigned = await register(site.people.technician, { bytes: await loggerFile() });
    await submit(unsigned, site.people.technician);
    const refusedUnsigned = await studies.attach(id, site.people.technician, { cycleId: unsigned });
    expect(refusedUnsigned.status).toBe(409);
    expect(await errorOf(refusedUnsigned)).toMatch(/is not signed yet/);

    const otherProfile = await register(site.people.technician, { bytes: await loggerFile(), extra: { profileId: site.otherProfileId } });
    await submit(otherProfile, site.people.technician);
    expect((await reviewFlow(session, site).sign(otherProfile, site.people.engineer, { meaning: "approved" })).status).toBe(201);
    const refusedProfile = await studies.attach(id, site.people.technician, { cycleId: otherProfile });
    expect(refusedProfile.status).toBe(409);
    expect(await errorOf(refusedProfile)).toMatch(/another profile/);

    const { sterilizers } = await import("@/db/schema");
    const [second] = await ctx.db.insert(sterilizers).values({ siteId: site.siteId, name: "Porous load 2", serialNumber: "RV-PL-02", chamberVolumeL: 445 }).returning();
    const elsewhere = await register(site.people.technician, { bytes: await loggerFile(), extra: { sterilizerId: second.id } });
    await submit(elsewhere, site.people.technician);
    expect((await reviewFlow(session, site).sign(elsewhere, site.people.engineer, { meaning: "approved" })).status).toBe(201);
    const refusedSterilizer = await studies.attach(id, site.people.technician, { cycleId: elsewhere });
    expect(refusedSterilizer.status).toBe(409);
    expect(await errorOf(refusedSterilizer)).toMatch(/ran on another sterilizer/);

    const badMap = await studies.attach(id, site.people.technician, { cycleId: signed, sensorMap: { "Pack 1 (°C)": "P1", "Pack 5 (°C)": "P2" } });
    expect(badMap.status).toBe(409);
    expect(await errorOf(badMap)).toMatch(/No channel of this cycle is mapped to position P3/);
    const strayHeader = await studies.attach(id, site.people.technician, { cycleId: signed, sensorMap: { "Pack 9 (°C)": "P1" } });
    expect(strayHeader.status).toBe(409);
    expect(await errorOf(strayHeader)).toMatch(/"Pack 9 \(°C\)", which is not a temperature channel/);

    // Without a map: the proposal from the recorded placements (pack-top, pack-bottom, pack-side → P1, P2, P3).
    const ok = await studies.attach(id, site.people.technician, { cycleId: signed });
    expect(ok.status).toBe(201);
    expect(await ok.json()).toMatchObject({ runNumber: 1, judgement: "pass" });
    const d = await studies.detail(id, site.people.auditor);
    expect(d.status).toBe("running");
    expect(d.runs[0].sensorMap).toEqual({ "Pack 1 (°C)": "P1", "Pack 5 (°C)": "P2", "Pack 6 (°C)": "P3" });
    const twice = await studies.attach(id, site.people.technician, { cycleId: signed });
    expect(twice.status).toBe(409);
    expect(await errorOf(twice)).toMatch(/already run 1/);
    expect((await studies.attach(id, site.people.auditor, { cycleId: signed })).status).toBe(403);
  });

  it("a pattern position no placement names is not guessed: 409 names it until the person attaching maps it", async () => {
    const id = await approvedProtocol({ loadingPattern: { ...PACK_PATTERN, positions: [...PACK_PATTERN.positions, { id: "P4", label: "Door side", sensorPosition: "door" }] } });
    const cycleId = await studies.signedCycle();
    const res = await studies.attach(id, site.people.technician, { cycleId });
    expect(res.status).toBe(409);
    expect(await errorOf(res)).toMatch(/position P4;/);
    const sensorMap = { "Pack 1 (°C)": "P1", "Pack 5 (°C)": "P2", "Pack 6 (°C)": "P3", "Pack 3 (°C)": "P4" };
    expect((await studies.attach(id, site.people.technician, { cycleId, sensorMap })).status).toBe(201);
  });

  it("a failed run breaks the consecutive series and opens a deviation in the same step; the series completes with the runs after it", async () => {
    const id = await approvedProtocol();
    expect((await (await studies.attach(id, site.people.technician, { cycleId: await studies.signedCycle() })).json()).judgement).toBe("pass");
    const failed = await studies.attach(id, site.people.technician, { cycleId: await studies.signedCycle("air") });
    const run2 = await failed.json();
    expect(run2).toMatchObject({ runNumber: 2, judgement: "fail" });
    let d = await studies.detail(id, site.people.auditor);
    expect(d.summary.consecutive).toEqual({ passing: 0, required: 2, complete: false });
    expect(d.deviations).toHaveLength(1);
    expect(d.deviations[0]).toMatchObject({ source: "failed-run", status: "open", runId: run2.runId });
    expect(d.deviations[0].what).toMatch(/^Run 2 \(cycle .+\) failed: /);
    const ledger = await events(id);
    expect(ledger.filter((e) => e.action === "study-run.attach")).toHaveLength(2);
    expect(ledger.filter((e) => e.action === "study-deviation.open")).toHaveLength(1);

    await studies.attach(id, site.people.technician, { cycleId: await studies.signedCycle() });
    d = await studies.detail(id, site.people.auditor);
    expect(d.summary.consecutive).toEqual({ passing: 1, required: 2, complete: false });
    await studies.attach(id, site.people.technician, { cycleId: await studies.signedCycle() });
    d = await studies.detail(id, site.people.auditor);
    expect(d.summary.consecutive).toEqual({ passing: 2, required: 2, complete: true });
    // The author cannot submit while the failed run's deviation is open.
    const submit = await studies.sign(id, site.people.engineer, { meaning: "submitted-for-review" });
    expect(submit.status).toBe(409);
    expect(await errorOf(submit)).toMatch(/deviation is open/);
  });

  it("GET /api/studies/{id} has runs, summary.positions[] (position, minF0, minTemp, maxTemp) and summary.coldSpot (position, minF0)", async () => {
    const id = await approvedProtocol();
    await studies.attach(id, site.people.technician, { cycleId: await studies.signedCycle() });
    await studies.attach(id, site.people.technician, { cycleId: await studies.signedCycle() });
    const d = await studies.detail(id, site.people.technician);
    expect(d.runs.map((r: { runNumber: number }) => r.runNumber)).toEqual([1, 2]);
    expect(d.summary.positions.map((p: { position: string }) => p.position)).toEqual(["P1", "P2", "P3"]);
    for (const p of d.summary.positions) {
      expect(p.minF0).toBeGreaterThan(d.criteria.minF0Min);
      // The simulator holds 134.6 °C nominal for 210 s (tests/support/review-flow.ts): the hold stays near it.
      expect(p.minTemp).toBeGreaterThan(133);
      expect(p.maxTemp).toBeLessThan(137);
      expect(p.maxTemp).toBeGreaterThanOrEqual(p.minTemp);
    }
    const lowest = Math.min(...d.summary.positions.map((p: { minF0: number }) => p.minF0));
    expect(d.summary.coldSpot).toMatchObject({ minF0: lowest });
    expect(d.summary.positions.find((p: { position: string }) => p.position === d.summary.coldSpot.position).minF0).toBe(lowest);
    const spare = await studies.signedCycle();
    const runsRoute = await import("@/app/api/studies/[id]/runs/route");
    session.current = { user: { id: site.people.technician } };
    const runs = await (await runsRoute.GET(new Request("http://papin.test"), { params: Promise.resolve({ id }) })).json();
    expect(runs.runs).toHaveLength(2);
    expect(runs.judgements.map((r: { judgement: string }) => r.judgement)).toEqual(["pass", "pass"]);
    const attachable = runs.attachable.map((c: { id: string }) => c.id);
    expect(attachable).toContain(spare);
    for (const run of d.runs) expect(attachable).not.toContain(run.cycleId);
    const { GET } = await import("@/app/api/studies/route");
    session.current = { user: { id: site.people.auditor } };
    const list = await (await GET(new Request("http://papin.test/api/studies?status=running"), undefined)).json();
    expect(list.rows.some((r: { id: string; runsAttached: number }) => r.id === id && r.runsAttached === 2)).toBe(true);
  });
});

describe("site isolation", () => {
  it("another site's engineer gets 404 for the study and cannot attach to it, sign it or list it", async () => {
    const id = await approvedProtocol();
    const { sites, users } = await import("@/db/schema");
    const [other] = await ctx.db.insert(sites).values({ name: "Other hospital", code: "OTHER-S2" }).returning();
    const [stranger] = await ctx.db.insert(users).values({ email: "eng@other-s2.example", name: "Other engineer", role: "engineer", passwordHash: "x", siteId: other.id }).returning();
    expect((await studies.get(id, stranger.id)).status).toBe(404);
    expect((await studies.attach(id, stranger.id, { cycleId: "whatever" })).status).toBe(404);
    expect((await studies.sign(id, stranger.id, { meaning: "failed", reason: "x" })).status).toBe(404);
    expect((await studies.raise(id, stranger.id, { what: "x" })).status).toBe(404);
    const { GET } = await import("@/app/api/studies/route");
    session.current = { user: { id: stranger.id } };
    expect((await (await GET(new Request("http://papin.test/api/studies"), undefined)).json()).total).toBe(0);
  });
});

describe("study numbers", () => {
  it("a number another process took first is recognised from the database's own refusal, so the plan is tried again with the next", async () => {
    const { studies: table } = await import("@/db/schema");
    const { isStudyNumberTaken } = await import("@/db/queries/studies");
    const id = await studies.createId(site.people.engineer, { runsRequired: 3 });
    const [taken] = await ctx.db.select().from(table).where(eq(table.id, id));
    const refusal = await ctx.db
      .insert(table)
      .values({ ...taken, id: crypto.randomUUID() })
      .then(() => null)
      .catch((error: unknown) => error);
    expect(refusal).not.toBeNull();
    expect(isStudyNumberTaken(refusal)).toBe(true);
    expect(isStudyNumberTaken(new Error("UNIQUE constraint failed: studies.id"))).toBe(false);
  });

  it("studies planned at the same moment (requests in one process) get distinct, consecutive numbers", async () => {
    const answers = await Promise.all([1, 2, 3, 4].map(() => studies.create(site.people.engineer, { runsRequired: 3 })));
    expect(answers.map((r) => r.status)).toEqual([201, 201, 201, 201]);
    const numbers = (await Promise.all(answers.map((r) => r.json()))).map((b) => b.studyNumber as string);
    expect(new Set(numbers).size).toBe(4);
    const suffixes = numbers.map((n) => Number(n.slice(-3))).sort((a, b) => a - b);
    expect(suffixes[3] - suffixes[0]).toBe(3);
  });
});

import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { useTemporaryDatabase } from "../support/test-db";
import { loadReviewSite, loggerFile, reviewFlow, REVIEW_PASSWORD, type ReviewSite } from "../support/review-flow";
import type { Actor } from "@/lib/domain";
import type { FormState } from "@/lib/form-state";

/*
 * The study page's evidence forms (issue 14 §4, §5) through their server actions, on a running study of one signed
 * cycle: indicator readings and their corrections, a positive indicator opening a deviation, deviations raised,
 * investigated and closed, each refusal a sentence naming the field, nothing saved from a refused form.
 */

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined, revalidateTag: () => undefined }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
let site: ReviewSite;
let studyId = "";
let runId = "";
const actors: Record<string, Actor> = {};

type Action = (state: FormState, form: FormData) => Promise<FormState>;
const form = (fields: Record<string, string>) => {
  const data = new FormData();
  for (const [k, v] of Object.entries(fields)) data.set(k, v);
  return data;
};
async function run(action: Action, who: keyof ReviewSite["people"], fields: Record<string, string>) {
  session.current = { user: { id: site.people[who] } };
  return action({ status: "idle" }, form(fields));
}
async function detail() {
  const { getStudyDetail } = await import("@/lib/services/studies");
  return getStudyDetail({ actor: actors.auditor, id: studyId });
}
const actions = () => import("@/app/(portal)/studies/[id]/evidence-actions");

const biReading = () => ({
  studyId,
  runId,
  positionId: "P1",
  kind: "biological",
  result: "no-growth",
  organism: "Geobacillus stearothermophilus",
  lot: "BI-2231",
  population: "1.5 × 10^6",
  incubation: "55–60 °C, 7 days",
  readBy: "K. Mensah",
  readAt: "2026-11-26T09:00:00.000Z",
});

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  site = await loadReviewSite(ctx.db);
  const { users } = await import("@/db/schema");
  for (const u of await ctx.db.select().from(users)) actors[Object.entries(site.people).find(([, id]) => id === u.id)?.[0] ?? u.id] = u as unknown as Actor;
  // One passing cycle, signed by an engineer who did not register it: the only kind of run a study takes.
  const flow = reviewFlow(session, site);
  const bytes = await loggerFile();
  const cycleId = await flow.register(site.people.technician, { bytes });
  expect((await flow.submit(cycleId, site.people.technician)).status).toBe(200);
  expect((await flow.sign(cycleId, site.people.engineer, { meaning: "approved" })).status).toBe(201);
  const { inspectLoggerFile } = await import("@/lib/logger-files");
  const probes = inspectLoggerFile(bytes)
    .columns.filter((c) => c.role === "temperature" && !/^drain/i.test(c.header))
    .map((c) => c.header);
  const positions = probes.map((_, i) => ({ id: `P${i + 1}`, label: `Pack position ${i + 1}` }));
  const { createStudy, signStudy, attachRun } = await import("@/lib/services/studies");
  studyId = (
    await createStudy({
      actor: actors.engineer,
      input: { sterilizerId: site.sterilizerId, profileId: site.profileId, kind: "heat-penetration", runsRequired: 1, loadingPattern: { name: "Two wrapped sets", items: [], positions } },
    })
  ).id;
  await signStudy({ actor: actors.engineer2, id: studyId, password: REVIEW_PASSWORD, meaning: "protocol-approved" });
  runId = (await attachRun({ actor: actors.technician, id: studyId, cycleId, sensorMap: Object.fromEntries(probes.map((h, i) => [h, `P${i + 1}`])) })).runId;
}, 180_000);
afterAll(() => ctx.cleanup());

describe("indicator readings from the study page", () => {
  it("records a technician's biological reading with its population as a number, and it counts", async () => {
    const { recordIndicatorAction } = await actions();
    const state = await run(recordIndicatorAction, "technician", biReading());
    expect(state).toMatchObject({ status: "ok", message: "Biological indicator at P1: No growth (negative) recorded." });
    const [reading] = (await detail()).indicators;
    expect(reading).toMatchObject({ runId, positionId: "P1", result: "no-growth", population: 1.5e6, lot: "BI-2231", current: true, recordedBy: { name: "Review technician" } });
  });

  it("refuses a second reading of the same run, position and kind without a reason, and keeps both once a reason is given", async () => {
    const { recordIndicatorAction } = await actions();
    const refused = await run(recordIndicatorAction, "technician", { ...biReading(), lot: "BI-2232" });
    expect(refused.status).toBe("error");
    expect(refused.fieldErrors?.reason).toMatch(/already recorded; give the reason for the correction/);
    expect((await detail()).indicators).toHaveLength(1);

    const corrected = await run(recordIndicatorAction, "technician", { ...biReading(), lot: "BI-2232", reason: "Lot number misread from the label." });
    expect(corrected.status).toBe("ok");
    const readings = (await detail()).indicators.filter((i) => i.positionId === "P1");
    expect(readings.map((r) => [r.lot, r.current, r.reason])).toEqual(
      expect.arrayContaining([
        ["BI-2231", false, null],
        ["BI-2232", true, "Lot number misread from the label."],
      ]),
    );
  });

  it("names the missing field of a biological reading and saves nothing", async () => {
    const { recordIndicatorAction } = await actions();
    const state = await run(recordIndicatorAction, "engineer", { ...biReading(), positionId: "P2", population: "" });
    expect(state.status).toBe("error");
    expect(state.fieldErrors?.population).toMatch(/population per carrier/);
    expect((await detail()).indicators.filter((i) => i.positionId === "P2")).toEqual([]);
  });

  it("opens a deviation when a chemical indicator reads positive, and says so", async () => {
    const { recordIndicatorAction } = await actions();
    const state = await run(recordIndicatorAction, "technician", { ...biReading(), positionId: "P2", kind: "chemical", result: "fail", lot: "CI-77" });
    expect(state.message).toBe("Chemical indicator at P2: Not changed as specified recorded. A positive indicator fails the run and opens a deviation.");
    const opened = (await detail()).deviations.filter((d) => d.source === "positive-indicator");
    expect(opened).toHaveLength(1);
    expect(opened[0]).toMatchObject({ status: "open", runId, openedBy: { name: "Review technician" } });
  });

  it("lets an auditor record nothing", async () => {
    const { recordIndicatorAction } = await actions();
    const state = await run(recordIndicatorAction, "auditor", { ...biReading(), positionId: "P2" });
    expect(state).toMatchObject({ status: "error", message: expect.stringMatching(/does not allow/) });
  });
});

describe("deviations from the study page", () => {
  it("raises one by hand for the study as a whole, investigates it, and closes it only when impact and root cause are written", async () => {
    const { raiseDeviationAction, updateDeviationAction, closeDeviationAction } = await actions();
    expect((await run(raiseDeviationAction, "technician", { studyId, runId: "", what: "Probe P2's lead was pinched in the door seal." })).status).toBe("ok");
    const raised = (await detail()).deviations.find((d) => d.source === "raised")!;
    expect(raised).toMatchObject({ runId: null, status: "open", impact: "", what: "Probe P2's lead was pinched in the door seal." });

    const early = await run(closeDeviationAction, "engineer", { studyId, deviationId: raised.id, reason: "Nothing to see." });
    expect(early).toMatchObject({ status: "error", message: "Write the impact assessment and the root cause before closing the deviation." });

    const update = await run(updateDeviationAction, "technician", {
      studyId,
      deviationId: raised.id,
      impact: "P2's readings in run 1 may be low.",
      rootCause: "Lead routed across the seal.",
      capaReference: "CAPA-2026-014",
    });
    expect(update.status).toBe("ok");

    const byTechnician = await run(closeDeviationAction, "technician", { studyId, deviationId: raised.id, reason: "Lead rerouted." });
    expect(byTechnician.message).toMatch(/does not allow/);
    const withoutReason = await run(closeDeviationAction, "engineer", { studyId, deviationId: raised.id, reason: " " });
    expect(withoutReason.fieldErrors?.reason).toBe("Enter why the deviation is closed.");

    expect((await run(closeDeviationAction, "engineer", { studyId, deviationId: raised.id, reason: "Lead rerouted; the run is repeated." })).status).toBe("ok");
    const closed = (await detail()).deviations.find((d) => d.id === raised.id)!;
    expect(closed).toMatchObject({ status: "closed", closeReason: "Lead rerouted; the run is repeated.", closedBy: { name: "Review engineer" }, capaReference: "CAPA-2026-014" });

    const after = await run(updateDeviationAction, "engineer", { studyId, deviationId: raised.id, impact: "Changed later." });
    expect(after.status).toBe("error");
    expect((await detail()).deviations.find((d) => d.id === raised.id)!.impact).toBe("P2's readings in run 1 may be low.");
  });

  it("keeps another site's study out of reach", async () => {
    const { sites, users } = await import("@/db/schema");
    const [other] = await ctx.db.insert(sites).values({ name: "Other hospital", code: "OTHER" }).returning();
    const [stranger] = await ctx.db.insert(users).values({ email: "eng@other.example", name: "Other engineer", role: "engineer", passwordHash: "not used", siteId: other.id }).returning();
    const { raiseDeviationAction } = await actions();
    session.current = { user: { id: stranger.id } };
    const state = await raiseDeviationAction({ status: "idle" }, form({ studyId, what: "Not mine to raise." }));
    expect(state.status).toBe("error");
    expect((await detail()).deviations.some((d) => d.what === "Not mine to raise.")).toBe(false);
  });
});

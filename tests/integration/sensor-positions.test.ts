import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, eq } from "drizzle-orm";
import { useTemporaryDatabase } from "../support/test-db";
import { loadReviewSite, loggerFile, placementsOf, reviewFlow, type ReviewSite } from "../support/review-flow";

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

const errorOf = async (res: Response) => (await res.json()).error as string;

async function ledger(cycleId: string, action: string) {
  const { auditEvents } = await import("@/db/schema");
  return ctx.db
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.entityId, cycleId), eq(auditEvents.action, action)));
}

// The simulator's file: "Drain (°C)" and "Pack 1 (°C)" … "Pack 6 (°C)" (lib/simulator/cycle.ts).
const DRAIN = "Drain (°C)";

describe("sensor positions and the test pack", () => {
  it("an upload with positions, test pack and lot round-trips through the API, and a saved instrument mapping keeps the positions", async () => {
    const bytes = await loggerFile();
    const positions = { ...(await placementsOf(bytes)), "Pack 3 (°C)": { position: "pack-centre", note: "sheet 19 of 38" } };
    const id = await flow.register(site.people.technician, {
      bytes,
      extra: { mapping: JSON.stringify({ positions }), saveMapping: "true", loadType: "standard-test-pack", loadLot: "STP-2611-04" },
    });
    const d = await flow.detail(id);
    expect(d.loadType).toBe("standard-test-pack");
    expect(d.loadLot).toBe("STP-2611-04");
    expect(d.positions).toHaveLength(7);
    expect(d.positions.find((p: { header: string }) => p.header === DRAIN)).toEqual({ header: DRAIN, position: "reference-drain", note: "In the chamber drain, upstream of the drain valve" });
    expect(d.positions.find((p: { header: string }) => p.header === "Pack 3 (°C)")).toEqual({ header: "Pack 3 (°C)", position: "pack-centre", note: "sheet 19 of 38" });
    expect(d.positionProblem).toBeNull();

    const { instruments } = await import("@/db/schema");
    const [instrument] = await ctx.db.select().from(instruments).where(eq(instruments.id, site.calibratedId));
    expect((instrument.savedMapping as { positions: Record<string, unknown> }).positions["Pack 3 (°C)"]).toEqual({ position: "pack-centre", note: "sheet 19 of 38" });
    // The instrument's next file, sent without a mapping, is read with the saved one: its positions come along.
    const next = await flow.register(site.people.technician, { bytes: await loggerFile(), extra: { mapping: "" } });
    expect((await flow.detail(next)).positions.find((p: { header: string }) => p.header === "Pack 3 (°C)").note).toBe("sheet 19 of 38");
  });

  it("refuses a position for a column that is not a temperature channel, and an unknown position id, saying which", async () => {
    const bytes = await loggerFile();
    const stray = await flow.upload(site.people.technician, { bytes, extra: { mapping: JSON.stringify({ positions: { "Chamber (kPa abs)": { position: "door" } } }) } });
    expect(stray.status).toBe(422);
    expect(await errorOf(stray)).toMatch(/"Chamber \(kPa abs\)", which is not a temperature channel/);
    const unknown = await flow.upload(site.people.technician, { bytes, extra: { mapping: JSON.stringify({ positions: { [DRAIN]: { position: "under-the-sink" } } }) } });
    expect(unknown.status).toBe(400);
    expect(await errorOf(unknown)).toMatch(/position must be one of reference-drain/);
  });

  it("a thermometric cycle without positions is saved and submitted, but approval is refused naming the channels; a correction with a reason places them, the ledger keeps old and new, and it is approved", async () => {
    const bytes = await loggerFile();
    const id = await flow.register(site.people.technician, { bytes, extra: { mapping: JSON.stringify({ positions: { [DRAIN]: { position: "reference-drain" } } }) } });
    expect((await flow.submit(id, site.people.technician)).status).toBe(200);
    const refused = await flow.sign(id, site.people.engineer, { meaning: "approved" });
    expect(refused.status).toBe(409);
    const sentence = await errorOf(refused);
    expect(sentence).toContain('The positions of temperature channels "Pack 1 (°C)", "Pack 2 (°C)", "Pack 3 (°C)", "Pack 4 (°C)", "Pack 5 (°C)" and "Pack 6 (°C)" are not recorded.');
    expect(sentence).not.toContain(DRAIN);
    expect((await flow.detail(id)).status).toBe("submitted");

    expect((await flow.sign(id, site.people.engineer, { meaning: "returned", reason: "Record where each pack probe sat." })).status).toBe(201);
    const noReason = await flow.correct(id, site.people.technician, { positions: await placementsOf(bytes) });
    expect(noReason.status).toBe(422);
    const placed = await flow.correct(id, site.people.technician, {
      positions: await placementsOf(bytes),
      loadType: "standard-test-pack",
      loadLot: "STP-2611-09",
      reason: "Probe positions from the test sheet.",
    });
    expect(placed.status).toBe(201);
    const [event] = (await ledger(id, "cycle.reanalyse")).slice(-1);
    const oldValue = JSON.parse(event.oldValue!);
    const newValue = JSON.parse(event.newValue!);
    expect(event.reason).toBe("Probe positions from the test sheet.");
    expect(oldValue.positions).toEqual({ [DRAIN]: { position: "reference-drain" } });
    expect(newValue.positions["Pack 1 (°C)"]).toEqual({ position: "pack-top", note: "Vertical axis, about 20 mm below the top sheet" });
    expect(oldValue.loadType).toBeNull();
    expect(newValue).toMatchObject({ loadType: "standard-test-pack", loadLot: "STP-2611-09" });

    expect((await flow.submit(id, site.people.technician)).status).toBe(200);
    expect((await flow.sign(id, site.people.engineer, { meaning: "approved" })).status).toBe(201);
    // Signed records stay locked: positions cannot be changed afterwards.
    const late = await flow.correct(id, site.people.technician, { positions: { [DRAIN]: { position: "door" } }, reason: "late" });
    expect(late.status).toBe(409);
  });

  it("the reference channel must sit at the drain", async () => {
    const bytes = await loggerFile();
    const positions = { ...(await placementsOf(bytes)), [DRAIN]: { position: "chamber-wall" } };
    const id = await flow.register(site.people.technician, { bytes, extra: { mapping: JSON.stringify({ positions }) } });
    await flow.submit(id, site.people.technician);
    const refused = await flow.sign(id, site.people.engineer, { meaning: "approved" });
    expect(refused.status).toBe(409);
    expect(await errorOf(refused)).toMatch(/The reference channel "Drain \(°C\)" is not placed at the reference point \(chamber drain\)\./);
  });

  it("the report prints the channel table with positions and notes, and the test pack and lot", async () => {
    const bytes = await loggerFile();
    const id = await flow.register(site.people.technician, {
      bytes,
      extra: { mapping: JSON.stringify({ positions: await placementsOf(bytes) }), loadType: "standard-test-pack", loadLot: "STP-2611-04" },
    });
    const { text } = await flow.reportText(id, ctx.dir);
    expect(text).toContain("Position and note");
    // Cells wrap, so pdftotext interleaves the role column's words with a long note; the short rows read straight.
    expect(text).toMatch(/Drain \(°C\) Reference point \(chamber .*drain valve/);
    expect(text).toContain("Pack 3 (°C) Test pack, centre: Geometric centre of the pack load");
    expect(text).toContain("Pack 6 (°C) Test pack, side: Long side, half height");
    expect(text).toContain("Standard test pack (textile)");
    expect(text).toContain("STP-2611-04");
  });
});

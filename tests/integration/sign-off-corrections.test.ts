import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, eq } from "drizzle-orm";
import { useTemporaryDatabase } from "../support/test-db";
import { CYCLE_DATE, loadReviewSite, loggerFile, reviewFlow, type ReviewSite } from "../support/review-flow";

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
const sha256 = async (bytes: Uint8Array) => (await import("@/lib/integrity")).sha256Hex(bytes);

async function ledger(cycleId: string, action: string) {
  const { auditEvents } = await import("@/db/schema");
  return ctx.db
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.entityId, cycleId), eq(auditEvents.action, action)));
}

describe("corrections leave a trace", () => {
  it("refuses a new analysis without a reason (422, 'say why'), and keeps the reason of one that has it", async () => {
    const id = await flow.register(site.people.technician, { bytes: await loggerFile() });
    const bare = await flow.correct(id, site.people.technician, { mapping: { temperatureUnit: "C" } });
    expect(bare.status).toBe(422);
    expect(await errorOf(bare)).toMatch(/^Say why the cycle is analysed again/);
    expect((await flow.detail(id)).analysisHistory).toHaveLength(1);
    expect((await flow.correct(id, site.people.auditor, { mapping: { temperatureUnit: "C" }, reason: "x" })).status).toBe(403);

    expect((await flow.correct(id, site.people.technician, { mapping: { temperatureUnit: "C" }, reason: "The logger writes °C; confirmed." })).status).toBe(201);
    const d = await flow.detail(id);
    expect(d.analysisHistory.map((h: { reason: string | null }) => h.reason)).toEqual(["The logger writes °C; confirmed.", null]);
    const [event] = await ledger(id, "cycle.reanalyse");
    expect(event.reason).toBe("The logger writes °C; confirmed.");
    expect(d.fileReplacement).toBeNull();
  });

  it("the re-mapping path: an engineer who re-mapped a technician's cycle cannot approve it; another engineer can", async () => {
    const id = await flow.register(site.people.technician, { bytes: await loggerFile() });
    const remapped = await flow.correct(id, site.people.engineer, { mapping: { temperatureUnit: "C", pressureGauge: false }, reason: "Pressure column reads absolute." });
    expect(remapped.status).toBe(201);
    await flow.submit(id, site.people.technician);
    const own = await flow.sign(id, site.people.engineer, { meaning: "approved" });
    expect(own.status).toBe(403);
    expect(await errorOf(own)).toBe("Segregation of duties: you made one of its analyses, so another engineer must approve it or confirm its failure.");
    expect((await flow.sign(id, site.people.engineer2, { meaning: "approved" })).status).toBe(201);
  });

  it("changed details: an engineer who changed a cycle's profile cannot approve it; the ledger keeps old and new", async () => {
    const id = await flow.register(site.people.technician, { bytes: await loggerFile() });
    expect((await flow.correct(id, site.people.engineer, { profileId: site.otherProfileId, reason: "The chamber is over 800 l." })).status).toBe(201);
    const d = await flow.detail(id);
    expect(d.profile.id).toBe(site.otherProfileId);
    const [event] = await ledger(id, "cycle.reanalyse");
    expect(JSON.parse(event.oldValue!)).toMatchObject({ profileId: site.profileId });
    expect(JSON.parse(event.newValue!)).toMatchObject({ profileId: site.otherProfileId });
    await flow.submit(id, site.people.technician);
    expect((await flow.sign(id, site.people.engineer, { meaning: "approved" })).status).toBe(403);
  });

  it("the file-substitution path: a returned failing cycle given an unrelated passing file needs the reviewer's acknowledgement, and its report shows the first hash and the history", async () => {
    const first = await loggerFile({ scenario: "air" });
    const id = await flow.register(site.people.technician, { bytes: first, name: "first.csv" });
    await flow.submit(id, site.people.technician);
    expect((await flow.sign(id, site.people.engineer, { meaning: "returned", reason: "Check the logger file." })).status).toBe(201);

    // Another recording altogether: it started three hours later and has four load probes instead of six.
    const unrelated = await loggerFile({ startedAt: new Date(CYCLE_DATE.getTime() + 3 * 3_600_000), probeCount: 4 });
    expect((await flow.correct(id, site.people.technician, { file: unrelated, fileName: "other.csv", reason: "Attached the right file." })).status).toBe(201);
    await flow.submit(id, site.people.technician);

    const d = await flow.detail(id);
    expect(d.verdict).toBe("pass");
    expect(d.fileReplacement.first).toEqual({ fileName: "first.csv", sha256: await sha256(first) });
    expect(d.fileReplacement.differences.join(" ")).toMatch(/starts at .*first file's started at/);
    expect(d.fileReplacement.differences.join(" ")).toMatch(/channels of the first file missing: "Pack 5 \(°C\)", "Pack 6 \(°C\)"/);

    const unacknowledged = await flow.sign(id, site.people.engineer, { meaning: "approved" });
    expect(unacknowledged.status).toBe(409);
    expect(await errorOf(unacknowledged)).toMatch(/replaced after the first analysis and the recordings differ\. The recording starts at .* Acknowledge the replacement/);
    expect((await flow.sign(id, site.people.engineer, { meaning: "approved", acknowledgeReplacement: true })).status).toBe(201);
    const [event] = await ledger(id, "cycle.sign.approved");
    expect(JSON.parse(event.newValue!).acknowledgedReplacement).toEqual(d.fileReplacement.differences);

    const { text } = await flow.reportText(id, ctx.dir);
    expect(text).toContain(`Logger file replaced after the first analysis; first file SHA-256 ${await sha256(first)}`);
    const history = text.slice(text.indexOf("History of the analyses"));
    expect(history).toContain("first.csv");
    expect(history).toContain("other.csv");
    expect(history).toContain("Attached the right file.");
    expect(history).toContain(`other.csv · SHA-256 ${await sha256(unrelated)}`);
  });

  it("a replacement with the same start and channels signs without acknowledgement, and the report still states it", async () => {
    const first = await loggerFile({ scenario: "air" });
    const id = await flow.register(site.people.technician, { bytes: first });
    expect((await flow.correct(id, site.people.technician, { file: await loggerFile(), reason: "Repeated the export from the logger." })).status).toBe(201);
    await flow.submit(id, site.people.technician);
    expect((await flow.detail(id)).fileReplacement.differences).toEqual([]);
    expect((await flow.sign(id, site.people.engineer, { meaning: "approved" })).status).toBe(201);
    const { text } = await flow.reportText(id, ctx.dir);
    expect(text).toContain(`first file SHA-256 ${await sha256(first)}`);
  });
});

describe("a logger file that already belongs to another cycle", () => {
  it("is refused at registration with 409 naming that cycle, and accepted with the reason, which both records show", async () => {
    const bytes = await loggerFile();
    const firstId = await flow.register(site.people.technician, { bytes, extra: { cycleNumber: "SHARED-1" } });
    const again = await flow.upload(site.people.technician, { bytes, extra: { cycleNumber: "SHARED-2" } });
    expect(again.status).toBe(409);
    expect(await errorOf(again)).toMatch(
      /^cycle\.csv is the same file \(SHA-256 [0-9a-f]{12}…\) as cycle SHARED-1 on this site\. If one file holds several cycles, say why under “Why this file belongs to this cycle too”/,
    );

    const reason = "One day-long file holds the morning and the afternoon cycles.";
    const secondId = await flow.register(site.people.technician, { bytes, extra: { cycleNumber: "SHARED-2", duplicateReason: reason } });
    expect((await flow.detail(secondId)).sharedFiles).toEqual([expect.objectContaining({ cycleId: firstId, cycleNumber: "SHARED-1", reason, sha256: await sha256(bytes) })]);
    expect((await flow.detail(firstId)).sharedFiles).toEqual([expect.objectContaining({ cycleId: secondId, cycleNumber: "SHARED-2", reason })]);
  });

  it("is refused as a replacement file too, unless the reason is given", async () => {
    const taken = await loggerFile();
    await flow.register(site.people.technician, { bytes: taken, extra: { cycleNumber: "TAKEN" } });
    const id = await flow.register(site.people.technician, { bytes: await loggerFile({ scenario: "air" }) });
    const refused = await flow.correct(id, site.people.technician, { file: taken, reason: "Better file." });
    expect(refused.status).toBe(409);
    expect(await errorOf(refused)).toMatch(/as cycle TAKEN on this site/);
    expect((await flow.detail(id)).analysisHistory).toHaveLength(1);
    expect((await flow.correct(id, site.people.technician, { file: taken, reason: "Better file.", duplicateReason: "The logger recorded both cycles in one file." })).status).toBe(201);
  });
});

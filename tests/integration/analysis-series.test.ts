import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { useTemporaryDatabase } from "../support/test-db";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const ids: Record<string, string> = {};

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { users, sites, sterilizers, acceptanceProfiles } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const [site] = await ctx.db.insert(sites).values({ name: "Series site", code: "SER", timeZone: "UTC" }).returning();
  const [tech] = await ctx.db
    .insert(users)
    .values({ email: "tech@series.example", name: "Tech", role: "technician", passwordHash: await hashPassword("a test password"), siteId: site.id })
    .returning();
  const [profile] = await ctx.db.insert(acceptanceProfiles).values({ siteId: site.id, name: "134 °C / 3 min", sterilizationTempC: 134, holdingTimeS: 180, basis: "en-285" }).returning();
  const [st] = await ctx.db.insert(sterilizers).values({ siteId: site.id, name: "Porous 1", serialNumber: "SER-1", chamberVolumeL: 445, defaultProfileId: profile.id }).returning();
  Object.assign(ids, { tech: tech.id, profile: profile.id, sterilizer: st.id });
  session.current = { user: { id: tech.id } };
});
afterAll(() => ctx.cleanup());

/** A simulated pass cycle with one blank temperature cell (a missing reading, NaN in the recording, null on the chart). */
async function loggerFile(seed: number) {
  const { simulateCycle, toLoggerCsv } = await import("@/lib/simulator");
  const csv = new TextDecoder().decode(
    toLoggerCsv(simulateCycle({ scenario: "pass", sterilizationTempC: 134.6, holdingTimeS: 210, seed, startedAt: new Date("2026-07-14T08:00:00Z") }), { delimiter: ",", timeFormat: "iso" }),
  );
  const lines = csv.split("\n");
  const cells = lines[40].split(",");
  cells[2] = "";
  lines[40] = cells.join(",");
  return new TextEncoder().encode(lines.join("\n"));
}

async function upload(bytes: Uint8Array) {
  const { POST } = await import("@/app/api/cycles/route");
  const form = new FormData();
  form.set("sterilizerId", ids.sterilizer);
  form.set("profileId", ids.profile);
  form.append("files", new Blob([bytes as BlobPart], { type: "text/csv" }), "cycle.csv");
  const res = await POST(new Request("http://papin.test/api/cycles", { method: "POST", body: form }), undefined);
  expect(res.status).toBe(201);
  return (await res.json()).id as string;
}

/** The series answer as the client receives it, with the in-process cache emptied first so the database is read. */
async function seriesText(id: string, query: string) {
  (globalThis as unknown as { __papinLru_recordings?: Map<string, unknown> }).__papinLru_recordings?.clear();
  const { GET } = await import("@/app/api/cycles/[id]/series/route");
  const res = await GET(new Request(`http://papin.test/api/cycles/${id}/series?${query}`), { params: Promise.resolve({ id }) });
  expect(res.status).toBe(200);
  return res.text();
}

async function seriesRows() {
  const { analysisSeries } = await import("@/db/schema");
  return ctx.db.select({ analysisId: analysisSeries.analysisId, sampleCount: analysisSeries.sampleCount, meta: analysisSeries.meta }).from(analysisSeries);
}

async function currentAnalysisOf(id: string) {
  const { cycles } = await import("@/db/schema");
  const { eq } = await import("drizzle-orm");
  return (await ctx.db.select({ a: cycles.currentAnalysisId }).from(cycles).where(eq(cycles.id, id)))[0].a!;
}

describe("the recording stored with its analysis", () => {
  it("gives the same series answer, byte for byte, as parsing the file again", async () => {
    const id = await upload(await loggerFile(71));
    const analysisId = await currentAnalysisOf(id);
    const [row] = (await seriesRows()).filter((r) => r.analysisId === analysisId);
    // The simulated file has one row per second over the whole cycle: every data line is a sample.
    expect(row.sampleCount).toBeGreaterThan(500);
    const queries = ["points=100", "points=20000", "fromS=300&toS=420&points=50"];
    const fromColumns = await Promise.all(queries.map((q) => seriesText(id, q)));
    expect(fromColumns[1]).toContain("null"); // the blank cell survived as a missing reading

    const { sql } = await import("drizzle-orm");
    await ctx.db.run(sql`delete from analysis_series where analysis_id = ${analysisId}`);
    const reparsed = await Promise.all(queries.map((q) => seriesText(id, q)));
    expect(fromColumns).toEqual(reparsed);
  });

  it("is what the chart reads when it is there (not the file)", async () => {
    const id = await upload(await loggerFile(72));
    const analysisId = await currentAnalysisOf(id);
    const { sql } = await import("drizzle-orm");
    await ctx.db.run(sql`update analysis_series set meta = json_set(meta, '$.pressureHeader', 'from the stored columns') where analysis_id = ${analysisId}`);
    const series = JSON.parse(await seriesText(id, "points=100"));
    expect(series.channels.find((c: { kind: string }) => c.kind === "pressure").header).toBe("from the stored columns");
  });

  it("is written again with each correction, for the new analysis", async () => {
    const id = await upload(await loggerFile(73));
    const { POST } = await import("@/app/api/cycles/[id]/analyses/route");
    const form = new FormData();
    form.set("reason", "Corrected file from the logger");
    form.append("file", new Blob([(await loggerFile(74)) as BlobPart], { type: "text/csv" }), "corrected.csv");
    const res = await POST(new Request(`http://papin.test/api/cycles/${id}/analyses`, { method: "POST", body: form }), { params: Promise.resolve({ id }) });
    expect(res.status).toBe(201);
    const analysisId = await currentAnalysisOf(id);
    expect((await seriesRows()).some((r) => r.analysisId === analysisId)).toBe(true);
  });
});

describe("the whole-record view kept with the analysis", () => {
  it("is the series API's default answer, equal to one built from the stored columns", async () => {
    const id = await upload(await loggerFile(76));
    const analysisId = await currentAnalysisOf(id);
    const { OVERVIEW_POINTS } = await import("@/lib/cycles/chart-model");
    const kept = await seriesText(id, "");
    expect(await seriesText(id, `points=${OVERVIEW_POINTS}`)).toBe(kept);
    const { sql } = await import("drizzle-orm");
    const [row] = await ctx.db.all<{ format: number; points: number }>(
      sql`select overview ->> 'format' as format, overview ->> 'points' as points from analysis_series where analysis_id = ${analysisId}`,
    );
    expect(row).toEqual({ format: 1, points: OVERVIEW_POINTS });
    // Without the kept view the same answer is built from the columns.
    await ctx.db.run(sql`update analysis_series set overview = null where analysis_id = ${analysisId}`);
    expect(await seriesText(id, "")).toBe(kept);
  });

  it("is what the first chart reads, and is passed over when it has another format or size", async () => {
    const id = await upload(await loggerFile(77));
    const analysisId = await currentAnalysisOf(id);
    const { sql } = await import("drizzle-orm");
    const pressureHeader = async (query: string) => JSON.parse(await seriesText(id, query)).channels.find((c: { kind: string }) => c.kind === "pressure").header;
    await ctx.db.run(sql`update analysis_series set overview = json_set(overview, '$.series.channels[#-2].header', 'from the kept view') where analysis_id = ${analysisId}`);
    expect(await pressureHeader("")).toBe("from the kept view");
    // A window, or another number of points, is built from the columns.
    expect(await pressureHeader("points=2000")).not.toBe("from the kept view");
    expect(await pressureHeader("from=0&to=600")).not.toBe("from the kept view");
    await ctx.db.run(sql`update analysis_series set overview = json_set(overview, '$.format', 0) where analysis_id = ${analysisId}`);
    expect(await pressureHeader("")).not.toBe("from the kept view");
  });
});

describe("the draft report", () => {
  async function draft(id: string) {
    const { GET } = await import("@/app/api/cycles/[id]/report/route");
    const res = await GET(new Request(`http://papin.test/api/cycles/${id}/report`), { params: Promise.resolve({ id }) });
    expect(res.status).toBe(200);
    return Buffer.from(await res.arrayBuffer());
  }

  it("is served again from the cache while the record is unchanged, and rendered anew once it changes", async () => {
    const id = await upload(await loggerFile(75));
    const first = await draft(id);
    await new Promise((resolve) => setTimeout(resolve, 5));
    // The same bytes, generation time included: the second request did not render.
    expect((await draft(id)).equals(first)).toBe(true);

    const { POST } = await import("@/app/api/cycles/[id]/analyses/route");
    const form = new FormData();
    form.set("reason", "Load description corrected");
    form.set("load", "Two linen packs");
    const res = await POST(new Request(`http://papin.test/api/cycles/${id}/analyses`, { method: "POST", body: form }), { params: Promise.resolve({ id }) });
    expect(res.status).toBe(201);
    expect((await draft(id)).equals(first)).toBe(false);

    // Every export is still in the ledger, cached or not.
    const { auditEvents } = await import("@/db/schema");
    const { and, eq } = await import("drizzle-orm");
    const exports = await ctx.db
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.entityId, id), eq(auditEvents.action, "report.export-draft")));
    expect(exports).toHaveLength(3);
  });

  const forgetDrafts = () => (globalThis as unknown as { "__papinLru_draft-reports"?: Map<string, unknown> })["__papinLru_draft-reports"]?.clear();

  async function keptDraft(id: string) {
    const { sql } = await import("drizzle-orm");
    const [row] = await ctx.db.all<{ sha256: string; bytes: ArrayBuffer; input: string; renderedAt: string }>(
      sql`select sha256, bytes, input_sha256 as input, rendered_at as renderedAt from report_drafts where cycle_id = ${id}`,
    );
    return row ? { sha256: row.sha256, bytes: Buffer.from(row.bytes), input: row.input, renderedAt: row.renderedAt } : undefined;
  }

  it("is prepared before anyone asks, kept in the database, and served from there by a process that never rendered it", async () => {
    const id = await upload(await loggerFile(78));
    expect(await keptDraft(id)).toBeUndefined();
    const { prepareDraftReport } = await import("@/lib/services/reports");
    const actor = {
      id: ids.tech,
      email: "tech@series.example",
      name: "Tech",
      role: "technician" as const,
      siteId: (await ctx.db.all<{ id: string }>((await import("drizzle-orm")).sql`select id from sites`))[0].id,
    };
    await prepareDraftReport({ actor, id });
    const kept = await keptDraft(id);
    expect(kept?.bytes.subarray(0, 5).toString()).toBe("%PDF-");
    const { sha256Hex } = await import("@/lib/integrity");
    expect(kept?.sha256).toBe(sha256Hex(kept!.bytes));
    forgetDrafts();
    // The same bytes, generation time included: nothing was rendered for this request.
    expect((await draft(id)).equals(kept!.bytes)).toBe(true);
  });

  it("is prepared in turn for each cycle queued after an upload, the newest first", async () => {
    const older = await upload(await loggerFile(81));
    const newer = await upload(await loggerFile(82));
    const { prepareDraftReportSoon } = await import("@/lib/services/reports");
    const { sql } = await import("drizzle-orm");
    const [site] = await ctx.db.all<{ id: string }>(sql`select id from sites`);
    const actor = { id: ids.tech, email: "tech@series.example", name: "Tech", role: "technician" as const, siteId: site.id };
    await Promise.all([prepareDraftReportSoon({ actor, id: older }), prepareDraftReportSoon({ actor, id: newer })]);
    const [a, b] = [await keptDraft(older), await keptDraft(newer)];
    expect(a?.bytes.subarray(0, 5).toString()).toBe("%PDF-");
    expect(b?.bytes.subarray(0, 5).toString()).toBe("%PDF-");
    expect(b!.renderedAt < a!.renderedAt).toBe(true);
  });

  it("is rendered again, never served, when its kept bytes no longer match their hash", async () => {
    const id = await upload(await loggerFile(79));
    const first = await draft(id);
    const { sql } = await import("drizzle-orm");
    await ctx.db.run(sql`update report_drafts set bytes = ${Buffer.from("%PDF-1.4 altered")} where cycle_id = ${id}`);
    forgetDrafts();
    await new Promise((resolve) => setTimeout(resolve, 5));
    const again = await draft(id);
    expect(again.toString("latin1")).not.toContain("altered");
    expect(again.equals(first)).toBe(false); // rendered anew, with its own generation time
    expect((await keptDraft(id))?.bytes.equals(again)).toBe(true);
  });

  it("is rendered again when the record it printed changed, even from a process that kept it", async () => {
    const id = await upload(await loggerFile(80));
    const first = await draft(id);
    const before = await keptDraft(id);
    const { sql } = await import("drizzle-orm");
    await ctx.db.run(sql`update cycles set load_description = 'Changed behind the cache' where id = ${id}`);
    forgetDrafts();
    const again = await draft(id);
    expect(again.equals(first)).toBe(false);
    expect((await keptDraft(id))?.input).not.toBe(before?.input);
  });
});

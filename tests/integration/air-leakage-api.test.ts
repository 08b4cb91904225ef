import { execFileSync } from "node:child_process";
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { useTemporaryDatabase } from "../support/test-db";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const people: Record<string, string> = {};
let sterilizerId = "";
let profileId = "";

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { loadDemoSite } = await import("@/db/seed");
  await loadDemoSite(ctx.db, { password: "a demo password" });
  const { users, sterilizers, acceptanceProfiles } = await import("@/db/schema");
  for (const u of await ctx.db.select().from(users)) people[u.role] = u.id;
  const [s] = await ctx.db.select().from(sterilizers).limit(1);
  sterilizerId = s.id;
  const [p] = await ctx.db.select().from(acceptanceProfiles).limit(1);
  profileId = p.id;
}, 180_000);
afterAll(() => ctx.cleanup());

const as = (role: string) => (session.current = { user: { id: people[role] } });

/** Time and chamber pressure only, elapsed seconds: evacuation to 5.0 kPa at 240 s, then 7.0 kPa at 540 s and 8.0 kPa at 1140 s. */
function pressureOnlyCsv(p3Kpa = 8.0): Uint8Array {
  const corners: Array<[number, number]> = [
    [0, 101.3],
    [60, 101.3],
    [240, 5.0],
    [540, 7.0],
    [1140, p3Kpa],
    [1200, p3Kpa + 0.1],
  ];
  const lines = ["Date/time,Chamber pressure (kPa abs)"];
  for (let t = 0; t <= 1200; t += 2) {
    const k = corners.findIndex(([c]) => c >= t);
    const [t0, p0] = corners[Math.max(0, k - 1)];
    const [t1, p1] = corners[k];
    const p = k === 0 ? p1 : p0 + ((p1 - p0) * (t - t0)) / (t1 - t0);
    const clock = new Date(Date.UTC(2026, 10, 20, 6, 0, t)).toISOString().slice(0, 19).replace("T", " ");
    lines.push(`${clock},${p.toFixed(3)}`);
  }
  return new TextEncoder().encode(lines.join("\n") + "\n");
}

function upload(fields: Record<string, string>, bytes: Uint8Array) {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  // The same constructed trace serves several cycles; a file another cycle holds needs a reason.
  form.set("duplicateReason", "test: one constructed trace for several cycles");
  form.append("files", new Blob([bytes as BlobPart], { type: "text/csv" }), "leak-test.csv");
  return new Request("http://papin.test/api/cycles", { method: "POST", body: form });
}

describe("POST /api/cycles with testKind air-leakage and a time+pressure file", () => {
  it("answers with kind, leakRate and p1–p3 worked by hand: (8.0 − 7.0) / 10 min = 0.10 kPa/min, pass", async () => {
    const { POST } = await import("@/app/api/cycles/route");
    as("technician");
    const response = await POST(upload({ sterilizerId, profileId, testKind: "air-leakage" }, pressureOnlyCsv()), undefined);
    expect(response.status).toBe(201);
    const body = await response.json();
    expect(body.analysis).toMatchObject({ kind: "air-leakage", verdict: "pass", p1: 5, p2: 7, p3: 8, t1: 240, t2: 540, t3: 1140 });
    expect(body.analysis.leakRate).toBeCloseTo(0.1, 6);
    expect(body.analysis.limits).toEqual({ maxLeakRateKpaPerMin: 0.13, vacuumSetPointKpaAbs: 7 }); // the profile's defaults (migration 0012, DOMAIN §2.5)

    const { GET } = await import("@/app/api/cycles/[id]/route");
    const detail = await (await GET(new Request("http://papin.test"), { params: Promise.resolve({ id: body.id }) })).json();
    expect(detail.testKind).toBe("air-leakage");
    expect(detail.analysis.kind).toBe("air-leakage");
    expect(detail.files[0].mapping.temperaturesOptional).toBe(true);

    // The chart and the report read the stored file again the same way.
    const series = await import("@/app/api/cycles/[id]/series/route");
    const chart = await (await series.GET(new Request(`http://papin.test/api/cycles/${body.id}/series?points=200`), { params: Promise.resolve({ id: body.id }) })).json();
    expect(chart.channels.find((c: { kind: string }) => c.kind === "pressure").values.length).toBeGreaterThan(100);
    expect(chart.plateau).toBeNull();

    // The draft report prints the air leakage section, not the thermometric ones.
    const report = await import("@/app/api/cycles/[id]/report/route");
    const pdf = await report.GET(new Request(`http://papin.test/api/cycles/${body.id}/report`), { params: Promise.resolve({ id: body.id }) });
    expect(pdf.headers.get("content-type")).toBe("application/pdf");
    // Kept in test-results/ for a person to look at (pdftoppm -png).
    mkdirSync("test-results", { recursive: true });
    const file = path.join("test-results", "air-leakage-report.pdf");
    writeFileSync(file, Buffer.from(await pdf.arrayBuffer()));
    const text = execFileSync("pdftotext", [file, "-"], { encoding: "utf8" }).replace(/\s+/g, " ");
    expect(text).toContain("Air leakage test: readings");
    expect(text).toContain("t3 / p3: 10 min later");
    expect(text).toContain("0.100 kPa/min");
    expect(text).toContain("Chamber pressure during the test");
    expect(text).not.toContain("Phase diagram of water");
    expect(text).not.toContain("Channels during holding");
    expect(text).not.toContain("Saturation flags");
  });

  it("a leak of (8.5 − 7.0) / 10 min = 0.15 kPa/min fails; a marked t1 is used and recorded; marks on another kind are refused", async () => {
    const { POST } = await import("@/app/api/cycles/route");
    as("technician");
    const failing = await (await POST(upload({ sterilizerId, profileId, testKind: "air-leakage" }, pressureOnlyCsv(8.5)), undefined)).json();
    expect(failing.analysis.verdict).toBe("fail");
    expect(failing.analysis.leakRate).toBeCloseTo(0.15, 6);

    const marked = await (await POST(upload({ sterilizerId, profileId, testKind: "air-leakage", leakMarks: JSON.stringify({ t1S: 250 }) }, pressureOnlyCsv()), undefined)).json();
    expect(marked.analysis.timeSources.t1).toBe("marked");
    expect(marked.analysis.t1).toBe(250);
    // p1 at 250 s: 5.0 + 2.0 × 10/300 = 5.067 kPa (worked by hand).
    expect(marked.analysis.p1).toBeCloseTo(5.067, 3);

    const refused = await POST(upload({ sterilizerId, profileId, testKind: "thermometric-small-load", leakMarks: JSON.stringify({ t1S: 250 }) }, pressureOnlyCsv()), undefined);
    expect(refused.status).toBe(422);
    expect((await refused.json()).error).toMatch(/belong to an air leakage test/);
    const badJson = await POST(upload({ sterilizerId, profileId, testKind: "air-leakage", leakMarks: "{t1: 3" }, pressureOnlyCsv()), undefined);
    expect(badJson.status).toBe(400);
  });

  it("the same file registered as a thermometric test is refused with the reader's sentence: it has no temperature column", async () => {
    const { POST } = await import("@/app/api/cycles/route");
    as("technician");
    const response = await POST(upload({ sterilizerId, profileId, testKind: "thermometric-small-load" }, pressureOnlyCsv()), undefined);
    expect(response.status).toBe(422);
    expect((await response.json()).error).toMatch(/No temperature column/);
  });
});

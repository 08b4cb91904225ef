import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import { writeFileSync } from "node:fs";
import path from "node:path";
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
  const profiles = await ctx.db.select().from(acceptanceProfiles);
  profileId = profiles.find((p) => p.sterilizationTempC === 134 && p.maxEquilibrationS === 15)!.id;
}, 180_000);
afterAll(() => ctx.cleanup());

const as = (role: string) => (session.current = { user: { id: people[role] } });

async function simulatedFile(scenario: "pass" | "air", dialect: Record<string, unknown>) {
  const { simulateCycle, toLoggerCsv } = await import("@/lib/simulator");
  const sim = simulateCycle({ scenario, sterilizationTempC: 134.6, holdingTimeS: 210, seed: 77, startedAt: new Date("2026-11-20T08:00:00Z") });
  return toLoggerCsv(sim, dialect);
}

function uploadRequest(fields: Record<string, string>, files: Array<{ name: string; bytes: Uint8Array }>) {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  for (const f of files) form.append("files", new Blob([f.bytes as BlobPart], { type: "text/csv" }), f.name);
  return new Request("http://papin.test/api/cycles", { method: "POST", body: form });
}

function analyzeWithCli(bytes: Uint8Array, name: string) {
  const file = path.join(ctx.dir, name);
  writeFileSync(file, bytes);
  const out = execFileSync(process.execPath, ["lib/cli/launch.mjs", "analyze", file, "--sterilization-temp", "134", "--holding-time", "180"], { encoding: "utf8" });
  return JSON.parse(out);
}

describe("POST /api/cycles then GET", () => {
  const created: Array<{ id: string; bytes: Uint8Array; name: string }> = [];

  it("stores a comma/ISO file and a semicolon/decimal-comma bar file, each with the hash of its bytes and the analyze command's figures", async () => {
    const { POST } = await import("@/app/api/cycles/route");
    as("technician");
    const files = [
      { name: "comma-iso.csv", bytes: await simulatedFile("pass", { delimiter: ",", timeFormat: "iso" }) },
      { name: "semicolon-dmy.csv", bytes: await simulatedFile("air", { delimiter: ";", decimal: ",", timeFormat: "dmy", pressureUnit: "bar" }) },
    ];
    for (const f of files) {
      const response = await POST(uploadRequest({ sterilizerId, profileId, cycleNumber: `T-${f.name}`, load: "test pack" }, [f]), undefined);
      expect(response.status).toBe(201);
      const body = await response.json();
      expect(body.status).toBe("draft");
      created.push({ id: body.id, ...f });
      const cli = analyzeWithCli(f.bytes, f.name);
      expect(body.analysis.verdict).toBe(cli.verdict);
      expect(body.analysis.holdingTime).toBeCloseTo(cli.holdingTime, 6);
      expect(body.analysis.equilibrationTime).toBeCloseTo(cli.equilibrationTime, 6);
      expect(body.analysis.saturation.flags.length).toBe(cli.saturation.flags.length);
    }

    const { GET } = await import("@/app/api/cycles/[id]/route");
    for (const c of created) {
      const detail = await (await GET(new Request("http://papin.test"), { params: Promise.resolve({ id: c.id }) })).json();
      expect(detail.files[0].sha256).toBe(createHash("sha256").update(c.bytes).digest("hex"));
      expect(detail.files[0].size).toBe(c.bytes.byteLength);
      expect(detail.sterilizer.id).toBe(sterilizerId);
      expect(detail.profile.sterilizationTempC).toBe(134);
      expect(Object.keys(detail.analysis.f0).length).toBeGreaterThan(1);
    }
  });

  it("lists and filters: the failing upload is found by verdict and text", async () => {
    const { GET } = await import("@/app/api/cycles/route");
    as("engineer");
    const failing = await (await GET(new Request("http://papin.test/api/cycles?verdict=fail&q=semicolon"), undefined)).json();
    expect(failing.total).toBe(1);
    expect(failing.items[0].cycleNumber).toBe("T-semicolon-dmy.csv");
    // Search text is taken as typed: "%" and "_" are characters, not wildcards (no cycle number holds them).
    for (const q of ["%", "_", "T_semicolon"]) {
      const literal = await (await GET(new Request(`http://papin.test/api/cycles?q=${encodeURIComponent(q)}`), undefined)).json();
      expect(literal.total).toBe(0);
    }
    const dashed = await (await GET(new Request("http://papin.test/api/cycles?q=T-semicolon"), undefined)).json();
    expect(dashed.total).toBe(1);
    const page = await (await GET(new Request("http://papin.test/api/cycles?pageSize=5&page=2&sort=cycleNumber:asc"), undefined)).json();
    expect(page.items).toHaveLength(5);
    expect(page.total).toBeGreaterThan(10);
    const bad = await GET(new Request("http://papin.test/api/cycles?status=finished"), undefined);
    expect(bad.status).toBe(400);
    expect((await bad.json()).error).toMatch(/status/);
  });

  it("serves chart data downsampled keeping extremes, and a zoomed window at full resolution", async () => {
    const { GET } = await import("@/app/api/cycles/[id]/series/route");
    as("auditor");
    const id = created[0].id;
    const res = await GET(new Request(`http://papin.test/api/cycles/${id}/series?points=200`), { params: Promise.resolve({ id }) });
    expect(res.status).toBe(200);
    const text = await res.text();
    const series = JSON.parse(text);
    expect(series.timesS.length).toBeLessThanOrEqual(200);
    expect(series.fullResolution).toBe(false);
    const kinds = series.channels.map((c: { kind: string }) => c.kind);
    expect(kinds).toContain("pressure");
    expect(kinds).toContain("saturation");
    const zoom = await (await GET(new Request(`http://papin.test/api/cycles/${id}/series?from=700&to=760&points=200`), { params: Promise.resolve({ id }) })).json();
    expect(zoom.fullResolution).toBe(true);
    expect(zoom.timesS[0]).toBeGreaterThanOrEqual(700);
    expect(zoom.timesS.at(-1)).toBeLessThanOrEqual(760);
  });

  it("refuses an auditor's upload with 403 and stores nothing", async () => {
    const { POST } = await import("@/app/api/cycles/route");
    const { cycles } = await import("@/db/schema");
    const before = (await ctx.db.select().from(cycles)).length;
    as("auditor");
    const res = await POST(uploadRequest({ sterilizerId, profileId }, [{ name: "x.csv", bytes: await simulatedFile("pass", {}) }]), undefined);
    expect(res.status).toBe(403);
    expect((await res.json()).error).toMatch(/role/);
    expect((await ctx.db.select().from(cycles)).length).toBe(before);
  });

  it("answers a corrupt file with 422 and the parser's message, leaving no cycle behind", async () => {
    const { POST } = await import("@/app/api/cycles/route");
    const { cycles, loggerFiles } = await import("@/db/schema");
    const before = [(await ctx.db.select().from(cycles)).length, (await ctx.db.select().from(loggerFiles)).length];
    as("technician");
    const garbage = new Uint8Array(4096).map((_, i) => (i * 7919) % 256);
    const res = await POST(uploadRequest({ sterilizerId, profileId }, [{ name: "broken.csv", bytes: garbage }]), undefined);
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.error).toMatch(/broken\.csv/);
    expect(body.error).not.toMatch(/at .*\.ts/);
    expect([(await ctx.db.select().from(cycles)).length, (await ctx.db.select().from(loggerFiles)).length]).toEqual(before);
  });

  it("answers an anonymous request with 401", async () => {
    const { GET } = await import("@/app/api/cycles/route");
    session.current = null;
    expect((await GET(new Request("http://papin.test/api/cycles"), undefined)).status).toBe(401);
  });
});

describe("POST /api/logger-files/inspect", () => {
  async function inspect(bytes: Uint8Array, name = "file.csv") {
    const { POST } = await import("@/app/api/logger-files/inspect/route");
    const form = new FormData();
    form.append("file", new Blob([bytes as BlobPart]), name);
    as("technician");
    return POST(new Request("http://papin.test/api/logger-files/inspect", { method: "POST", body: form }), undefined);
  }

  it("guesses the mapping of a readable file and marks what it is unsure of", async () => {
    const res = await inspect(await simulatedFile("pass", { delimiter: ";", decimal: ",", pressureUnit: "bar" }));
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.dialect).toMatchObject({ delimiter: ";", decimal: "," });
    expect(body.columns.find((c: { role: string }) => c.role === "pressure").unit).toBe("bar");
    expect(body.referenceColumn).toMatch(/Drain/);
    expect(body.problems).toEqual([]);
  });

  it("still previews a file whose pressure column it cannot recognise, so the user can map it", async () => {
    const text = new TextDecoder().decode(await simulatedFile("pass", {}));
    const renamed = new TextEncoder().encode(text.replace("Chamber (kPa abs)", "Channel 9"));
    const res = await inspect(renamed);
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.problems[0]).toMatch(/No pressure column/);
    expect(body.warnings[0]).toMatch(/No pressure column/);
    expect(body.preview.header).toContain("Channel 9");
  });

  it("answers unreadable bytes with 422 naming the file", async () => {
    const res = await inspect(new Uint8Array([0, 1, 2, 3, 255, 254, 0, 0, 9]), "photo.csv");
    expect(res.status).toBe(422);
    expect((await res.json()).error).toMatch(/^photo\.csv: /);
  });
});

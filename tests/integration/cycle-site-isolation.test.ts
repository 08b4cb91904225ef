import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { useTemporaryDatabase } from "../support/test-db";
import { placementsOf } from "../support/review-flow";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));

const PASSWORD = "an isolation test password";
const SITES = ["north", "south"] as const;
type SiteKey = (typeof SITES)[number];
type Person = { id: string; email: string; name: string; role: "technician" | "engineer" | "auditor"; siteId: string };

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const people = {} as Record<SiteKey, Record<Person["role"], Person>>;
const setup = {} as Record<
  SiteKey,
  { sterilizerId: string; profileId: string; instrumentId: string; approvedId: string; draftId: string; reportId: string; reportPdf: Uint8Array; cycleNumber: string }
>;

const params = (id: string) => ({ params: Promise.resolve({ id }) });
const as = (p: Person) => (session.current = { user: { id: p.id } });
const url = (path: string) => `http://papin.test${path}`;

// Each upload is a file of its own: a file another cycle of the site holds is refused without a reason.
let nextSeed = 11;

async function upload(site: SiteKey, cycleNumber: string) {
  const { simulateCycle, toLoggerCsv } = await import("@/lib/simulator");
  const { POST } = await import("@/app/api/cycles/route");
  const sim = simulateCycle({ scenario: "pass", sterilizationTempC: 134.6, holdingTimeS: 210, seed: nextSeed++, startedAt: new Date("2026-11-26T07:00:00Z") });
  const form = new FormData();
  form.set("sterilizerId", setup[site].sterilizerId);
  form.set("profileId", setup[site].profileId);
  form.set("instrumentId", setup[site].instrumentId);
  form.set("cycleNumber", cycleNumber);
  // The probes placed as recorded at intake: a thermometric cycle is approved only with its positions.
  form.set("mapping", JSON.stringify({ positions: await placementsOf(toLoggerCsv(sim)) }));
  form.append("files", new Blob([toLoggerCsv(sim) as BlobPart]), `${cycleNumber}.csv`);
  as(people[site].technician);
  const res = await POST(new Request(url("/api/cycles"), { method: "POST", body: form }), undefined);
  expect(res.status).toBe(201);
  return (await res.json()).id as string;
}

async function approve(site: SiteKey, id: string) {
  const submit = (await import("@/app/api/cycles/[id]/submit/route")).POST;
  const sign = (await import("@/app/api/cycles/[id]/signatures/route")).POST;
  as(people[site].technician);
  expect((await submit(new Request(url(`/api/cycles/${id}/submit`), { method: "POST" }), params(id))).status).toBe(200);
  as(people[site].engineer);
  const body = JSON.stringify({ password: PASSWORD, meaning: "approved" });
  expect((await sign(new Request(url(`/api/cycles/${id}/signatures`), { method: "POST", body, headers: { "content-type": "application/json" } }), params(id))).status).toBe(201);
}

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { sites, users, sterilizers, acceptanceProfiles, instruments, calibrationCertificates } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const passwordHash = await hashPassword(PASSWORD);
  for (const key of SITES) {
    const [site] = await ctx.db
      .insert(sites)
      .values({ name: `${key} hospital`, code: key.toUpperCase() })
      .returning();
    people[key] = {} as Record<Person["role"], Person>;
    for (const role of ["technician", "engineer", "auditor"] as const) {
      const email = `${role}@${key}.example`;
      const [u] = await ctx.db
        .insert(users)
        .values({ email, name: `${key} ${role}`, role, passwordHash, siteId: site.id })
        .returning();
      people[key][role] = { id: u.id, email, name: u.name, role, siteId: site.id };
    }
    const [profile] = await ctx.db.insert(acceptanceProfiles).values({ siteId: site.id, name: "134 °C / 3 min", sterilizationTempC: 134, holdingTimeS: 180, basis: "en-285" }).returning();
    const [sterilizer] = await ctx.db
      .insert(sterilizers)
      .values({ siteId: site.id, name: `${key} sterilizer`, serialNumber: `${key.toUpperCase()}-001`, chamberVolumeL: 400 })
      .returning();
    // A thermometric test is approved only with a logger calibrated on the cycle's date (26 Nov 2026).
    const [logger] = await ctx.db
      .insert(instruments)
      .values({ siteId: site.id, name: `${key} logger`, serialNumber: `${key.toUpperCase()}-TL-1` })
      .returning();
    await ctx.db.insert(calibrationCertificates).values({ instrumentId: logger.id, certificateNumber: `${key}-CAL-1`, issuedBy: "test lab", calibratedOn: "2026-01-10", dueOn: "2027-01-10" });
    setup[key] = {
      sterilizerId: sterilizer.id,
      profileId: profile.id,
      instrumentId: logger.id,
      approvedId: "",
      draftId: "",
      reportId: "",
      reportPdf: new Uint8Array(),
      cycleNumber: `${key.toUpperCase()}-APPROVED`,
    };
  }
  for (const key of SITES) {
    setup[key].approvedId = await upload(key, setup[key].cycleNumber);
    setup[key].draftId = await upload(key, `${key.toUpperCase()}-DRAFT`);
    await approve(key, setup[key].approvedId);
    const detail = await (await (await import("@/app/api/cycles/[id]/route")).GET(new Request(url("/")), params(setup[key].approvedId))).json();
    setup[key].reportId = detail.report.id;
    const report = await (await import("@/app/api/cycles/[id]/report/route")).GET(new Request(url("/")), params(setup[key].approvedId));
    expect(report.status).toBe(200);
    setup[key].reportPdf = new Uint8Array(await report.arrayBuffer());
  }
}, 180_000);
afterAll(() => ctx.cleanup());

describe("two sites: cycle reads never show the other site's rows", () => {
  it("the list holds only the reader's own site's cycles, whatever the filter", async () => {
    const { GET } = await import("@/app/api/cycles/route");
    for (const [mine, theirs] of [
      ["south", "north"],
      ["north", "south"],
    ] as const) {
      as(people[mine].auditor);
      const all = await (await GET(new Request(url("/api/cycles?pageSize=100")), undefined)).json();
      expect(all.total).toBe(2);
      expect(all.items.map((c: { id: string }) => c.id).sort()).toEqual([setup[mine].approvedId, setup[mine].draftId].sort());
      const searched = await (await GET(new Request(url(`/api/cycles?q=${theirs.toUpperCase()}`)), undefined)).json();
      expect(searched.total).toBe(0);
      const bySterilizer = await (await GET(new Request(url(`/api/cycles?sterilizer=${setup[theirs].sterilizerId}`)), undefined)).json();
      expect(bySterilizer.total).toBe(0);
    }
  });

  it("detail, series and report of the other site's cycle answer 404; the own site's answer 200", async () => {
    const detail = (await import("@/app/api/cycles/[id]/route")).GET;
    const series = (await import("@/app/api/cycles/[id]/series/route")).GET;
    const report = (await import("@/app/api/cycles/[id]/report/route")).GET;
    as(people.south.auditor);
    for (const [id, status] of [
      [setup.north.approvedId, 404],
      [setup.north.draftId, 404],
      [setup.south.approvedId, 200],
    ] as const) {
      expect((await detail(new Request(url("/")), params(id))).status).toBe(status);
      expect((await series(new Request(url(`/api/cycles/${id}/series?points=100`)), params(id))).status).toBe(status);
      expect((await report(new Request(url("/")), params(id))).status).toBe(status);
    }
    const refused = await detail(new Request(url("/")), params(setup.north.approvedId));
    expect(await refused.json()).toEqual({ error: "That cycle was not found." });
  });

  it("the record page's guard and loader refuse the other site's cycle with 404", async () => {
    const { findCycle, getCycleRecord } = await import("@/lib/services/cycles");
    expect(await findCycle({ actor: people.south.auditor, id: setup.north.approvedId })).toBeUndefined();
    expect(await findCycle({ actor: people.south.auditor, id: setup.south.approvedId })).toMatchObject({ id: setup.south.approvedId, status: "approved" });
    await expect(getCycleRecord({ actor: people.south.engineer, id: setup.north.approvedId })).rejects.toMatchObject({ status: 404 });
    const own = await getCycleRecord({ actor: people.south.engineer, id: setup.south.approvedId });
    expect(own.detail.cycleNumber).toBe(setup.south.cycleNumber);
    expect(own.history.map((e) => e.action)).toContain("cycle.sign.approved");
  });

  it("the CSV export holds only the reader's own site's cycles", async () => {
    const { GET } = await import("@/app/api/cycles/export/route");
    as(people.south.engineer);
    const csv = await (await GET(new Request(url("/api/cycles/export")), undefined)).text();
    expect(csv).toContain(setup.south.approvedId);
    expect(csv).toContain("SOUTH-DRAFT");
    expect(csv).not.toContain(setup.north.approvedId);
    expect(csv).not.toContain(setup.north.draftId);
    expect(csv).not.toMatch(/NORTH/);
  });

  it("the other site's archived report is neither listed, downloaded nor matched", async () => {
    const download = (await import("@/app/api/reports/[id]/route")).GET;
    const verify = (await import("@/app/api/reports/verify/route")).POST;
    const { listArchivedReports } = await import("@/db/queries/reviews");
    as(people.south.auditor);
    expect((await download(new Request(url("/")), params(setup.north.reportId))).status).toBe(404);
    expect((await download(new Request(url("/")), params(setup.south.reportId))).status).toBe(200);
    const check = async (pdf: Uint8Array) => {
      const form = new FormData();
      form.append("file", new Blob([pdf as BlobPart], { type: "application/pdf" }), "r.pdf");
      return (await verify(new Request(url("/api/reports/verify"), { method: "POST", body: form }), undefined)).json();
    };
    expect(await check(setup.north.reportPdf)).toMatchObject({ match: false });
    expect(await check(setup.south.reportPdf)).toMatchObject({ match: true, cycleId: setup.south.approvedId });
    const listed = await listArchivedReports({ actor: people.south.auditor });
    expect(listed.map((r) => r.cycleId)).toEqual([setup.south.approvedId]);
  });

  it("submitting, correcting or signing the other site's cycle answers 404 and changes nothing", async () => {
    const submit = (await import("@/app/api/cycles/[id]/submit/route")).POST;
    const sign = (await import("@/app/api/cycles/[id]/signatures/route")).POST;
    const correct = (await import("@/app/api/cycles/[id]/analyses/route")).POST;
    const id = setup.north.draftId;
    as(people.south.technician);
    expect((await submit(new Request(url("/"), { method: "POST" }), params(id))).status).toBe(404);
    const form = new FormData();
    form.set("mapping", JSON.stringify({ temperatureUnit: "C" }));
    form.set("reason", "Temperatures read in °C.");
    expect((await correct(new Request(url("/"), { method: "POST", body: form }), params(id))).status).toBe(404);
    as(people.south.engineer);
    const body = JSON.stringify({ password: PASSWORD, meaning: "reviewed" });
    expect((await sign(new Request(url("/"), { method: "POST", body, headers: { "content-type": "application/json" } }), params(id))).status).toBe(404);
    as(people.north.auditor);
    const detail = await (await (await import("@/app/api/cycles/[id]/route")).GET(new Request(url("/")), params(id))).json();
    expect(detail).toMatchObject({ status: "draft", signatures: [], analysisHistory: [expect.anything()] });
  });
});

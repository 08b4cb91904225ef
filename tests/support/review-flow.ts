/**
 * A small site for the review-workflow tests, and the API calls they make through the route handlers. Each test file
 * mocks next-auth itself (vi.mock is hoisted per file) and hands its session object in here.
 */
import type { useTemporaryDatabase } from "./test-db";

type Db = Awaited<ReturnType<typeof useTemporaryDatabase>>["db"];
export type Session = { current: null | { user: { id: string } } };

export const REVIEW_PASSWORD = "a review test password";
/** The simulated cycles start on 25 November 2026, 07:00 UTC unless a test says otherwise. */
export const CYCLE_DATE = new Date("2026-11-25T07:00:00Z");

export type ReviewSite = {
  siteId: string;
  people: Record<"technician" | "engineer" | "engineer2" | "auditor" | "admin", string>;
  sterilizerId: string;
  profileId: string;
  otherProfileId: string;
  /** calibrated 1 Jan 2026, due 1 Jan 2027: valid on the cycles' date */
  calibratedId: string;
  /** calibrated 1 Nov 2025, due 18 Nov 2026: lapsed 7 days before the cycles' date */
  lapsedId: string;
};

export async function loadReviewSite(db: Db): Promise<ReviewSite> {
  const { sites, users, sterilizers, acceptanceProfiles, instruments, calibrationCertificates } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const passwordHash = await hashPassword(REVIEW_PASSWORD);
  const [site] = await db.insert(sites).values({ name: "Review test hospital", code: "REVIEW" }).returning();
  const people = {} as ReviewSite["people"];
  for (const [key, role] of [
    ["technician", "technician"],
    ["engineer", "engineer"],
    ["engineer2", "engineer"],
    ["auditor", "auditor"],
    ["admin", "admin"],
  ] as const) {
    const [u] = await db
      .insert(users)
      .values({ email: `${key}@review.example`, name: `Review ${key}`, role, passwordHash, siteId: site.id })
      .returning();
    people[key] = u.id;
  }
  const [profile, other] = await db
    .insert(acceptanceProfiles)
    .values([
      { siteId: site.id, name: "134 °C / 3 min", sterilizationTempC: 134, holdingTimeS: 180, basis: "en-285" },
      { siteId: site.id, name: "134 °C / 3 min, chamber over 800 l", sterilizationTempC: 134, holdingTimeS: 180, maxEquilibrationS: 30, basis: "en-285" },
    ])
    .returning();
  const [sterilizer] = await db.insert(sterilizers).values({ siteId: site.id, name: "Porous load 1", serialNumber: "RV-PL-01", chamberVolumeL: 445 }).returning();
  const [calibrated, lapsed] = await db
    .insert(instruments)
    .values([
      { siteId: site.id, name: "Logger unit A", serialNumber: "TL12-A" },
      { siteId: site.id, name: "Logger unit B", serialNumber: "TL12-B" },
    ])
    .returning();
  await db.insert(calibrationCertificates).values([
    { instrumentId: calibrated.id, certificateNumber: "CAL-26-0001", issuedBy: "test lab", calibratedOn: "2026-01-01", dueOn: "2027-01-01" },
    { instrumentId: lapsed.id, certificateNumber: "CAL-25-0777", issuedBy: "test lab", calibratedOn: "2025-11-01", dueOn: "2026-11-18" },
  ]);
  return { siteId: site.id, people, sterilizerId: sterilizer.id, profileId: profile.id, otherProfileId: other.id, calibratedId: calibrated.id, lapsedId: lapsed.id };
}

let nextSeed = 100;

/** A simulated logger file of its own (each call another seed, so no two uploads share a SHA-256). */
export async function loggerFile({ scenario = "pass", startedAt = CYCLE_DATE, probeCount }: { scenario?: "pass" | "air"; startedAt?: Date; probeCount?: number } = {}) {
  const { simulateCycle, toLoggerCsv } = await import("@/lib/simulator");
  return toLoggerCsv(simulateCycle({ scenario, sterilizationTempC: 134.6, holdingTimeS: 210, seed: nextSeed++, startedAt, probeCount }));
}

/** The simulator's probe positions for the temperature columns of a file (a file that cannot be read gets none). */
export async function placementsOf(bytes: Uint8Array) {
  const { inspectLoggerFile } = await import("@/lib/logger-files");
  const { simulatedPlacements } = await import("@/lib/simulator");
  try {
    return simulatedPlacements(
      inspectLoggerFile(bytes)
        .columns.filter((c) => c.role === "temperature")
        .map((c) => c.header),
    );
  } catch {
    return {};
  }
}

const params = (id: string) => ({ params: Promise.resolve({ id }) });
const URL_BASE = "http://papin.test";

export function reviewFlow(session: Session, site: ReviewSite) {
  const as = (userId: string | null) => (session.current = userId ? { user: { id: userId } } : null);

  async function upload(
    asUser: string,
    { bytes, instrumentId = site.calibratedId, name = "cycle.csv", extra = {} }: { bytes: Uint8Array; instrumentId?: string | null; name?: string; extra?: Record<string, string> },
  ) {
    const { POST } = await import("@/app/api/cycles/route");
    const form = new FormData();
    form.set("sterilizerId", site.sterilizerId);
    form.set("profileId", site.profileId);
    if (instrumentId) form.set("instrumentId", instrumentId);
    // Probes placed as a technician records them, so a passing cycle can be approved (sign-off refuses unplaced channels).
    if (!("mapping" in extra)) form.set("mapping", JSON.stringify({ positions: await placementsOf(bytes) }));
    for (const [k, v] of Object.entries(extra)) form.set(k, v);
    form.append("files", new Blob([bytes as BlobPart]), name);
    as(asUser);
    return POST(new Request(`${URL_BASE}/api/cycles`, { method: "POST", body: form }), undefined);
  }

  /** Registers a cycle and answers its id (the upload must succeed). */
  async function register(asUser: string, options: Parameters<typeof upload>[1]) {
    const res = await upload(asUser, options);
    if (res.status !== 201) throw new Error(`upload answered ${res.status}: ${await res.text()}`);
    return (await res.json()).id as string;
  }

  async function submit(id: string, asUser: string) {
    const { POST } = await import("@/app/api/cycles/[id]/submit/route");
    as(asUser);
    return POST(new Request(`${URL_BASE}/api/cycles/${id}/submit`, { method: "POST" }), params(id));
  }

  async function sign(id: string, asUser: string, body: Record<string, unknown>) {
    const { POST } = await import("@/app/api/cycles/[id]/signatures/route");
    as(asUser);
    const request = new Request(`${URL_BASE}/api/cycles/${id}/signatures`, {
      method: "POST",
      body: JSON.stringify({ password: REVIEW_PASSWORD, ...body }),
      headers: { "content-type": "application/json" },
    });
    return POST(request, params(id));
  }

  async function correct(
    id: string,
    asUser: string,
    fields: {
      file?: Uint8Array;
      fileName?: string;
      mapping?: unknown;
      positions?: unknown;
      reason?: string;
      duplicateReason?: string;
      profileId?: string;
      instrumentId?: string;
      loadType?: string;
      loadLot?: string;
    },
  ) {
    const { POST } = await import("@/app/api/cycles/[id]/analyses/route");
    const form = new FormData();
    if (fields.file) form.append("file", new Blob([fields.file as BlobPart]), fields.fileName ?? "corrected.csv");
    if (fields.mapping) form.set("mapping", JSON.stringify(fields.mapping));
    if (fields.positions) form.set("positions", JSON.stringify(fields.positions));
    for (const key of ["reason", "duplicateReason", "profileId", "instrumentId", "loadType", "loadLot"] as const) if (fields[key] !== undefined) form.set(key, fields[key]!);
    as(asUser);
    return POST(new Request(`${URL_BASE}/api/cycles/${id}/analyses`, { method: "POST", body: form }), params(id));
  }

  async function detail(id: string) {
    const { GET } = await import("@/app/api/cycles/[id]/route");
    as(site.people.auditor);
    return (await GET(new Request(URL_BASE), params(id))).json();
  }

  async function reportText(id: string, dir: string) {
    const { execFileSync } = await import("node:child_process");
    const { writeFileSync } = await import("node:fs");
    const path = await import("node:path");
    const { GET } = await import("@/app/api/cycles/[id]/report/route");
    as(site.people.auditor);
    const res = await GET(new Request(URL_BASE), params(id));
    const file = path.join(dir, `${id}.pdf`);
    writeFileSync(file, new Uint8Array(await res.arrayBuffer()));
    return { archived: res.headers.get("x-papin-report") === "archived", text: execFileSync("pdftotext", [file, "-"], { encoding: "utf8" }).replace(/\s+/g, " ") };
  }

  return { as, upload, register, submit, sign, correct, detail, reportText };
}

// Issue 11, item 8: tampering by someone with write access to the database file. Each attack is
// made with direct SQL, dropping the append-only triggers first as such an attacker would, and
// undone afterwards so the next test starts from an intact record.
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { execFileSync, spawnSync } from "node:child_process";
import { existsSync, readFileSync, renameSync, writeFileSync } from "node:fs";
import path from "node:path";
import { asc, eq, gt, sql } from "drizzle-orm";
import { useTemporaryDatabase } from "../support/test-db";
import { placementsOf } from "../support/review-flow";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));

const PASSWORD = "a tamper-evidence password";
type Role = "technician" | "engineer" | "auditor";
let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const people = {} as Record<Role, { id: string; email: string; name: string }>;
let siteId = "";
let sterilizerId = "";
let profileId = "";
let instrumentId = "";
let approvedId = "";
let reportId = "";
let anchorFile = "";

const url = (p: string) => `http://papin.test${p}`;
const params = (id: string) => ({ params: Promise.resolve({ id }) });
const as = (role: Role) => (session.current = { user: { id: people[role].id } });

async function upload(seed = 21) {
  const { simulateCycle, toLoggerCsv } = await import("@/lib/simulator");
  const { POST } = await import("@/app/api/cycles/route");
  const sim = simulateCycle({ scenario: seed === 99 ? "air" : "pass", sterilizationTempC: 134.6, holdingTimeS: 210, seed, startedAt: new Date("2026-11-26T07:00:00Z") });
  const form = new FormData();
  form.set("sterilizerId", sterilizerId);
  form.set("profileId", profileId);
  form.set("instrumentId", instrumentId);
  // The probes placed as recorded at intake: a thermometric cycle is approved only with its positions.
  form.set("mapping", JSON.stringify({ positions: await placementsOf(toLoggerCsv(sim)) }));
  form.append("files", new Blob([toLoggerCsv(sim) as BlobPart]), `cycle-${seed}.csv`);
  as("technician");
  const res = await POST(new Request(url("/api/cycles"), { method: "POST", body: form }), undefined);
  expect(res.status).toBe(201);
  return (await res.json()).id as string;
}

async function submit(id: string) {
  const { POST } = await import("@/app/api/cycles/[id]/submit/route");
  as("technician");
  expect((await POST(new Request(url(`/api/cycles/${id}/submit`), { method: "POST" }), params(id))).status).toBe(200);
}

async function sign(id: string, body: Record<string, unknown>) {
  const { POST } = await import("@/app/api/cycles/[id]/signatures/route");
  as("engineer");
  const res = await POST(
    new Request(url(`/api/cycles/${id}/signatures`), { method: "POST", body: JSON.stringify({ password: PASSWORD, ...body }), headers: { "content-type": "application/json" } }),
    params(id),
  );
  expect(res.status).toBe(201);
}

async function detail(id: string) {
  const { GET } = await import("@/app/api/cycles/[id]/route");
  as("auditor");
  return (await GET(new Request(url(`/api/cycles/${id}`)), params(id))).json();
}

async function verify() {
  const { GET } = await import("@/app/api/audit/verify/route");
  as("auditor");
  const res = await GET(new Request(url("/api/audit/verify")), undefined);
  expect(res.status).toBe(200);
  return res.json();
}

async function downloadArchived() {
  const { GET } = await import("@/app/api/reports/[id]/route");
  as("auditor");
  return GET(new Request(url(`/api/reports/${reportId}`)), params(reportId));
}

async function cycleReport(id: string) {
  const { GET } = await import("@/app/api/cycles/[id]/report/route");
  as("auditor");
  return GET(new Request(url(`/api/cycles/${id}/report`)), params(id));
}

async function withoutTriggers(table: "audit_events" | "reports" | "signatures", change: () => Promise<void>) {
  const names = { audit_events: ["audit_events_no_update", "audit_events_no_delete"], reports: ["reports_no_update", "reports_no_delete"], signatures: [] }[table];
  const definitions = await ctx.db.all<{ sql: string }>(sql`select sql from sqlite_master where type = 'trigger' and tbl_name = ${table}`);
  for (const name of names) await ctx.db.run(sql.raw(`drop trigger ${name}`));
  try {
    await change();
  } finally {
    for (const d of definitions) await ctx.db.run(sql.raw(d.sql));
  }
}

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  anchorFile = path.join(ctx.dir, "ledger-anchors.jsonl");
  const { sites, users, sterilizers, acceptanceProfiles, instruments, calibrationCertificates } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const passwordHash = await hashPassword(PASSWORD);
  const [site] = await ctx.db.insert(sites).values({ name: "Harbour Lane Infirmary", code: "HLI" }).returning();
  siteId = site.id;
  for (const role of ["technician", "engineer", "auditor"] as const) {
    const email = `${role}@harbour-lane.example`;
    const [u] = await ctx.db
      .insert(users)
      .values({ email, name: `Harbour ${role}`, role, passwordHash, siteId })
      .returning();
    people[role] = { id: u.id, email, name: u.name };
  }
  profileId = (await ctx.db.insert(acceptanceProfiles).values({ siteId, name: "134 °C / 3 min", sterilizationTempC: 134, holdingTimeS: 180, basis: "en-285" }).returning())[0].id;
  sterilizerId = (await ctx.db.insert(sterilizers).values({ siteId, name: "Porous load 2", serialNumber: "HLI-0002", chamberVolumeL: 300 }).returning())[0].id;
  instrumentId = (await ctx.db.insert(instruments).values({ siteId, name: "Logger 12", serialNumber: "LG-12", channelCount: 12 }).returning())[0].id;
  await ctx.db.insert(calibrationCertificates).values({ instrumentId, certificateNumber: "CAL-2026-118", issuedBy: "Harbour metrology", calibratedOn: "2026-01-10", dueOn: "2027-01-10" });
  approvedId = await upload();
  await submit(approvedId);
  await sign(approvedId, { meaning: "approved" });
  reportId = (await detail(approvedId)).report.id;
}, 180_000);
afterAll(() => ctx.cleanup());

describe("the good path", () => {
  it("an approval appends the ledger head to the anchor file beside the database, and the verifier matches it", async () => {
    const { auditEvents } = await import("@/db/schema");
    const lines = readFileSync(anchorFile, "utf8").trim().split("\n");
    expect(lines.length).toBeGreaterThanOrEqual(1);
    const last = JSON.parse(lines.at(-1)!);
    const [newest] = await ctx.db
      .select()
      .from(auditEvents)
      .orderBy(sql`seq desc`)
      .limit(1);
    // Written right after the approval's transaction: the approval event is the head it records.
    expect(last).toMatchObject({ seq: newest.seq, hash: newest.hash, events: newest.seq });
    expect(newest.action).toBe("cycle.sign.approved");
    const result = await verify();
    expect(result).toMatchObject({ ok: true, anchors: { status: "match", anchors: lines.length } });
    expect(result.head).toMatchObject({ lastSeq: expect.any(Number), lastHash: expect.stringMatching(/^[0-9a-f]{64}$/) });
  });

  it("the archived report prints the ledger head at sign-off, which the ledger still holds", async () => {
    const res = await downloadArchived();
    expect(res.status).toBe(200);
    const file = path.join(ctx.dir, "approved.pdf");
    writeFileSync(file, new Uint8Array(await res.arrayBuffer()));
    const text = execFileSync("pdftotext", [file, "-"], { encoding: "utf8" }).replace(/\s+/g, " ");
    const printed = /Audit ledger at sign-off (\d+) events; the last is event (\d+), chain hash \(SHA-256\): ([0-9a-f]{64})/.exec(text);
    expect(printed).not.toBeNull();
    const [, events, seq, hash] = printed!;
    const { auditEvents } = await import("@/db/schema");
    const [row] = await ctx.db
      .select()
      .from(auditEvents)
      .where(eq(auditEvents.seq, Number(seq)));
    expect(row.hash).toBe(hash);
    expect(Number(events)).toBe(Number(seq));
    expect((await cycleReport(approvedId)).status).toBe(200);
  });

  it("the signature verifies, and its bundle is version 2 with the analysis hash", async () => {
    const d = await detail(approvedId);
    expect(d.signatures[0]).toMatchObject({ meaning: "approved", valid: true, problem: null });
    const { buildRecordBundle } = await import("@/lib/services/record-bundle");
    const bundle = await buildRecordBundle({ cycleId: approvedId, analysisId: d.analysisId });
    expect(bundle).toMatchObject({ bundleVersion: 2, analysis: { id: d.analysisId, sha256: expect.stringMatching(/^[0-9a-f]{64}$/) } });
  });

  it("npm run ledger:anchor -- --verify --mail verifies, appends the head and queues the ledger-head mail to the site's auditor", async () => {
    const before = readFileSync(anchorFile, "utf8").trim().split("\n").length;
    const run = spawnSync("npm", ["run", "--silent", "ledger:anchor", "--", "--verify", "--mail"], {
      cwd: process.cwd(),
      env: { ...process.env, DATABASE_URL: process.env.DATABASE_URL, RESEND_API_KEY: "", RESEND_BASE_URL: "" },
      encoding: "utf8",
    });
    expect(run.status, run.stderr).toBe(0);
    expect(run.stdout).toMatch(/Ledger verified: \d+ events, (1 anchor matches|\d+ anchors match)/);
    expect(run.stdout).toMatch(/Queued 1 ledger-head mail to auditors/);
    expect(readFileSync(anchorFile, "utf8").trim().split("\n")).toHaveLength(before + 1);
    const { mailOutbox } = await import("@/db/schema");
    const mails = await ctx.db.select().from(mailOutbox).where(eq(mailOutbox.siteId, siteId));
    const headMail = mails.find((m) => m.subject.startsWith("Daily audit-ledger head"));
    expect(headMail?.to).toEqual([people.auditor.email]);
    const anchored = JSON.parse(readFileSync(anchorFile, "utf8").trim().split("\n").at(-1)!);
    expect(headMail?.text).toContain(anchored.hash);
    expect((await verify()).ok).toBe(true);
  });

  it("without an anchor file the verifier says there is no outside anchor yet (a warning, not a pass of that part)", async () => {
    const aside = `${anchorFile}.aside`;
    renameSync(anchorFile, aside);
    try {
      const result = await verify();
      expect(result.ok).toBe(true);
      expect(result.anchors.status).toBe("none");
      expect(result.anchors.problem).toMatch(/^No outside anchor yet/);
    } finally {
      renameSync(aside, anchorFile);
    }
  });
});

describe("attacks with database access", () => {
  it("a ledger row rewritten with every later hash recomputed: the chain alone verifies, the anchors do not", async () => {
    const { auditEvents } = await import("@/db/schema");
    const { auditEventHash } = await import("@/db/ledger");
    const { verifyAuditChain } = await import("@/lib/services/audit");
    const firstAnchor = JSON.parse(readFileSync(anchorFile, "utf8").split("\n")[0]);
    const target = Math.max(1, firstAnchor.seq - 1);
    const original = await ctx.db
      .select()
      .from(auditEvents)
      .where(gt(auditEvents.seq, target - 1))
      .orderBy(asc(auditEvents.seq));
    await withoutTriggers("audit_events", async () => {
      let prevHash = original[0].prevHash;
      for (const row of original) {
        const { seq, hash: _hash, ...fields } = row;
        const rewritten = { ...fields, prevHash, reason: seq === target ? "nothing to see here" : fields.reason };
        const hash = auditEventHash(rewritten);
        await ctx.db.update(auditEvents).set({ reason: rewritten.reason, prevHash, hash }).where(eq(auditEvents.seq, seq));
        prevHash = hash;
      }
      try {
        expect((await verifyAuditChain()).ok).toBe(true);
        const result = await verify();
        expect(result.ok).toBe(false);
        expect(result.anchors).toMatchObject({ status: "mismatch", anchorLine: 1 });
        expect(result.problem).toMatch(new RegExp(`^The anchor of ${firstAnchor.at.replace(/[.]/g, "\\.")} \\(line 1\\) recorded event ${firstAnchor.seq} with hash .* the chain was rewritten\\.$`));
        expect(result.firstBrokenAt).toBe(firstAnchor.seq);
      } finally {
        for (const row of original) await ctx.db.update(auditEvents).set({ reason: row.reason, prevHash: row.prevHash, hash: row.hash }).where(eq(auditEvents.seq, row.seq));
      }
    });
    expect((await verify()).ok).toBe(true);
  });

  it("the last events deleted: the database holds fewer events than the last anchor", async () => {
    const { auditEvents } = await import("@/db/schema");
    const { anchorLedgerHead } = await import("@/lib/services/ledger-anchors");
    const { anchor } = await anchorLedgerHead();
    const tail = await ctx.db
      .select()
      .from(auditEvents)
      .where(gt(auditEvents.seq, anchor.seq - 3))
      .orderBy(asc(auditEvents.seq));
    expect(tail).toHaveLength(3);
    await withoutTriggers("audit_events", async () => {
      await ctx.db.delete(auditEvents).where(gt(auditEvents.seq, anchor.seq - 3));
      try {
        const result = await verify();
        expect(result.ok).toBe(false);
        expect(result.anchors.status).toBe("mismatch");
        expect(result.problem).toMatch(/^The database holds \d+ events \(the last is event \d+\), fewer than the anchor of .* recorded \(\d+, up to event \d+\): events were deleted\.$/);
      } finally {
        await ctx.db.insert(auditEvents).values(tail);
      }
    });
    expect((await verify()).ok).toBe(true);
  });

  it("an archived PDF altered with its sha256 column: every download is refused (409) and audited; the verify upload does not match", async () => {
    const { reports, auditEvents } = await import("@/db/schema");
    const { sha256Hex } = await import("@/lib/integrity");
    const [stored] = await ctx.db.select().from(reports).where(eq(reports.id, reportId));
    const altered = Buffer.from(stored.bytes);
    altered[Math.floor(altered.length / 2)] ^= 0x01;
    await withoutTriggers("reports", async () => {
      await ctx.db
        .update(reports)
        .set({ bytes: altered, sha256: sha256Hex(altered) })
        .where(eq(reports.id, reportId));
      try {
        for (const res of [await downloadArchived(), await cycleReport(approvedId)]) {
          expect(res.status).toBe(409);
          expect(res.headers.get("content-type")).toMatch(/json/);
          expect((await res.json()).error).toMatch(/does not match the SHA-256 the audit ledger recorded when it was archived \(event \d+\)\. The report is not served/);
        }
        const { POST } = await import("@/app/api/reports/verify/route");
        const form = new FormData();
        form.append("file", new Blob([new Uint8Array(altered)], { type: "application/pdf" }), "r.pdf");
        as("auditor");
        expect(await (await POST(new Request(url("/api/reports/verify"), { method: "POST", body: form }), undefined)).json()).toMatchObject({ match: false });
        // Bytes altered alone (the hash column left): refused for the stored hash.
        await ctx.db.update(reports).set({ sha256: stored.sha256 }).where(eq(reports.id, reportId));
        const res = await downloadArchived();
        expect(res.status).toBe(409);
        expect((await res.json()).error).toMatch(/no longer match the SHA-256 archived with them/);
      } finally {
        await ctx.db.update(reports).set({ bytes: stored.bytes, sha256: stored.sha256 }).where(eq(reports.id, reportId));
      }
    });
    const failures = await ctx.db.select().from(auditEvents).where(eq(auditEvents.action, "report.integrity-failed"));
    expect(failures.length).toBeGreaterThanOrEqual(3);
    expect(failures.every((e) => e.entityId === approvedId && e.siteId === siteId)).toBe(true);
    expect((await downloadArchived()).status).toBe(200);
  });

  it("current_analysis_id re-pointed at another analysis: the approval is shown invalid, saying so", async () => {
    const { cycles, analyses } = await import("@/db/schema");
    const otherId = await upload(22);
    const [other] = await ctx.db.select().from(analyses).where(eq(analyses.cycleId, otherId));
    const [cycle] = await ctx.db.select().from(cycles).where(eq(cycles.id, approvedId));
    await ctx.db.update(cycles).set({ currentAnalysisId: other.id }).where(eq(cycles.id, approvedId));
    try {
      const d = await detail(approvedId);
      expect(d.signatures[0]).toMatchObject({ valid: false, problem: "The record now points at another analysis than the one signed." });
    } finally {
      await ctx.db.update(cycles).set({ currentAnalysisId: cycle.currentAnalysisId }).where(eq(cycles.id, approvedId));
    }
    expect((await detail(approvedId)).signatures[0].valid).toBe(true);
  });

  it("a return followed by a correction is no re-pointing: that signature still verifies", async () => {
    const { SIGNATURE_MEANINGS } = await import("@/lib/domain");
    const returnMeaning = (SIGNATURE_MEANINGS as readonly string[]).includes("returned") ? "returned" : "rejected";
    const id = await upload(99);
    await submit(id);
    await sign(id, { meaning: returnMeaning, reason: "Air in the chamber: check the door seal and repeat." });
    const { simulateCycle, toLoggerCsv } = await import("@/lib/simulator");
    const { POST } = await import("@/app/api/cycles/[id]/analyses/route");
    const form = new FormData();
    form.append("file", new Blob([toLoggerCsv(simulateCycle({ scenario: "pass", sterilizationTempC: 134.6, holdingTimeS: 210, seed: 23 })) as BlobPart]), "repeat.csv");
    form.set("reason", "Repeated after the door seal was replaced.");
    as("technician");
    expect((await POST(new Request(url(`/api/cycles/${id}/analyses`), { method: "POST", body: form }), params(id))).status).toBe(201);
    const d = await detail(id);
    expect(d.signatures).toHaveLength(1);
    expect(d.signatures[0]).toMatchObject({ meaning: returnMeaning, valid: true });
  });

  it("a signature given before bundle version 2 (the version-1 recipe) still verifies", async () => {
    const { signatures, analyses } = await import("@/db/schema");
    const { getRecordBundleRows } = await import("@/db/queries/signature-bundle");
    const { canonicalJson, sha256Hex } = await import("@/lib/integrity");
    const [analysis] = await ctx.db.select().from(analyses).where(eq(analyses.cycleId, approvedId));
    const rows = (await getRecordBundleRows({ cycleId: approvedId, analysisId: analysis.id }))!;
    const { cycle } = rows;
    // Version 1 as it was written before this change (lib/services/record-bundle.ts at 905b01d).
    const v1 = {
      cycle: {
        id: cycle.id,
        siteId: cycle.siteId,
        sterilizerId: cycle.sterilizerId,
        profileId: cycle.profileId,
        instrumentId: cycle.instrumentId,
        cycleNumber: cycle.cycleNumber,
        testKind: cycle.testKind,
        loadDescription: cycle.loadDescription,
        startedAt: cycle.startedAt,
        supersedesId: cycle.supersedesId,
      },
      analysis: {
        id: analysis.id,
        engineVersion: analysis.engineVersion,
        inputHash: analysis.inputHash,
        verdict: analysis.verdict,
        limits: analysis.limits,
        resultSha256: sha256Hex(canonicalJson(analysis.result)),
      },
      files: rows.files.map((f) => ({ name: f.name, sha256: sha256Hex(new Uint8Array(f.bytes)) })),
    };
    const signed = {
      cycleId: approvedId,
      analysisId: analysis.id,
      userId: people.engineer.id,
      printedName: people.engineer.name,
      role: "engineer" as const,
      meaning: "reviewed" as const,
      reason: null,
      signedAt: "2026-11-26T09:00:00.000Z",
    };
    const legacyId = crypto.randomUUID();
    await ctx.db.insert(signatures).values({ id: legacyId, ...signed, bundleHash: sha256Hex(canonicalJson({ record: v1, signature: signed })) });
    const forged = crypto.randomUUID();
    await ctx.db.insert(signatures).values({ id: forged, ...signed, signedAt: "2026-11-26T09:00:01.000Z", bundleHash: sha256Hex(canonicalJson({ record: v1, signature: signed })) });
    const d = await detail(approvedId);
    expect(d.signatures.find((s: { id: string }) => s.id === legacyId)).toMatchObject({ valid: true });
    expect(d.signatures.find((s: { id: string }) => s.id === forged)).toMatchObject({ valid: false, problem: "The record has changed since this signature was given." });
  });
});

describe("the anchor file's own damage", () => {
  it("a line that is not an anchor fails the check, naming the line", async () => {
    const text = readFileSync(anchorFile, "utf8");
    writeFileSync(anchorFile, `${text}{"at":"yesterday"}\n`);
    try {
      const result = await verify();
      expect(result.ok).toBe(false);
      expect(result.problem).toMatch(/^Line \d+ of the anchor file is not a ledger anchor/);
    } finally {
      writeFileSync(anchorFile, text);
    }
    expect(existsSync(anchorFile)).toBe(true);
  });
});

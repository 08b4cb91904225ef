import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import Database from "libsql";
import { sql } from "drizzle-orm";
import { createHash, randomBytes } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { startHranaServer, type HranaServer } from "../support/hrana-server";
import { failureOf } from "../support/test-db";
import type { Database as PapinDatabase } from "@/db";

// Papin's own database code, unchanged, against a libSQL server URL (DATABASE_URL=http://…,
// DATABASE_AUTH_TOKEN) instead of the embedded file. The server is tests/support/hrana-server.ts:
// Hrana 2 over HTTP, the protocol @libsql/client speaks to a server, on a SQLite file of its own.

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));

const TOKEN = `papin-test-${randomBytes(12).toString("hex")}`;
const PLAIN_500 = "Something went wrong on the server. Nothing was changed; please try again.";

let server: HranaServer;
let dir = "";
let serverFile = "";
let db: PapinDatabase;
let demo: { loaded: boolean };
const people: Record<string, string> = {};
let sterilizerId = "";
let profileId = "";

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), "papin-libsql-server-"));
  serverFile = path.join(dir, "server.db");
  server = await startHranaServer({ file: serverFile, authToken: TOKEN });
  process.env.DATABASE_URL = server.url;
  process.env.DATABASE_AUTH_TOKEN = TOKEN;
  // On a server URL the anchor file defaults to ./data: keep the test's anchors out of the working copy.
  process.env.PAPIN_LEDGER_ANCHOR_FILE = path.join(dir, "ledger-anchors.jsonl");
  process.env.NEXTAUTH_SECRET ??= "test-secret-0123456789abcdef";

  const { getDb } = await import("@/db");
  const { migrateDatabase } = await import("@/db/migrate");
  db = getDb();
  await migrateDatabase(db);
  const { loadDemoSite } = await import("@/db/seed");
  demo = await loadDemoSite(db, { password: "a demo password" });

  const { users, sterilizers, acceptanceProfiles } = await import("@/db/schema");
  for (const u of await db.select().from(users)) people[u.role] = u.id;
  const [s] = await db.select().from(sterilizers).limit(1);
  sterilizerId = s.id;
  const profiles = await db.select().from(acceptanceProfiles);
  profileId = profiles.find((p) => p.sterilizationTempC === 134 && p.maxEquilibrationS === 15)!.id;
}, 300_000);

afterAll(async () => {
  await server?.close();
  delete process.env.PAPIN_LEDGER_ANCHOR_FILE;
  if (dir) rmSync(dir, { recursive: true, force: true });
});

const as = (role: string) => (session.current = { user: { id: people[role] } });

async function simulatedFile(scenario: "pass" | "air", seed: number) {
  const { simulateCycle, toLoggerCsv } = await import("@/lib/simulator");
  const sim = simulateCycle({ scenario, sterilizationTempC: 134.6, holdingTimeS: 210, seed, startedAt: new Date("2026-11-21T08:00:00Z") });
  return toLoggerCsv(sim, { delimiter: ",", timeFormat: "iso" });
}

function uploadRequest(fields: Record<string, string>, file: { name: string; bytes: Uint8Array }) {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  form.append("files", new Blob([file.bytes as BlobPart], { type: "text/csv" }), file.name);
  return new Request("http://papin.test/api/cycles", { method: "POST", body: form });
}

const count = async (table: string) => (await db.all<{ n: number }>(sql.raw(`select count(*) as n from ${table}`)))[0].n;

/** The server's file read directly, behind the protocol: what really landed there. */
function onServerFile<T>(query: string): T[] {
  const direct = new Database(serverFile, { readonly: true });
  try {
    return direct.prepare(query).all() as T[];
  } finally {
    direct.close();
  }
}

function causes(error: unknown): Array<Error & { code?: string }> {
  const out: Array<Error & { code?: string }> = [];
  for (let e = error; e instanceof Error; e = (e as Error & { cause?: unknown }).cause) out.push(e);
  return out;
}

async function pipeline(body: unknown, token = TOKEN, endpoint = "/v2/pipeline") {
  const response = await fetch(`${server.url}${endpoint}`, {
    method: "POST",
    headers: { "content-type": "application/json", authorization: `Bearer ${token}` },
    body: JSON.stringify(body),
  });
  return { status: response.status, body: await response.json() };
}

describe("Papin on a libSQL server URL", () => {
  it("points its database client at the server, and the server's file holds what was written", async () => {
    const { databaseUrl } = await import("@/db");
    expect(databaseUrl()).toBe(server.url);
    expect(databaseUrl()).toMatch(/^http:\/\/127\.0\.0\.1:\d+$/);
    const { GET } = await import("@/app/api/health/route");
    const health = await GET();
    expect(health.status).toBe(200);
    expect(await health.json()).toEqual({ ok: true, database: { kind: "libsql-server" } });
    // Every statement went over HTTP: pipelines were served, transactions were carried by batons.
    expect(server.stats.pipelines).toBeGreaterThan(100);
    expect(server.stats.streamsResumed).toBeGreaterThan(0);
    expect(server.stats.requests.store_sql).toBeGreaterThan(0);
    // the demo users (db/demo-users.ts: four roles, three engineers)
    expect(onServerFile<{ n: number }>("select count(*) as n from users")[0].n).toBe(6);
  });

  it("runs the real migrations: every table, both journal entries, and a second run changes nothing", async () => {
    const names = (await db.all<{ name: string }>(sql`select name from sqlite_master where type = 'table'`)).map((r) => r.name);
    for (const table of ["sites", "users", "sterilizers", "cycles", "logger_files", "analyses", "signatures", "audit_events", "reports", "mail_outbox"]) {
      expect(names).toContain(table);
    }
    const journal = JSON.parse(readFileSync(path.join(process.cwd(), "db/migrations/meta/_journal.json"), "utf8")) as { entries: unknown[] };
    expect(await count("__drizzle_migrations")).toBe(journal.entries.length);
    const triggers = (await db.all<{ name: string }>(sql`select name from sqlite_master where type = 'trigger' order by name`)).map((r) => r.name);
    expect(triggers).toEqual(expect.arrayContaining(["audit_events_no_delete", "audit_events_no_update", "reports_no_update", "signatures_no_update"]));
    // applyFilePragmas() is for files only: on a server, foreign keys are the server's default (on, as on sqld).
    expect(await failureOf(db.run(sql`insert into sterilizers (id, site_id, name, serial_number, chamber_volume_l) values ('s1', 'no-such-site', 'x', 'y', 10)`))).toMatch(/FOREIGN KEY/i);
    const { migrateDatabase } = await import("@/db/migrate");
    await expect(migrateDatabase(db)).resolves.toBeUndefined();
    expect(await count("__drizzle_migrations")).toBe(journal.entries.length);
  });

  it("loads the demo site through the server, signed cycles and archived PDF reports included", async () => {
    expect(demo.loaded).toBe(true);
    expect(await count("sites")).toBe(1);
    expect(await count("cycles")).toBeGreaterThan(20);
    expect(await count("analyses")).toBe(await count("cycles"));
    expect(await count("signatures")).toBeGreaterThan(0);
    // A PDF is a blob: it crossed the wire as base64 both ways and still hashes to what was stored.
    const { reports } = await import("@/db/schema");
    const archived = await db.select().from(reports);
    expect(archived.length).toBeGreaterThan(0);
    for (const r of archived) {
      expect(Buffer.from(r.bytes).subarray(0, 5).toString("latin1")).toBe("%PDF-");
      expect(r.bytes.byteLength).toBe(r.sizeBytes);
      expect(createHash("sha256").update(r.bytes).digest("hex")).toBe(r.sha256);
    }
  });

  const uploaded: { id: string; bytes: Uint8Array } = { id: "", bytes: new Uint8Array() };

  it("stores an upload (POST /api/cycles) with the hash of its bytes, and reads it back", async () => {
    const { POST } = await import("@/app/api/cycles/route");
    as("technician");
    uploaded.bytes = await simulatedFile("pass", 4242);
    const response = await POST(uploadRequest({ sterilizerId, profileId, cycleNumber: "REMOTE-0001", load: "test pack" }, { name: "remote.csv", bytes: uploaded.bytes }), undefined);
    expect(response.status).toBe(201);
    const body = await response.json();
    expect(body.status).toBe("draft");
    expect(body.analysis.verdict).toBe("pass");
    uploaded.id = body.id;

    const { GET } = await import("@/app/api/cycles/[id]/route");
    const detail = await (await GET(new Request("http://papin.test"), { params: Promise.resolve({ id: uploaded.id }) })).json();
    expect(detail.files[0].sha256).toBe(createHash("sha256").update(uploaded.bytes).digest("hex"));
    expect(detail.files[0].size).toBe(uploaded.bytes.byteLength);
    const [stored] = onServerFile<{ bytes: ArrayBuffer }>(`select bytes from logger_files where cycle_id = '${uploaded.id}'`);
    expect(Buffer.compare(Buffer.from(stored.bytes), Buffer.from(uploaded.bytes))).toBe(0);
  });

  it("lists it (GET /api/cycles) by its number", async () => {
    const { GET } = await import("@/app/api/cycles/route");
    as("engineer");
    const found = await (await GET(new Request("http://papin.test/api/cycles?q=REMOTE-0001"), undefined)).json();
    expect(found.total).toBe(1);
    expect(found.items[0].id).toBe(uploaded.id);
    expect(found.items[0].cycleNumber).toBe("REMOTE-0001");
    const all = await (await GET(new Request("http://papin.test/api/cycles?pageSize=5&page=2&sort=cycleNumber:asc"), undefined)).json();
    expect(all.items).toHaveLength(5);
    expect(all.total).toBe(await count("cycles"));
  });

  it("reads its series (GET /api/cycles/[id]/series), downsampled and zoomed", async () => {
    const { GET } = await import("@/app/api/cycles/[id]/series/route");
    as("auditor");
    const id = uploaded.id;
    const res = await GET(new Request(`http://papin.test/api/cycles/${id}/series?points=200`), { params: Promise.resolve({ id }) });
    expect(res.status).toBe(200);
    const series = await res.json();
    expect(series.timesS.length).toBeGreaterThan(10);
    expect(series.timesS.length).toBeLessThanOrEqual(200);
    const kinds = series.channels.map((c: { kind: string }) => c.kind);
    expect(kinds).toContain("pressure");
    expect(kinds).toContain("saturation");
    const zoom = await (await GET(new Request(`http://papin.test/api/cycles/${id}/series?from=700&to=760&points=200`), { params: Promise.resolve({ id }) })).json();
    expect(zoom.fullResolution).toBe(true);
    expect(zoom.timesS[0]).toBeGreaterThanOrEqual(700);
    expect(zoom.timesS.at(-1)).toBeLessThanOrEqual(760);
  });

  it("takes two uploads at the same moment: both are stored and the ledger stays one chain", async () => {
    const { POST } = await import("@/app/api/cycles/route");
    as("technician");
    const before = await count("audit_events");
    const files = await Promise.all([simulatedFile("pass", 51), simulatedFile("air", 52)]);
    const responses = await Promise.all(files.map((bytes, i) => POST(uploadRequest({ sterilizerId, profileId, cycleNumber: `REMOTE-PAR-${i}` }, { name: `par-${i}.csv`, bytes }), undefined)));
    expect(responses.map((r) => r.status)).toEqual([201, 201]);
    expect(await count("audit_events")).toBeGreaterThan(before);
    const links = onServerFile<{ n: number }>("select count(*) as n from audit_events a join audit_events b on a.prev_hash = b.prev_hash and a.seq < b.seq");
    expect(links[0].n).toBe(0); // no two events claim the same predecessor
  });

  it("verifies the audit chain (GET /api/audit/verify) over every event, the uploads' included", async () => {
    const { GET } = await import("@/app/api/audit/verify/route");
    as("auditor");
    const res = await GET(new Request("http://papin.test/api/audit/verify"), undefined);
    expect(res.status).toBe(200);
    const state = await res.json();
    expect(state.ok).toBe(true);
    expect(state.events).toBe(await count("audit_events"));
    const mine = await db.all<{ n: number }>(sql`select count(*) as n from audit_events where entity_id = ${uploaded.id}`);
    expect(mine[0].n).toBeGreaterThan(0);
  });

  it("keeps the ledger append-only: its triggers refuse UPDATE and DELETE over the server", async () => {
    const update = await failureOf(db.run(sql`update audit_events set reason = 'rewritten' where seq = 1`));
    expect(update).toMatch(/audit events are append-only/);
    expect(update).toMatch(/SQLITE_CONSTRAINT/);
    expect(await failureOf(db.run(sql`delete from audit_events where seq = 1`))).toMatch(/append-only/);
    expect(await failureOf(db.run(sql`update signatures set meaning = 'approved'`))).toMatch(/signatures cannot be changed/);
    expect(onServerFile<{ reason: string | null }>("select reason from audit_events where seq = 1")[0].reason).not.toBe("rewritten");
  });

  it("rolls back a transaction that fails half-way, though its statements went over several HTTP requests", async () => {
    const { appendAuditEvent } = await import("@/db/ledger");
    const before = await count("audit_events");
    const resumedBefore = server.stats.streamsResumed;
    await expect(
      db.transaction(async (tx) => {
        await appendAuditEvent(tx, { action: "test.doomed", entityType: "test", entityId: "doomed" });
        await appendAuditEvent(tx, { action: "test.doomed", entityType: "test", entityId: "doomed" });
        throw new Error("changed my mind");
      }),
    ).rejects.toThrow("changed my mind");
    expect(server.stats.streamsResumed).toBeGreaterThan(resumedBefore);
    expect(await count("audit_events")).toBe(before);
  });

  it("answers a corrupt upload with 422 and leaves nothing behind on the server", async () => {
    const { POST } = await import("@/app/api/cycles/route");
    as("technician");
    const before = [await count("cycles"), await count("logger_files")];
    const garbage = new Uint8Array(4096).map((_, i) => (i * 7919) % 256);
    const res = await POST(uploadRequest({ sterilizerId, profileId }, { name: "broken.csv", bytes: garbage }), undefined);
    expect(res.status).toBe(422);
    expect((await res.json()).error).toMatch(/broken\.csv/);
    expect([await count("cycles"), await count("logger_files")]).toEqual(before);
  });

  it("asked the server for nothing it does not implement, lost no stream to expiry and left none open", async () => {
    expect(server.stats.rejected).toEqual([]);
    expect(server.stats.expiredStreams).toBe(0);
    // sqld drops a stream after 10 s without a request, so a transaction must not idle that long.
    expect(server.stats.longestIdleInTransactionMs).toBeLessThan(10_000);
    await vi.waitFor(() => expect(server.openStreams()).toBe(0));
  });
});

describe("a token the server does not accept", () => {
  it("is refused with HTTP 401, as is a request without one", async () => {
    expect((await pipeline({ baton: null, requests: [{ type: "close" }] }, "not-the-token")).status).toBe(401);
    const anonymous = await fetch(`${server.url}/v2/pipeline`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ requests: [] }) });
    expect(anonymous.status).toBe(401);
    const { openClient } = await import("@/db");
    const wrong = openClient(server.url, "not-the-token");
    await expect(wrong.execute("select 1")).rejects.toMatchObject({ code: "SERVER_ERROR", message: expect.stringMatching(/401/) });
    wrong.close();
  });

  it("makes the app answer with a plain sentence, not a stack trace, and recover once the token is right again", async () => {
    const { GET: list } = await import("@/app/api/cycles/route");
    const { GET: health } = await import("@/app/api/health/route");
    const logged = vi.spyOn(console, "error").mockImplementation(() => undefined);
    const refusedBefore = server.stats.refusedAuth;
    server.setAuthToken(`rotated-${randomBytes(8).toString("hex")}`);
    try {
      as("engineer");
      const res = await list(new Request("http://papin.test/api/cycles"), undefined);
      expect(res.status).toBe(500);
      const text = await res.text();
      expect(JSON.parse(text)).toEqual({ error: PLAIN_500 });
      expect(text).not.toMatch(/401|libsql|hrana|at .*\.(ts|js)/i);
      // …and what the operator's log shows is the refused token, not something else.
      expect(logged).toHaveBeenCalledTimes(1);
      const [label, error] = logged.mock.calls[0];
      expect(label).toMatch(/unexpected error/);
      expect(causes(error)).toContainEqual(expect.objectContaining({ code: "SERVER_ERROR", message: expect.stringMatching(/HTTP status 401/) }));
      const down = await health();
      expect(down.status).toBe(503);
      expect(await down.json()).toEqual({ ok: false, error: "The database does not answer." });
      expect(server.stats.refusedAuth).toBeGreaterThan(refusedBefore);
    } finally {
      server.setAuthToken(TOKEN);
      logged.mockRestore();
    }
    expect((await health()).status).toBe(200);
    expect((await list(new Request("http://papin.test/api/cycles?q=REMOTE-0001"), undefined)).status).toBe(200);
  });
});

describe("the test server keeps to the protocol and says so when it cannot", () => {
  it("carries values as Hrana 2 JSON: integers as strings (all 64 bits), floats as numbers, blobs as base64, nulls", async () => {
    const args = [
      { type: "integer", value: "9223372036854775807" },
      { type: "float", value: 0.1 },
      { type: "text", value: "Marlow Bridge — ünïcode" },
      { type: "blob", base64: Buffer.from([0, 1, 254, 255]).toString("base64") },
      { type: "null" },
    ];
    const { status, body } = await pipeline({ baton: null, requests: [{ type: "execute", stmt: { sql: "select ?, ?, ?, ?, ?, typeof(?1) as t", args, want_rows: true } }, { type: "close" }] });
    expect(status).toBe(200);
    expect(body.baton).toBeNull();
    const result = body.results[0].response.result;
    expect(result.rows[0].slice(0, 5)).toEqual([args[0], args[1], args[2], { type: "blob", base64: "AAH+/w" }, { type: "null" }]);
    expect(result.rows[0][5]).toEqual({ type: "text", value: "integer" });
    expect(result.cols.map((c: { name: string }) => c.name).at(-1)).toBe("t");
    expect(body.results[1]).toEqual({ type: "ok", response: { type: "close" } });
  });

  it("evaluates batch conditions: a failed step skips what depends on its success and runs what waits for its failure", async () => {
    const steps = [
      { stmt: { sql: "select 1" } },
      { stmt: { sql: "select * from no_such_table" } },
      { condition: { type: "ok", step: 1 }, stmt: { sql: "select 2" } },
      { condition: { type: "error", step: 1 }, stmt: { sql: "select 3" } },
      {
        condition: {
          type: "and",
          conds: [
            { type: "ok", step: 0 },
            { type: "not", cond: { type: "ok", step: 2 } },
          ],
        },
        stmt: { sql: "select 4" },
      },
      {
        condition: {
          type: "or",
          conds: [
            { type: "ok", step: 2 },
            { type: "ok", step: 1 },
          ],
        },
        stmt: { sql: "select 5" },
      },
    ];
    const { status, body } = await pipeline({ requests: [{ type: "batch", batch: { steps } }, { type: "close" }] });
    expect(status).toBe(200);
    const { step_results, step_errors } = body.results[0].response.result;
    expect(step_results.map((r: { rows: unknown[][] } | null) => r && r.rows[0][0])).toEqual([
      { type: "integer", value: "1" },
      null,
      null,
      { type: "integer", value: "3" },
      { type: "integer", value: "4" },
      null,
    ]);
    expect(step_errors.map((e: { code: string } | null) => e && e.code)).toEqual([null, "SQLITE_ERROR", null, null, null, null]);
    expect(step_errors[1].message).toMatch(/no such table: no_such_table/);
  });

  it("keeps one connection per stream: a transaction opened in one request is still open in the next, and a baton is good once", async () => {
    const first = await pipeline({
      requests: [
        { type: "execute", stmt: { sql: "BEGIN IMMEDIATE" } },
        { type: "store_sql", sql_id: 1, sql: "select count(*) from sites" },
      ],
    });
    expect(first.status).toBe(200);
    expect(typeof first.body.baton).toBe("string");
    const second = await pipeline({
      baton: first.body.baton,
      requests: [
        { type: "execute", stmt: { sql_id: 1 } },
        { type: "execute", stmt: { sql: "BEGIN" } },
      ],
    });
    expect(second.body.results[0].response.result.rows).toEqual([[{ type: "integer", value: "1" }]]);
    // BEGIN inside BEGIN fails: the first BEGIN is still open on this stream's connection.
    expect(second.body.results[1]).toMatchObject({ type: "error", error: { code: "SQLITE_ERROR", message: expect.stringMatching(/within a transaction/) } });
    const replay = await pipeline({ baton: first.body.baton, requests: [{ type: "close" }] });
    expect(replay).toMatchObject({ status: 400, body: { code: "BATON_REUSED" } });
    const done = await pipeline({ baton: second.body.baton, requests: [{ type: "execute", stmt: { sql: "ROLLBACK" } }, { type: "close" }] });
    expect(done.status).toBe(200);
    expect(done.body.baton).toBeNull();
    const afterClose = await pipeline({ baton: second.body.baton, requests: [{ type: "close" }] });
    expect(afterClose.status).toBe(400);
  });

  it("refuses two statements in one execute, and an empty one, as sqld does", async () => {
    const { body } = await pipeline({ requests: [{ type: "execute", stmt: { sql: "select 1; select 2" } }, { type: "execute", stmt: { sql: " -- nothing\n" } }, { type: "close" }] });
    expect(body.results[0]).toMatchObject({ type: "error", error: { code: "SQL_MANY_STATEMENTS" } });
    expect(body.results[1]).toMatchObject({ type: "error", error: { code: "SQL_NO_STATEMENT" } });
  });

  it("answers HTTP 400 with a Hrana error for what it does not implement or cannot understand", async () => {
    const cases: Array<[unknown, string, string?]> = [
      [{ requests: [{ type: "describe", sql: "select 1" }] }, "NOT_IMPLEMENTED"],
      [{ requests: [{ type: "get_autocommit" }] }, "NOT_IMPLEMENTED"],
      [{ requests: [{ type: "batch", batch: { steps: [{ condition: { type: "is_autocommit" }, stmt: { sql: "select 1" } }] } }] }, "NOT_IMPLEMENTED"],
      [{ requests: [{ type: "frobnicate" }] }, "PROTOCOL_ERROR"],
      [{ requests: [{ type: "execute", stmt: { sql: "select ?", args: [{ type: "integer", value: 1 }] } }] }, "PROTOCOL_ERROR"],
      [{ requests: [{ type: "execute", stmt: { sql_id: 99 } }] }, "PROTOCOL_ERROR"],
      [{ baton: "forged", requests: [] }, "BATON_INVALID"],
      [{ requests: [] }, "NOT_IMPLEMENTED", "/v3/pipeline"],
      [{ batch: { steps: [] } }, "NOT_IMPLEMENTED", "/v3/cursor"],
    ];
    for (const [body, code, endpoint] of cases) {
      const res = await pipeline(body, TOKEN, endpoint);
      expect({ body, status: res.status, code: res.body.code }).toEqual({ body, status: 400, code });
      expect(typeof res.body.message).toBe("string");
    }
    await vi.waitFor(() => expect(server.openStreams()).toBe(0));
  });

  it("makes a writer wait for another stream's write lock, then gives up with SQLITE_BUSY, and the waiting stream stays usable", async () => {
    const quick = await startHranaServer({ file: path.join(dir, "busy.db"), authToken: TOKEN, busyTimeoutMs: 300 });
    const call = async (body: unknown) => {
      const r = await fetch(`${quick.url}/v2/pipeline`, { method: "POST", headers: { authorization: `Bearer ${TOKEN}` }, body: JSON.stringify(body) });
      return r.json();
    };
    const exec = (sql: string) => ({ type: "execute", stmt: { sql } });
    try {
      await call({ requests: [exec("create table t (x)"), { type: "close" }] });
      // A holds the write lock; B waits, A commits within the wait, B gets the lock.
      const a = await call({ requests: [exec("BEGIN IMMEDIATE")] });
      const waiting = call({ requests: [exec("BEGIN IMMEDIATE"), exec("insert into t values (1)")] });
      await new Promise((r) => setTimeout(r, 100));
      await call({ baton: a.baton, requests: [exec("COMMIT"), { type: "close" }] });
      const b = await waiting;
      expect(b.results.map((r: { type: string }) => r.type)).toEqual(["ok", "ok"]);
      expect(quick.stats.busyRetries).toBeGreaterThan(0);
      // The statement that waited was released: B's COMMIT is not blocked by it.
      expect((await call({ baton: b.baton, requests: [exec("COMMIT"), { type: "close" }] })).results[0].type).toBe("ok");

      // A holds the lock past B's patience: B hears SQLITE_BUSY, and can go on once A is done.
      const a2 = await call({ requests: [exec("BEGIN IMMEDIATE")] });
      const b2 = await call({ requests: [exec("BEGIN IMMEDIATE")] });
      expect(b2.results[0]).toMatchObject({ type: "error", error: { code: "SQLITE_BUSY" } });
      expect(quick.stats.busyGiveUps).toBe(1);
      await call({ baton: a2.baton, requests: [exec("COMMIT"), { type: "close" }] });
      const again = await call({ baton: b2.baton, requests: [exec("BEGIN IMMEDIATE"), exec("insert into t values (2)"), exec("COMMIT"), exec("select count(*) from t"), { type: "close" }] });
      expect(again.results.map((r: { type: string }) => r.type)).toEqual(["ok", "ok", "ok", "ok", "ok"]);
      expect(again.results[3].response.result.rows).toEqual([[{ type: "integer", value: "2" }]]);
    } finally {
      await quick.close();
    }
  });

  it("expires a stream left without a request, rolling back its transaction", async () => {
    const quick = await startHranaServer({ file: path.join(dir, "expiry.db"), authToken: TOKEN, streamExpiryMs: 200 });
    try {
      const call = async (body: unknown) => {
        const r = await fetch(`${quick.url}/v2/pipeline`, { method: "POST", headers: { authorization: `Bearer ${TOKEN}` }, body: JSON.stringify(body) });
        return r.json();
      };
      await call({ requests: [{ type: "execute", stmt: { sql: "create table t (x)" } }, { type: "close" }] });
      const open = await call({
        requests: [
          { type: "execute", stmt: { sql: "BEGIN" } },
          { type: "execute", stmt: { sql: "insert into t values (1)" } },
        ],
      });
      await vi.waitFor(() => expect(quick.stats.expiredStreams).toBe(1), { timeout: 3_000 });
      expect(await call({ baton: open.baton, requests: [{ type: "execute", stmt: { sql: "COMMIT" } }] })).toMatchObject({ code: "STREAM_EXPIRED" });
      const rows = await call({ requests: [{ type: "execute", stmt: { sql: "select count(*) from t" } }, { type: "close" }] });
      expect(rows.results[0].response.result.rows).toEqual([[{ type: "integer", value: "0" }]]);
    } finally {
      await quick.close();
    }
  });
});

import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { useTemporaryDatabase } from "../support/test-db";

// Issue 11: bounded intake (413 while streaming, 422 for an oversize line) and an idempotent POST /api/cycles.
const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const people: Record<string, string> = {};
let sterilizerId = "";
let profileId = "";
let csv: Uint8Array;

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { loadDemoSite } = await import("@/db/seed");
  await loadDemoSite(ctx.db, { password: "a demo password" });
  const { users, sterilizers, acceptanceProfiles } = await import("@/db/schema");
  for (const u of await ctx.db.select().from(users)) people[u.role] = u.id;
  const [s] = await ctx.db.select().from(sterilizers).limit(1);
  sterilizerId = s.id;
  profileId = (await ctx.db.select().from(acceptanceProfiles)).find((p) => p.sterilizationTempC === 134)!.id;
  const { simulateCycle, toLoggerCsv } = await import("@/lib/simulator");
  csv = toLoggerCsv(simulateCycle({ scenario: "pass", sterilizationTempC: 134.6, holdingTimeS: 210, seed: 11, startedAt: new Date("2026-11-21T08:00:00Z") }), {});
  session.current = { user: { id: people.technician } };
}, 180_000);
afterAll(() => ctx.cleanup());

const BOUNDARY = "papin-bounded-intake";
const encoder = new TextEncoder();

function uploadForm(fields: Record<string, string>, files: Array<{ name: string; bytes: Uint8Array }>, field = "files") {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  for (const f of files) form.append(field, new Blob([f.bytes as BlobPart], { type: "text/csv" }), f.name);
  return form;
}

const post = (body: BodyInit, headers: Record<string, string> = {}) => new Request("http://papin.test/api/cycles", { method: "POST", body, headers, duplex: "half" } as RequestInit);

async function cyclesNumbered(cycleNumber: string) {
  const { cycles } = await import("@/db/schema");
  const { eq } = await import("drizzle-orm");
  return ctx.db.select().from(cycles).where(eq(cycles.cycleNumber, cycleNumber));
}

describe("bounded intake through the route handlers", () => {
  it("cuts an endless chunked upload off with 413 and stops reading it", async () => {
    const { POST } = await import("@/app/api/cycles/route");
    let pulls = 0;
    const junk = encoder.encode("1,".repeat(32 * 1024));
    const body = new ReadableStream<Uint8Array>({
      start: (c) => c.enqueue(encoder.encode(`--${BOUNDARY}\r\nContent-Disposition: form-data; name="files"; filename="endless.csv"\r\n\r\n`)),
      pull: (c) => {
        pulls++;
        c.enqueue(junk);
      },
    });
    const response = await POST(post(body, { "content-type": `multipart/form-data; boundary=${BOUNDARY}` }), undefined);
    expect(response.status).toBe(413);
    // The default limit is 50 MB per file (README, configuration): 800 chunks of 64 KiB, then a little read-ahead.
    expect((await response.json()).error).toBe("endless.csv is larger than 50 MB, the limit per file.");
    const pullsAtAnswer = pulls;
    expect(pullsAtAnswer).toBeLessThan(820);
    await new Promise((r) => setTimeout(r, 50));
    expect(pulls).toBe(pullsAtAnswer);
  });

  it("refuses an eleventh file with 413 naming the field (PAPIN_UPLOAD_MAX_FILES defaults to 10)", async () => {
    const { POST } = await import("@/app/api/cycles/route");
    const files = Array.from({ length: 11 }, (_, n) => ({ name: `part-${n}.csv`, bytes: csv }));
    const response = await POST(post(uploadForm({ sterilizerId, profileId, cycleNumber: "BI-many" }, files)), undefined);
    expect(response.status).toBe(413);
    expect(await response.json()).toEqual({ error: "Attach at most 10 files at once.", field: "files" });
    expect(await cyclesNumbered("BI-many")).toHaveLength(0);
  });

  it("answers a logger file with a 2 MB line with 422 that names the line and the limit", async () => {
    const { POST } = await import("@/app/api/logger-files/inspect/route");
    const form = uploadForm({}, [{ name: "one-line.csv", bytes: encoder.encode("1,".repeat(1024 * 1024)) }], "file");
    const response = await POST(new Request("http://papin.test/api/logger-files/inspect", { method: "POST", body: form }), undefined);
    expect(response.status).toBe(422);
    expect((await response.json()).error).toBe("one-line.csv: Line 1 is 2,097,152 characters long; Papin reads lines of at most 1,048,576 characters (1 MB)");
  });
});

describe("POST /api/cycles with an Idempotency-Key", () => {
  // One simulated file serves every cycle here, so each upload says why (a file another cycle holds is refused without a reason).
  const fields = () => ({ sterilizerId, profileId, cycleNumber: "BI-idem-1", load: "test pack", duplicateReason: "test: one simulated file for several cycles" });

  it("replays the first answer to a retry with the same key and body, and leaves one cycle", async () => {
    const { POST } = await import("@/app/api/cycles/route");
    const first = await POST(post(uploadForm(fields(), [{ name: "run.csv", bytes: csv }]), { "idempotency-key": "retry-1" }), undefined);
    expect(first.status).toBe(201);
    const firstBody = await first.json();
    // A new FormData gets a new multipart boundary: the retry is the same upload all the same.
    const retry = await POST(post(uploadForm(fields(), [{ name: "run.csv", bytes: csv }]), { "idempotency-key": "retry-1" }), undefined);
    expect(retry.status).toBe(201);
    expect(retry.headers.get("idempotent-replayed")).toBe("true");
    expect(await retry.json()).toEqual(firstBody);
    const made = await cyclesNumbered("BI-idem-1");
    expect(made.map((c) => c.id)).toEqual([firstBody.id]);
  });

  it("refuses the same key with a different body with 422, and a malformed key with 400", async () => {
    const { POST } = await import("@/app/api/cycles/route");
    const other = await POST(post(uploadForm({ ...fields(), load: "another pack" }, [{ name: "run.csv", bytes: csv }]), { "idempotency-key": "retry-1" }), undefined);
    expect(other.status).toBe(422);
    expect((await other.json()).error).toBe("This Idempotency-Key was already used for a different upload; send a new key for a new cycle.");
    const tooLong = await POST(post(uploadForm(fields(), [{ name: "run.csv", bytes: csv }]), { "idempotency-key": "k".repeat(201) }), undefined);
    expect(tooLong.status).toBe(400);
    expect(await cyclesNumbered("BI-idem-1")).toHaveLength(1);
  });

  it("answers 409 while the first request with the key still runs, and runs afresh once that one is abandoned", async () => {
    const { POST } = await import("@/app/api/cycles/route");
    const { readMultipart } = await import("@/lib/uploads");
    const { idempotencyKeys } = await import("@/db/schema");
    const { and, eq } = await import("drizzle-orm");
    const body = () => uploadForm({ ...fields(), cycleNumber: "BI-idem-2" }, [{ name: "run.csv", bytes: csv }]);
    // The hash the first request would have stored: the same parser over the same upload.
    const requestHash = (await readMultipart(post(body()), { fileFields: ["files"] })).digest();
    const now = Date.now();
    await ctx.db.insert(idempotencyKeys).values({ userId: people.technician, key: "in-flight", requestHash, createdAt: new Date(now).toISOString(), expiresAt: new Date(now + 864e5).toISOString() });
    const busy = await POST(post(body(), { "idempotency-key": "in-flight" }), undefined);
    expect(busy.status).toBe(409);
    expect(await cyclesNumbered("BI-idem-2")).toHaveLength(0);

    // 20 minutes unanswered: that request died before committing (the answer is stored with the cycle), so a retry runs.
    const key = and(eq(idempotencyKeys.userId, people.technician), eq(idempotencyKeys.key, "in-flight"));
    await ctx.db
      .update(idempotencyKeys)
      .set({ createdAt: new Date(now - 20 * 60_000).toISOString() })
      .where(key);
    const retried = await POST(post(body(), { "idempotency-key": "in-flight" }), undefined);
    expect(retried.status).toBe(201);
    expect(await cyclesNumbered("BI-idem-2")).toHaveLength(1);
    const [stored] = await ctx.db.select().from(idempotencyKeys).where(key);
    expect(stored.responseStatus).toBe(201);
    expect(JSON.parse(stored.responseBody!).id).toBe((await retried.json()).id);
  });

  it("frees the key when the first request is refused, so the corrected retry creates the cycle", async () => {
    const { POST } = await import("@/app/api/cycles/route");
    const unknownProfile = "00000000-0000-4000-8000-000000000000";
    const refused = await POST(
      post(uploadForm({ ...fields(), profileId: unknownProfile, cycleNumber: "BI-idem-3" }, [{ name: "run.csv", bytes: csv }]), { "idempotency-key": "fix-then-retry" }),
      undefined,
    );
    expect(refused.status).toBe(404);
    const corrected = await POST(post(uploadForm({ ...fields(), cycleNumber: "BI-idem-3" }, [{ name: "run.csv", bytes: csv }]), { "idempotency-key": "fix-then-retry" }), undefined);
    expect(corrected.status).toBe(201);
    expect(await cyclesNumbered("BI-idem-3")).toHaveLength(1);
  });

  it("keeps keys per user: another engineer's same key is a new request", async () => {
    const { POST } = await import("@/app/api/cycles/route");
    session.current = { user: { id: people.engineer } };
    try {
      const response = await POST(post(uploadForm({ ...fields(), cycleNumber: "BI-idem-4" }, [{ name: "run.csv", bytes: csv }]), { "idempotency-key": "retry-1" }), undefined);
      expect(response.status).toBe(201);
      expect(await cyclesNumbered("BI-idem-4")).toHaveLength(1);
    } finally {
      session.current = { user: { id: people.technician } };
    }
  });
});

// The administrator's mail tools: GET /api/dev/mailbox and the outbox actions, each refused to
// every other role on the server (lib/auth/permissions.ts: "mail:read-outbox" → admin only).
import { createServer } from "node:http";
import type { AddressInfo } from "node:net";
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import { useTemporaryDatabase } from "../support/test-db";
import { deadMailServiceUrl, useFakeResend } from "../support/fake-resend";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({
  ...(await original<typeof import("next-auth")>()),
  getServerSession: async () => session.current,
}));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
let fake: Awaited<ReturnType<typeof useFakeResend>>;
const ids: Record<string, string> = {};
let siteId = "";
const ROLES = ["technician", "engineer", "auditor", "admin"] as const;

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { users, sites } = await import("@/db/schema");
  const [site] = await ctx.db.insert(sites).values({ name: "Marlow Bridge General Hospital — Sterile Services", code: "MBGH" }).returning();
  siteId = site.id;
  for (const role of ROLES) {
    const [u] = await ctx.db
      .insert(users)
      .values({ email: `${role}@marlow-bridge.example`, name: role, role, passwordHash: "x", siteId: site.id })
      .returning();
    ids[role] = u.id;
  }
});
afterAll(() => ctx.cleanup());
beforeEach(async () => {
  fake = await useFakeResend();
});
afterEach(() => fake.stop());

const as = (role: string | null) => {
  session.current = role ? { user: { id: ids[role] } } : null;
};

async function getMailbox(query = "") {
  const { GET } = await import("@/app/api/dev/mailbox/route");
  const res = await GET(new Request(`http://127.0.0.1/api/dev/mailbox${query}`), {});
  return { status: res.status, body: await res.json() };
}

function form(fields: Record<string, string> = {}) {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) f.set(k, v);
  return f;
}

async function queueOne(subject: string) {
  const { mailOutbox } = await import("@/db/schema");
  const [row] = await ctx.db
    .insert(mailOutbox)
    .values({ to: ["technician@marlow-bridge.example"], subject, html: "<p>x</p>", text: "x", siteId })
    .returning();
  return row.id;
}

describe("GET /api/dev/mailbox", () => {
  it("asks an anonymous caller to sign in (401)", async () => {
    as(null);
    expect(await getMailbox()).toMatchObject({ status: 401, body: { error: "Please sign in first." } });
  });

  it.each(["technician", "engineer", "auditor"])("refuses the %s (403) with a plain sentence", async (role) => {
    as(role);
    const { status, body } = await getMailbox();
    expect(status).toBe(403);
    expect(body.error).toMatch(/^Your role does not allow you to read the development mailbox\.$/);
  });

  it("gives the administrator the fake's messages, newest first", async () => {
    as("admin");
    const { Resend } = await import("resend");
    const client = new Resend("re_test_key", { baseUrl: fake.url });
    await client.emails.send({ from: "Papin <papin@papin.example>", to: "a@marlow-bridge.example", subject: "older", text: "1" });
    await client.emails.send({ from: "Papin <papin@papin.example>", to: "b@marlow-bridge.example", subject: "newer", text: "2" });
    const { status, body } = await getMailbox("?limit=10");
    expect(status).toBe(200);
    expect(body.baseUrl).toBe(fake.url);
    expect(body.messages.map((m: { subject: string }) => m.subject)).toEqual(["newer", "older"]);
  });

  it("says what is wrong with a bad limit (400, names the parameter)", async () => {
    as("admin");
    expect(await getMailbox("?limit=5000")).toMatchObject({ status: 400, body: { field: "limit" } });
  });

  it("is not there (404) when RESEND_BASE_URL is not the local fake, and never reads that server's mail", async () => {
    as("admin");
    const seen: string[] = [];
    const other = createServer((req, res) => {
      seen.push(req.url ?? "");
      res.writeHead(200, { "Content-Type": "application/json" });
      res.end('{"ok":true}');
    });
    await new Promise<void>((r) => other.listen(0, "127.0.0.1", r));
    process.env.RESEND_BASE_URL = `http://127.0.0.1:${(other.address() as AddressInfo).port}`;
    try {
      expect((await getMailbox()).status).toBe(404);
      expect(seen).toEqual(["/_health"]);
    } finally {
      await new Promise((r) => other.close(r));
    }
  });

  it("is not there (404) without RESEND_BASE_URL", async () => {
    as("admin");
    delete process.env.RESEND_BASE_URL;
    expect((await getMailbox()).status).toBe(404);
  });

  it("says the fake does not answer (503) and how to start it", async () => {
    as("admin");
    process.env.RESEND_BASE_URL = await deadMailServiceUrl();
    const { status, body } = await getMailbox();
    expect(status).toBe(503);
    expect(body.error).toMatch(/fake-resend-server\.ts --port 3025/);
  });
});

describe("outbox actions", () => {
  it.each(["technician", "engineer", "auditor"])("refuse the %s and change nothing", async (role) => {
    const { retryMailAction, sendDueMailAction } = await import("@/app/(portal)/admin/mail/actions");
    const { mailOutbox } = await import("@/db/schema");
    const id = await queueOne(`refused for ${role}`);
    as(role);
    expect(await retryMailAction({ status: "idle" }, form({ id }))).toMatchObject({ status: "error", message: expect.stringMatching(/Your role does not allow/) });
    expect(await sendDueMailAction({ status: "idle" }, form())).toMatchObject({ status: "error" });
    const [row] = await ctx.db.select().from(mailOutbox).where(eq(mailOutbox.id, id));
    expect(row).toMatchObject({ status: "pending", attempts: 0 });
    expect(fake.received()).toHaveLength(0);
  });

  it("let the administrator retry one e-mail now and report that it was sent", async () => {
    const { retryMailAction } = await import("@/app/(portal)/admin/mail/actions");
    const id = await queueOne("retry me");
    as("admin");
    expect(await retryMailAction({ status: "idle" }, form({ id }))).toEqual({ status: "ok", message: "Sent to technician@marlow-bridge.example." });
    expect(fake.received().map((m) => m.subject)).toEqual(["retry me"]);
  });

  it("report a retry that failed again as an error with the service's reason", async () => {
    const { retryMailAction } = await import("@/app/(portal)/admin/mail/actions");
    const id = await queueOne("still failing");
    fake.failNext(1);
    as("admin");
    const state = await retryMailAction({ status: "idle" }, form({ id }));
    expect(state.status).toBe("error");
    expect(state.message).toMatch(/Tried again without success: internal_server_error \(500\)/);
  });

  it("send what is due and count it", async () => {
    const { sendDueMailAction } = await import("@/app/(portal)/admin/mail/actions");
    await queueOne("due 1");
    await queueOne("due 2");
    as("admin");
    const state = await sendDueMailAction({ status: "idle" }, form());
    expect(state).toMatchObject({ status: "ok" });
    expect(state.message).toMatch(/sent/);
    expect(fake.received().length).toBeGreaterThanOrEqual(2);
  });

  it("say plainly when mail is not configured", async () => {
    const { sendDueMailAction } = await import("@/app/(portal)/admin/mail/actions");
    delete process.env.RESEND_BASE_URL;
    delete process.env.RESEND_API_KEY;
    as("admin");
    expect(await sendDueMailAction({ status: "idle" }, form())).toMatchObject({ status: "error", message: expect.stringMatching(/Mail is not configured/) });
  });
});

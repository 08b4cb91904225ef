// The fake mail service answers what the real Resend SDK (resend 6.38.0, node_modules/resend)
// sends: POST {baseUrl}/emails with "Authorization: Bearer <key>", a JSON body in Resend's field
// names (reply_to, scheduled_at), and an Idempotency-Key header. Error names and statuses follow
// Resend's published error list (missing_api_key 401, invalid_api_key 403,
// missing_required_field / validation_error 422, invalid_idempotent_request 409).
import { spawn } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { Resend } from "resend";
import { startFakeResend, type FakeResend } from "@/lib/mail/fake-resend-server";
import { deadMailServiceUrl } from "../support/fake-resend";

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;
const message = { from: "Papin <papin@papin.example>", subject: "Cycle 0412 is ready for review", html: "<p>Ready</p>", text: "Ready" };

let fake: FakeResend;
let resend: Resend;

beforeAll(async () => {
  fake = await startFakeResend({ quiet: true });
  resend = new Resend("re_test_key", { baseUrl: fake.url });
});
afterEach(() => fake.reset());
afterAll(() => fake.close());

describe("the fake receives real Resend SDK calls", () => {
  it("accepts a send with one recipient as a string and answers with a message id", async () => {
    const { data, error } = await resend.emails.send({ ...message, to: "engineer@marlow-bridge.example" });
    expect(error).toBeNull();
    expect(data?.id).toMatch(UUID);
    const [got] = fake.received();
    expect(got).toMatchObject({ id: data!.id, from: message.from, to: ["engineer@marlow-bridge.example"], subject: message.subject, html: "<p>Ready</p>", text: "Ready" });
  });

  it("keeps several recipients, reply-to, headers and tags as the SDK sends them", async () => {
    const { error } = await resend.emails.send({
      ...message,
      to: ["a.okafor@marlow-bridge.example", "Priya Nair <p.nair@marlow-bridge.example>"],
      replyTo: "sterile-services@marlow-bridge.example",
      headers: { "X-Entity-Ref-ID": "outbox-1" },
      tags: [{ name: "kind", value: "cycle_submitted" }],
    });
    expect(error).toBeNull();
    const [got] = fake.received();
    expect(got.to).toEqual(["a.okafor@marlow-bridge.example", "Priya Nair <p.nair@marlow-bridge.example>"]);
    expect(got.reply_to).toEqual(["sterile-services@marlow-bridge.example"]);
    expect(got.headers).toEqual({ "X-Entity-Ref-ID": "outbox-1" });
    expect(got.tags).toEqual([{ name: "kind", value: "cycle_submitted" }]);
  });

  it("is found through RESEND_BASE_URL when the client is constructed without a baseUrl", async () => {
    const saved = process.env.RESEND_BASE_URL;
    process.env.RESEND_BASE_URL = fake.url;
    try {
      const fromEnvironment = new Resend("re_test_key");
      const { data, error } = await fromEnvironment.emails.send({ ...message, to: "t.brooks@marlow-bridge.example" });
      expect(error).toBeNull();
      expect(fake.received().map((m) => m.id)).toEqual([data!.id]);
    } finally {
      if (saved === undefined) delete process.env.RESEND_BASE_URL;
      else process.env.RESEND_BASE_URL = saved;
    }
  });

  it("reads messages back, newest first, through the SDK's list and get", async () => {
    const first = await resend.emails.send({ ...message, subject: "first", to: "a@marlow-bridge.example" });
    const second = await resend.emails.send({ ...message, subject: "second", to: "b@marlow-bridge.example" });
    const list = await resend.emails.list();
    expect(list.error).toBeNull();
    expect(list.data?.data.map((m) => m.subject)).toEqual(["second", "first"]);
    const one = await resend.emails.get(first.data!.id);
    expect(one.data).toMatchObject({ id: first.data!.id, subject: "first", to: ["a@marlow-bridge.example"] });
    const missing = await resend.emails.get("00000000-0000-4000-8000-000000000000");
    expect(missing.error).toMatchObject({ statusCode: 404, name: "not_found" });
    expect(second.data?.id).not.toBe(first.data?.id);
  });

  it("pages the list with limit and after", async () => {
    for (const n of [1, 2, 3]) await resend.emails.send({ ...message, subject: `m${n}`, to: "a@marlow-bridge.example" });
    const page1 = await resend.emails.list({ limit: 2 });
    expect(page1.data?.data.map((m) => m.subject)).toEqual(["m3", "m2"]);
    expect(page1.data?.has_more).toBe(true);
    const page2 = await resend.emails.list({ limit: 2, after: page1.data!.data[1].id });
    expect(page2.data?.data.map((m) => m.subject)).toEqual(["m1"]);
    expect(page2.data?.has_more).toBe(false);
  });
});

describe("the fake refuses what Resend refuses", () => {
  it("answers 401 missing_api_key without a bearer key", async () => {
    const res = await fetch(`${fake.url}/emails`, { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify({ ...message, to: "a@b.example" }) });
    expect(res.status).toBe(401);
    expect(await res.json()).toMatchObject({ statusCode: 401, name: "missing_api_key" });
    expect(fake.received()).toHaveLength(0);
  });

  it("answers 403 invalid_api_key to a key it does not know, and the SDK passes that on", async () => {
    const strict = await startFakeResend({ quiet: true, apiKey: "re_the_right_key" });
    try {
      const { data, error } = await new Resend("re_a_wrong_key", { baseUrl: strict.url }).emails.send({ ...message, to: "a@b.example" });
      expect(data).toBeNull();
      expect(error).toMatchObject({ statusCode: 403, name: "invalid_api_key" });
      const ok = await new Resend("re_the_right_key", { baseUrl: strict.url }).emails.send({ ...message, to: "a@b.example" });
      expect(ok.error).toBeNull();
      expect(strict.received()).toHaveLength(1);
    } finally {
      await strict.close();
    }
  });

  it.each([
    ["to", "Missing `to` field."],
    ["subject", "Missing `subject` field."],
    ["from", "Missing `from` field."],
  ] as const)("answers 422 missing_required_field without `%s`", async (field, text) => {
    const body: Record<string, unknown> = { ...message, to: "a@b.example" };
    delete body[field];
    const { data, error } = await resend.emails.send(body as never);
    expect(data).toBeNull();
    expect(error).toMatchObject({ statusCode: 422, name: "missing_required_field", message: text });
    expect(fake.received()).toHaveLength(0);
  });

  it("answers 422 validation_error to an address that is not one", async () => {
    const { error } = await resend.emails.send({ ...message, to: "not-an-address" });
    expect(error).toMatchObject({ statusCode: 422, name: "validation_error" });
    expect(error?.message).toMatch(/`to`/);
  });

  it("answers 422 when neither html nor text is given", async () => {
    const res = await fetch(`${fake.url}/emails`, {
      method: "POST",
      headers: { Authorization: "Bearer re_test_key", "Content-Type": "application/json" },
      body: JSON.stringify({ from: message.from, to: "a@b.example", subject: "s" }),
    });
    expect(res.status).toBe(422);
  });

  it("answers 422 to a body that is not JSON", async () => {
    const res = await fetch(`${fake.url}/emails`, { method: "POST", headers: { Authorization: "Bearer re_test_key" }, body: "{not json" });
    expect(res.status).toBe(422);
    expect(await res.json()).toMatchObject({ name: "validation_error" });
  });
});

describe("idempotency keys", () => {
  it("return the first message's id for a repeated request and store it once", async () => {
    const body = { ...message, to: "a@marlow-bridge.example" };
    const a = await resend.emails.send(body, { idempotencyKey: "papin-outbox/1" });
    const b = await resend.emails.send(body, { idempotencyKey: "papin-outbox/1" });
    expect(b.data?.id).toBe(a.data?.id);
    expect(fake.received()).toHaveLength(1);
    expect(fake.received()[0].idempotency_key).toBe("papin-outbox/1");
  });

  it("refuse the same key with a different body (409 invalid_idempotent_request)", async () => {
    await resend.emails.send({ ...message, to: "a@marlow-bridge.example" }, { idempotencyKey: "k-2" });
    const { error } = await resend.emails.send({ ...message, to: "b@marlow-bridge.example" }, { idempotencyKey: "k-2" });
    expect(error).toMatchObject({ statusCode: 409, name: "invalid_idempotent_request" });
    expect(fake.received()).toHaveLength(1);
  });
});

describe("the failure switch", () => {
  it("fails the next sends it was told to, then accepts again", async () => {
    fake.failNext(2);
    const tries = [];
    for (let i = 0; i < 3; i++) tries.push(await resend.emails.send({ ...message, to: "a@marlow-bridge.example" }));
    expect(tries.map((t) => t.error?.statusCode ?? 200)).toEqual([500, 500, 200]);
    expect(fake.received()).toHaveLength(1);
  });

  it("can be set over HTTP with a status (POST /_fail?times=1&status=429) and cleared (DELETE /_fail)", async () => {
    expect((await fetch(`${fake.url}/_fail?times=1&status=429`, { method: "POST" })).status).toBe(200);
    const limited = await resend.emails.send({ ...message, to: "a@marlow-bridge.example" });
    expect(limited.error).toMatchObject({ statusCode: 429, name: "rate_limit_exceeded" });
    await fetch(`${fake.url}/_fail?times=5`, { method: "POST" });
    await fetch(`${fake.url}/_fail`, { method: "DELETE" });
    const ok = await resend.emails.send({ ...message, to: "a@marlow-bridge.example" });
    expect(ok.error).toBeNull();
  });

  it("refuses a nonsense switch with a plain message", async () => {
    const res = await fetch(`${fake.url}/_fail?times=-1`, { method: "POST" });
    expect(res.status).toBe(422);
    expect((await res.json()).message).toMatch(/times/);
  });
});

describe("the mailbox file", () => {
  it("gets one JSON line per accepted message and is read back after a restart", async () => {
    const dir = mkdtempSync(path.join(tmpdir(), "papin-mailbox-"));
    const file = path.join(dir, "nested", "fake-mailbox.jsonl");
    try {
      const first = await startFakeResend({ quiet: true, mailboxFile: file });
      const client = new Resend("re_test_key", { baseUrl: first.url });
      await client.emails.send({ ...message, subject: "one", to: "a@marlow-bridge.example" });
      await client.emails.send({ ...message, subject: "two", to: "b@marlow-bridge.example" });
      await first.close();
      const lines = readFileSync(file, "utf8")
        .trim()
        .split("\n")
        .map((l) => JSON.parse(l));
      expect(lines.map((l) => l.subject)).toEqual(["one", "two"]);

      const again = await startFakeResend({ quiet: true, mailboxFile: file });
      expect(again.received().map((m) => m.subject)).toEqual(["one", "two"]);
      again.reset();
      expect(readFileSync(file, "utf8")).toBe("");
      await again.close();
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe("when the mail service is down", () => {
  it("the SDK reports an application_error without a status and does not throw", async () => {
    const client = new Resend("re_test_key", { baseUrl: await deadMailServiceUrl() });
    const { data, error } = await client.emails.send({ ...message, to: "a@marlow-bridge.example" });
    expect(data).toBeNull();
    expect(error).toMatchObject({ name: "application_error", statusCode: null });
  });
});

describe("the runnable entry (tsx lib/mail/fake-resend-server.ts --port N)", () => {
  it("starts, identifies itself on GET /_health, accepts a send and stops on SIGTERM", async () => {
    const port = Number(new URL(await deadMailServiceUrl()).port);
    const dir = mkdtempSync(path.join(tmpdir(), "papin-fake-cli-"));
    const child = spawn(process.execPath, ["node_modules/tsx/dist/cli.mjs", "lib/mail/fake-resend-server.ts", "--port", String(port), "--mailbox", path.join(dir, "box.jsonl")], {
      stdio: "pipe",
    });
    try {
      const url = `http://127.0.0.1:${port}`;
      let health: Record<string, unknown> | undefined;
      for (let i = 0; i < 100 && !health; i++) {
        health = await fetch(`${url}/_health`).then(
          (r) => r.json(),
          () => undefined,
        );
        if (!health) await new Promise((r) => setTimeout(r, 100));
      }
      expect(health).toMatchObject({ ok: true, service: "papin-fake-resend" });
      const { error } = await new Resend("re_test_key", { baseUrl: url }).emails.send({ ...message, to: "a@marlow-bridge.example" });
      expect(error).toBeNull();
      expect(readFileSync(path.join(dir, "box.jsonl"), "utf8")).toContain("a@marlow-bridge.example");
      const exited = new Promise<number | null>((resolve) => child.once("exit", (code) => resolve(code)));
      child.kill("SIGTERM");
      expect(await exited).toBe(0);
    } finally {
      if (child.exitCode === null) child.kill("SIGKILL");
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

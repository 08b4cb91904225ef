import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import { eq } from "drizzle-orm";
import { NextRequest } from "next/server";
import { useTemporaryDatabase } from "../support/test-db";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const people: Record<string, string> = {};
let sterilizerId = "";
let profileId = "";
const savedUrl = process.env.NEXTAUTH_URL;

beforeAll(async () => {
  delete process.env.NEXTAUTH_URL;
  ctx = await useTemporaryDatabase();
  const { loadDemoSite } = await import("@/db/seed");
  await loadDemoSite(ctx.db, { password: "a demo password" });
  const { users, sterilizers, acceptanceProfiles } = await import("@/db/schema");
  for (const u of await ctx.db.select().from(users)) people[u.role] = u.id;
  sterilizerId = (await ctx.db.select().from(sterilizers).limit(1))[0].id;
  profileId = (await ctx.db.select().from(acceptanceProfiles)).find((p) => p.sterilizationTempC === 134 && p.maxEquilibrationS === 15)!.id;
}, 180_000);
afterAll(() => ctx.cleanup());
afterEach(() => {
  if (savedUrl === undefined) delete process.env.NEXTAUTH_URL;
  else process.env.NEXTAUTH_URL = savedUrl;
});

const as = (role: string) => (session.current = { user: { id: people[role] } });
const params = (id: string) => ({ params: Promise.resolve({ id }) });

// Each upload is a file of its own: a file another cycle of the site holds is refused without a reason.
let nextSeed = 11;

async function upload(headers: Record<string, string> = {}) {
  const { simulateCycle, toLoggerCsv } = await import("@/lib/simulator");
  const { POST } = await import("@/app/api/cycles/route");
  const sim = simulateCycle({ scenario: "pass", sterilizationTempC: 134.6, holdingTimeS: 210, seed: nextSeed++, startedAt: new Date("2026-11-26T07:00:00Z") });
  const form = new FormData();
  form.set("sterilizerId", sterilizerId);
  form.set("profileId", profileId);
  form.append("files", new Blob([toLoggerCsv(sim) as BlobPart]), "cycle.csv");
  as("technician");
  return POST(new Request("http://papin.test/api/cycles", { method: "POST", body: form, headers }), undefined);
}

async function submit(id: string, headers: Record<string, string>) {
  const { POST } = await import("@/app/api/cycles/[id]/submit/route");
  as("technician");
  return POST(new Request(`http://papin.test/api/cycles/${id}/submit`, { method: "POST", headers }), params(id));
}

async function statusOf(id: string) {
  const { cycles } = await import("@/db/schema");
  return (await ctx.db.select({ status: cycles.status }).from(cycles).where(eq(cycles.id, id)))[0]?.status;
}

async function submittedMailOf(id: string) {
  const { mailOutbox } = await import("@/db/schema");
  const mails = await ctx.db.select().from(mailOutbox).where(eq(mailOutbox.relatedCycleId, id));
  expect(mails).toHaveLength(1); // a passing cycle: only the mail to the reviewers
  return mails[0];
}

describe("route handlers that change something (through route())", () => {
  it("refuse a foreign Origin with 403 and a plain sentence before acting; the same origin goes through", async () => {
    const { FOREIGN_ORIGIN_REFUSAL } = await import("@/lib/request-origin");
    const { cycles } = await import("@/db/schema");
    const before = (await ctx.db.select().from(cycles)).length;
    const forged = await upload({ origin: "https://evil.example" });
    expect(forged.status).toBe(403);
    expect(await forged.json()).toEqual({ error: FOREIGN_ORIGIN_REFUSAL });
    expect((await ctx.db.select().from(cycles)).length).toBe(before);

    const created = await upload({ origin: "http://papin.test" });
    expect(created.status).toBe(201);
    const { id } = await created.json();

    const forgeries: Array<Record<string, string>> = [{ origin: "https://evil.example" }, { origin: "null" }, { "sec-fetch-site": "cross-site" }];
    for (const headers of forgeries) {
      const refused = await submit(id, headers);
      expect(refused.status).toBe(403);
      expect((await refused.json()).error).toBe(FOREIGN_ORIGIN_REFUSAL);
    }
    expect(await statusOf(id)).toBe("draft");

    const accepted = await submit(id, { origin: "http://papin.test", "sec-fetch-site": "same-origin" });
    expect(accepted.status).toBe(200);
    expect(await statusOf(id)).toBe("submitted");
  });

  it("with NEXTAUTH_URL, accept only its origin; mail links use it whatever Host and X-Forwarded-Host say", async () => {
    process.env.NEXTAUTH_URL = "https://papin.marlow-bridge.example";
    const { id } = await (await upload({ origin: "https://papin.marlow-bridge.example" })).json();
    const forgedHost = { host: "evil.example", "x-forwarded-host": "evil.example", "x-forwarded-proto": "https" };
    expect((await submit(id, { ...forgedHost, origin: "https://evil.example" })).status).toBe(403);
    expect((await submit(id, { ...forgedHost, origin: "https://papin.marlow-bridge.example" })).status).toBe(200);
    const mail = await submittedMailOf(id);
    expect(mail?.text).toContain(`https://papin.marlow-bridge.example/cycles/${id}`);
    expect(`${mail?.text}${mail?.html}`).not.toContain("evil.example");
  });

  it("without NEXTAUTH_URL (development), mail links point at this machine, never at X-Forwarded-Host", async () => {
    delete process.env.NEXTAUTH_URL;
    const { id } = await (await upload()).json();
    expect((await submit(id, { "x-forwarded-host": "evil.example", "x-forwarded-proto": "https" })).status).toBe(200);
    const mail = await submittedMailOf(id);
    expect(mail?.text).toContain(`http://localhost:3000/cycles/${id}`);
    expect(`${mail?.text}${mail?.html}`).not.toContain("evil.example");
  });
});

describe("server actions and page posts (through proxy.ts)", () => {
  const action = (origin: string, path = "/sign-in") =>
    new NextRequest(`http://papin.test${path}`, { method: "POST", headers: { origin, "next-action": "7f3a", "content-type": "text/plain;charset=UTF-8" } });

  it("answer a foreign origin with 403 and a plain sentence; Next would throw (500)", async () => {
    const { proxy } = await import("@/proxy");
    const { FOREIGN_ORIGIN_REFUSAL } = await import("@/lib/request-origin");
    const refused = await proxy(action("https://evil.example"));
    expect(refused.status).toBe(403);
    expect(await refused.text()).toBe(FOREIGN_ORIGIN_REFUSAL);
    expect((await proxy(action("http://papin.test"))).headers.get("x-middleware-next")).toBe("1");
    const anonymous = await proxy(action("http://papin.test", "/admin/site"));
    expect(anonymous.status).toBe(307); // past the Origin check, on to the usual sign-in redirect
    expect((await proxy(action("https://evil.example", "/admin/site"))).status).toBe(403);
  });
});

describe("npm start", () => {
  it("refuses to start without NEXTAUTH_SECRET and NEXTAUTH_URL, in one line, before touching the database", () => {
    const { NEXTAUTH_SECRET: _secret, NEXTAUTH_URL: _url, ...rest } = process.env;
    const started = spawnSync("npm", ["start", "--silent"], { env: { ...rest, DATABASE_URL: `file:${ctx.dir}/never-made.db`, PORT: "3199" }, encoding: "utf8", timeout: 60_000 });
    expect(started.status).toBe(1);
    expect(started.stderr.trim()).toBe(
      "Papin will not start: set NEXTAUTH_SECRET (a random secret of at least 16 characters) and NEXTAUTH_URL (the portal's public URL, such as https://papin.example.org) in the environment; see README, Configuration.",
    );
    expect(started.stdout.trim()).toBe("");
    expect(existsSync(`${ctx.dir}/never-made.db`)).toBe(false);
  });

  it("while the development preparation (npm run dev's first step) still runs without them", () => {
    const { NEXTAUTH_SECRET: _secret, NEXTAUTH_URL: _url, ...rest } = process.env;
    const prepared = spawnSync(process.execPath, ["node_modules/tsx/dist/cli.mjs", "--tsconfig", "db/tsconfig.scripts.json", "db/prepare.ts", "--no-demo"], {
      env: { ...rest, DATABASE_URL: `file:${ctx.dir}/development.db` },
      encoding: "utf8",
    });
    expect(prepared.stderr).toBe("");
    expect(prepared.status).toBe(0);
  });
});

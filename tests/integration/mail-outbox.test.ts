// The outbox end to end: mail queued in the caller's transaction, delivered through the real
// Resend SDK to the local fake, retried with backoff when the service fails or is down.
// Figures checked here are Papin's own policy (constructed definition tests): backoff of
// 1, 2, 4, 8 … minutes, at most 8 attempts; recipients as issue 5 item 6 names them.
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { eq, sql } from "drizzle-orm";
import { useTemporaryDatabase } from "../support/test-db";
import { deadMailServiceUrl, useFakeResend } from "../support/fake-resend";

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
let fake: Awaited<ReturnType<typeof useFakeResend>>;
type Schema = typeof import("@/db/schema");
type MailQueries = typeof import("@/db/queries/mail") & typeof import("@/lib/services/mail");
type Delivery = typeof import("@/lib/mail/delivery");
let schema: Schema;
let mail: MailQueries;
let delivery: Delivery;

const ids = {
  site: "site-mb",
  otherSite: "site-other",
  tech: "u-tech",
  eng1: "u-eng1",
  eng2: "u-eng2",
  engDisabled: "u-eng-off",
  engOtherSite: "u-eng-else",
  auditor: "u-aud",
  profile: "prof-134",
  sterilizer: "st-pl1",
  cycle: "cy-1",
  cycleByEngineer: "cy-2",
};

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  schema = await import("@/db/schema");
  mail = { ...(await import("@/db/queries/mail")), ...(await import("@/lib/services/mail")) };
  delivery = await import("@/lib/mail/delivery");
  const { sites, users, acceptanceProfiles, sterilizers, cycles } = schema;
  await ctx.db.insert(sites).values([
    { id: ids.site, name: "Marlow Bridge General Hospital — Sterile Services", code: "MBGH" },
    { id: ids.otherSite, name: "Another site", code: "OTH" },
  ]);
  const person = (id: string, name: string, email: string, role: "technician" | "engineer" | "auditor", extra: Partial<typeof users.$inferInsert> = {}) => ({
    id,
    name,
    email,
    role,
    siteId: ids.site,
    passwordHash: "not-a-real-hash",
    ...extra,
  });
  await ctx.db
    .insert(users)
    .values([
      person(ids.tech, "Tomás Brooks", "t.brooks@marlow-bridge.example", "technician"),
      person(ids.eng1, "Adaeze Okafor", "a.okafor@marlow-bridge.example", "engineer"),
      person(ids.eng2, "Priya Nair", "P.Nair@marlow-bridge.example", "engineer"),
      person(ids.engDisabled, "Former Engineer", "former@marlow-bridge.example", "engineer", { disabled: true }),
      person(ids.engOtherSite, "Elsewhere Engineer", "eng@other.example", "engineer", { siteId: ids.otherSite }),
      person(ids.auditor, "Ruth Lindqvist", "r.lindqvist@marlow-bridge.example", "auditor"),
    ]);
  await ctx.db.insert(acceptanceProfiles).values({ id: ids.profile, siteId: ids.site, name: "134 °C porous load", sterilizationTempC: 134, holdingTimeS: 180, basis: "en-285" });
  await ctx.db.insert(sterilizers).values({ id: ids.sterilizer, siteId: ids.site, name: "Porous load 1", serialNumber: "MB-PL-0417", chamberVolumeL: 445 });
  await ctx.db.insert(cycles).values([
    { id: ids.cycle, siteId: ids.site, sterilizerId: ids.sterilizer, profileId: ids.profile, cycleNumber: "P1-20260310-001", createdBy: ids.tech, submittedBy: ids.tech, status: "submitted" },
    {
      id: ids.cycleByEngineer,
      siteId: ids.site,
      sterilizerId: ids.sterilizer,
      profileId: ids.profile,
      cycleNumber: "P1-20260310-002",
      createdBy: ids.eng1,
      submittedBy: ids.eng1,
      status: "submitted",
    },
  ]);
  process.env.NEXTAUTH_URL = "https://papin.marlow-bridge.example";
  process.env.PAPIN_MAIL_FROM = "Papin at Marlow Bridge <papin@marlow-bridge.example>";
});

afterAll(() => ctx.cleanup());

beforeEach(async () => {
  fake = await useFakeResend();
  await ctx.db.delete(schema.mailOutbox);
});
afterEach(async () => {
  await fake.stop();
});

async function outboxRow(id: string) {
  const [row] = await ctx.db.select().from(schema.mailOutbox).where(eq(schema.mailOutbox.id, id));
  return row;
}

async function queue(subject = "Test message", to: string[] = ["t.brooks@marlow-bridge.example"]) {
  const queued = await ctx.db.transaction((tx) => mail.enqueueMail(tx, { to, subject, html: "<p>Hello</p>", text: "Hello", siteId: ids.site, relatedCycleId: ids.cycle }));
  return queued!.id;
}

const minutes = (n: number) => n * 60_000;

describe("recipients", () => {
  it("engineersOfSite lists the site's enabled engineers only", async () => {
    const list = await mail.engineersOfSite(ctx.db, ids.site);
    expect(list.map((e) => e.toLowerCase()).sort()).toEqual(["a.okafor@marlow-bridge.example", "p.nair@marlow-bridge.example"]);
  });

  it("emailOfUser gives nothing for a disabled account", async () => {
    expect(await mail.emailOfUser(ctx.db, ids.tech)).toBe("t.brooks@marlow-bridge.example");
    expect(await mail.emailOfUser(ctx.db, ids.engDisabled)).toBeNull();
  });
});

describe("each notification reaches the right people through the real SDK", () => {
  async function deliverAndRead() {
    const report = await delivery.deliverPendingMail();
    expect(report).toMatchObject({ configured: true, failed: 0, retrying: 0 });
    return fake.received();
  }

  it("submitted → the site's engineers (not disabled ones, not other sites')", async () => {
    await ctx.db.transaction((tx) => mail.enqueueCycleSubmittedMail(tx, { cycleId: ids.cycle }));
    const [got] = await deliverAndRead();
    expect(got.to.sort()).toEqual(["a.okafor@marlow-bridge.example", "p.nair@marlow-bridge.example"]);
    expect(got.from).toBe("Papin at Marlow Bridge <papin@marlow-bridge.example>");
    expect(got.subject).toBe("Cycle P1-20260310-001 on Porous load 1 is ready for review");
    expect(got.text).toContain("Tomás Brooks submitted cycle P1-20260310-001");
    expect(got.text).toContain(`https://papin.marlow-bridge.example/cycles/${ids.cycle}`);
    expect(got.html).toContain(`href="https://papin.marlow-bridge.example/cycles/${ids.cycle}"`);
  });

  it("submitted by an engineer → the other engineers only", async () => {
    await ctx.db.transaction((tx) => mail.enqueueCycleSubmittedMail(tx, { cycleId: ids.cycleByEngineer }));
    const [got] = await deliverAndRead();
    expect(got.to).toEqual(["p.nair@marlow-bridge.example"]);
  });

  it("rejected → the submitter, with the reason and who returned it", async () => {
    await ctx.db.transaction((tx) => mail.enqueueCycleRejectedMail(tx, { cycleId: ids.cycle, reason: "Drain probe not in the chamber drain; repeat the test.", signerName: "Adaeze Okafor" }));
    const [got] = await deliverAndRead();
    expect(got.to).toEqual(["t.brooks@marlow-bridge.example"]);
    expect(got.subject).toBe("Cycle P1-20260310-001 on Porous load 1 was returned");
    expect(got.text).toContain("> Drain probe not in the chamber drain; repeat the test.");
    expect(got.text).toContain("Adaeze Okafor returned cycle");
  });

  it("approved → the submitter, with the report number", async () => {
    await ctx.db.transaction((tx) => mail.enqueueCycleApprovedMail(tx, { cycleId: ids.cycle, signerName: "Priya Nair", reportNumber: "MBGH-2026-0042" }));
    const [got] = await deliverAndRead();
    expect(got.to).toEqual(["t.brooks@marlow-bridge.example"]);
    expect(got.subject).toBe("Cycle P1-20260310-001 on Porous load 1 was approved");
    expect(got.text).toContain("MBGH-2026-0042");
    expect(got.html).toContain("Priya Nair approved cycle");
  });

  it("a failing analysis → every engineer of the site, with the checks not met", async () => {
    await ctx.db.transaction((tx) =>
      mail.enqueueAnalysisFailedMail(tx, {
        cycleId: ids.cycleByEngineer,
        summary: "The drain ran 2.4 K below saturation for 54 s during the plateau.",
        failedChecks: ["Saturation: below by up to 2.4 K", "Holding time: 162 s of 180 s"],
      }),
    );
    const [got] = await deliverAndRead();
    expect(got.to.sort()).toEqual(["a.okafor@marlow-bridge.example", "p.nair@marlow-bridge.example"]);
    expect(got.subject).toBe("Cycle P1-20260310-002 on Porous load 1 did not pass its analysis");
    expect(got.text).toContain("- Holding time: 162 s of 180 s");
    expect(got.text).toContain(`https://papin.marlow-bridge.example/cycles/${ids.cycleByEngineer}`);
  });

  it("every notification carries the safety reminder in both bodies", async () => {
    const { SAFETY_SHORT } = await import("@/lib/safety");
    await ctx.db.transaction((tx) => mail.enqueueCycleSubmittedMail(tx, { cycleId: ids.cycle }));
    const [got] = await deliverAndRead();
    expect(got.text).toContain(SAFETY_SHORT);
    expect(got.html).toContain(SAFETY_SHORT.replace(/'/g, "&#39;"));
  });

  it("nobody to tell → nothing queued (a disabled submitter gets no mail)", async () => {
    await ctx.db.update(schema.users).set({ disabled: true }).where(eq(schema.users.id, ids.tech));
    try {
      const queued = await ctx.db.transaction((tx) => mail.enqueueCycleApprovedMail(tx, { cycleId: ids.cycle, signerName: "Priya Nair", reportNumber: "R-1" }));
      expect(queued).toBeNull();
      expect(await ctx.db.$count(schema.mailOutbox)).toBe(0);
    } finally {
      await ctx.db.update(schema.users).set({ disabled: false }).where(eq(schema.users.id, ids.tech));
    }
  });
});

describe("the outbox", () => {
  it("is written in the caller's transaction: a rolled-back change leaves no mail", async () => {
    await expect(
      ctx.db.transaction(async (tx) => {
        await mail.enqueueCycleSubmittedMail(tx, { cycleId: ids.cycle });
        throw new Error("the signature failed");
      }),
    ).rejects.toThrow("the signature failed");
    expect(await ctx.db.$count(schema.mailOutbox)).toBe(0);
  });

  it("takes a row from pending to sent with the provider's id", async () => {
    const id = await queue();
    expect(await outboxRow(id)).toMatchObject({ status: "pending", attempts: 0, providerId: null, sentAt: null });
    const report = await delivery.deliverPendingMail();
    expect(report).toEqual({ configured: true, attempted: 1, sent: 1, retrying: 0, failed: 0 });
    const row = await outboxRow(id);
    const [got] = fake.received();
    expect(row).toMatchObject({ status: "sent", attempts: 1, providerId: got.id, nextAttemptAt: null });
    expect(row.sentAt).not.toBeNull();
    expect(got.idempotency_key).toBe(`papin-outbox/${id}`);
    expect(await delivery.deliverPendingMail()).toMatchObject({ attempted: 0 });
    expect(fake.received()).toHaveLength(1);
  });

  it("normalises recipients and refuses to queue a mail without any", async () => {
    const id = await queue("Normalised", [" A.Okafor@Marlow-Bridge.example ", "a.okafor@marlow-bridge.example", "not an address"]);
    expect((await outboxRow(id)).to).toEqual(["a.okafor@marlow-bridge.example"]);
    const none = await ctx.db.transaction((tx) => mail.enqueueMail(tx, { to: [], subject: "x", html: "x", text: "x", siteId: ids.site }));
    expect(none).toBeNull();
  });

  it("retries with backoff while the fake fails twice, then ends sent with three attempts", async () => {
    fake.failNext(2);
    const id = await queue();
    const t0 = new Date("2026-03-10T08:00:00.000Z");

    expect(await delivery.deliverPendingMail({ now: t0 })).toMatchObject({ attempted: 1, retrying: 1 });
    let row = await outboxRow(id);
    expect(row).toMatchObject({ status: "pending", attempts: 1, nextAttemptAt: "2026-03-10T08:01:00.000Z" });
    expect(row.lastError).toMatch(/internal_server_error \(500\)/);

    // Not yet due half a minute later.
    expect(await delivery.deliverPendingMail({ now: new Date(t0.getTime() + 30_000) })).toMatchObject({ attempted: 0 });

    await delivery.deliverPendingMail({ now: new Date(t0.getTime() + minutes(1)) });
    row = await outboxRow(id);
    expect(row).toMatchObject({ status: "pending", attempts: 2, nextAttemptAt: "2026-03-10T08:03:00.000Z" });

    expect(await delivery.deliverPendingMail({ now: new Date(t0.getTime() + minutes(3)) })).toMatchObject({ sent: 1 });
    row = await outboxRow(id);
    expect(row).toMatchObject({ status: "sent", attempts: 3, providerId: fake.received()[0].id, sentAt: "2026-03-10T08:03:00.000Z" });
    expect(row.lastError).toMatch(/500/);
    expect(fake.received()).toHaveLength(1);
  });

  it("stays pending with the error recorded when the mail service is down, and nothing throws", async () => {
    process.env.RESEND_BASE_URL = await deadMailServiceUrl();
    const id = await queue();
    const report = await delivery.deliverPendingMail();
    expect(report).toMatchObject({ configured: true, attempted: 1, sent: 0, retrying: 1 });
    const row = await outboxRow(id);
    expect(row).toMatchObject({ status: "pending", attempts: 1, providerId: null });
    expect(row.lastError).toMatch(/Unable to fetch data/);
    expect(row.nextAttemptAt).not.toBeNull();
  });

  it("gives up after 8 attempts and marks the mail failed", async () => {
    fake.failNext(100, 503);
    const id = await queue();
    let at = new Date("2026-03-10T08:00:00.000Z").getTime();
    const waits: number[] = [];
    for (let attempt = 1; attempt <= 8; attempt++) {
      await delivery.deliverPendingMail({ now: new Date(at) });
      const row = await outboxRow(id);
      expect(row.attempts).toBe(attempt);
      if (row.nextAttemptAt) {
        waits.push((Date.parse(row.nextAttemptAt) - at) / 60_000);
        at = Date.parse(row.nextAttemptAt);
      }
    }
    expect(waits).toEqual([1, 2, 4, 8, 16, 32, 64]);
    expect(await outboxRow(id)).toMatchObject({ status: "failed", attempts: 8, nextAttemptAt: null });
    expect(await delivery.deliverPendingMail({ now: new Date(at + minutes(500)) })).toMatchObject({ attempted: 0 });
  });

  it("marks a mail the service will never accept (422) failed at once", async () => {
    const [row] = await ctx.db
      .insert(schema.mailOutbox)
      .values({ to: ["no-at-sign"], subject: "s", html: "h", text: "t" })
      .returning();
    expect(await delivery.deliverPendingMail()).toMatchObject({ failed: 1 });
    expect(await outboxRow(row.id)).toMatchObject({ status: "failed", attempts: 1 });
    expect((await outboxRow(row.id)).lastError).toMatch(/validation_error \(422\)/);
  });

  it("leaves mail pending without a word to the caller when mail is not configured", async () => {
    delete process.env.RESEND_BASE_URL;
    delete process.env.RESEND_API_KEY;
    const id = await queue();
    expect(await delivery.deliverPendingMail()).toEqual({ configured: false, attempted: 0, sent: 0, retrying: 0, failed: 0 });
    expect(await outboxRow(id)).toMatchObject({ status: "pending", attempts: 0, lastError: null });
  });

  it("sends each mail once when two senders run at the same time", async () => {
    for (let i = 0; i < 6; i++) await queue(`Concurrent ${i}`);
    const [a, b] = await Promise.all([delivery.deliverPendingMail(), delivery.deliverPendingMail()]);
    expect(a.sent + b.sent).toBe(6);
    expect(fake.received()).toHaveLength(6);
    expect(new Set(fake.received().map((m) => m.subject)).size).toBe(6);
  });

  it("kickMailDelivery returns at once, never throws, and the mail goes out after the commit", async () => {
    const id = await queue();
    expect(delivery.kickMailDelivery()).toBeUndefined();
    delivery.kickMailDelivery();
    for (let i = 0; i < 50 && (await outboxRow(id)).status !== "sent"; i++) await new Promise((r) => setTimeout(r, 50));
    expect((await outboxRow(id)).status).toBe("sent");
    expect(fake.received()).toHaveLength(1);
  });

  it("kickMailDelivery does not throw when the service is down either", async () => {
    process.env.RESEND_BASE_URL = await deadMailServiceUrl();
    const id = await queue();
    expect(() => delivery.kickMailDelivery()).not.toThrow();
    for (let i = 0; i < 50 && (await outboxRow(id)).attempts === 0; i++) await new Promise((r) => setTimeout(r, 50));
    expect(await outboxRow(id)).toMatchObject({ status: "pending", attempts: 1 });
  });
});

describe("an administrator's retry", () => {
  const admin = { id: "u-admin", email: "admin@marlow-bridge.example", name: "Site Admin", role: "admin" as const, siteId: ids.site };

  it("makes a failed mail due again, keeps its attempts and is audited", async () => {
    const [row] = await ctx.db
      .insert(schema.mailOutbox)
      .values({ to: ["t.brooks@marlow-bridge.example"], subject: "Stuck", html: "h", text: "t", status: "failed", attempts: 8, lastError: "x", siteId: ids.site })
      .returning();
    const after = await mail.retryMail({ actor: admin, id: row.id });
    expect(after).toMatchObject({ status: "pending", attempts: 8, nextAttemptAt: null });
    const events = await ctx.db.all<{ action: string; entity_id: string }>(sql`select action, entity_id from audit_events where action = 'mail.retry'`);
    expect(events).toContainEqual({ action: "mail.retry", entity_id: row.id });
    expect(await delivery.deliverPendingMail({ ids: [row.id] })).toMatchObject({ sent: 1 });
    expect(await outboxRow(row.id)).toMatchObject({ status: "sent", attempts: 9 });
  });

  it("refuses to send a sent mail twice, and says so", async () => {
    const id = await queue();
    await delivery.deliverPendingMail();
    await expect(mail.retryMail({ actor: admin, id })).rejects.toMatchObject({ status: 409 });
    await expect(mail.retryMail({ actor: admin, id: "no-such-mail" })).rejects.toMatchObject({ status: 404 });
  });
});

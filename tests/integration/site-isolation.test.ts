// Two sites in one database: for each family of records the services answer a signed-in actor
// from their own site only. The other site's rows never appear, and asking to change one by its
// id is "not found" with the row left as it was. (Constructed data; the point is who sees what.)
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { useTemporaryDatabase } from "../support/test-db";
import { useFakeResend } from "../support/fake-resend";

type Actor = { id: string; email: string; name: string; role: "technician" | "engineer" | "auditor" | "admin"; siteId: string | null };
type SiteFixture = {
  siteId: string;
  people: Record<Actor["role"], Actor>;
  sterilizerId: string;
  profileId: string;
  instrumentId: string;
  mailId: string;
  periodicTestId: string;
};

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
let schema: typeof import("@/db/schema");
const site: Record<"a" | "b", SiteFixture> = {} as never;
const today = new Date();
const inDays = (n: number) => new Date(today.getTime() + n * 86_400_000).toISOString().slice(0, 10);

async function seedSite(key: "a" | "b", code: string): Promise<SiteFixture> {
  const { sites, users, sterilizers, acceptanceProfiles, instruments, calibrationCertificates, cycles, periodicTests, testSchedules, mailOutbox } = schema;
  const [s] = await ctx.db
    .insert(sites)
    .values({ name: `Site ${code}`, code })
    .returning();
  const people = {} as Record<Actor["role"], Actor>;
  for (const role of ["technician", "engineer", "auditor", "admin"] as const) {
    const [u] = await ctx.db
      .insert(users)
      .values({ email: `${role}@${key}.example`, name: `${role} ${code}`, role, passwordHash: "x", siteId: s.id })
      .returning();
    people[role] = { id: u.id, email: u.email, name: u.name, role, siteId: s.id };
  }
  const [profile] = await ctx.db
    .insert(acceptanceProfiles)
    .values({ siteId: s.id, name: `134 °C ${code}`, sterilizationTempC: 134, holdingTimeS: 180, basis: "en-285" })
    .returning();
  const [sterilizer] = await ctx.db
    .insert(sterilizers)
    .values({ siteId: s.id, name: `Sterilizer ${code}`, serialNumber: `SER-${code}`, chamberVolumeL: 300, defaultProfileId: profile.id })
    .returning();
  const [instrument] = await ctx.db
    .insert(instruments)
    .values({ siteId: s.id, name: `Logger ${code}`, serialNumber: `LOG-${code}`, kind: "logger", savedMapping: { time: "Time" } })
    .returning();
  await ctx.db.insert(calibrationCertificates).values({ instrumentId: instrument.id, certificateNumber: `CAL-${code}`, issuedBy: "Lab", calibratedOn: inDays(-350), dueOn: inDays(10) });
  const base = { siteId: s.id, sterilizerId: sterilizer.id, profileId: profile.id, createdBy: people.technician.id };
  await ctx.db.insert(cycles).values([
    { ...base, cycleNumber: `${code}-FAIL`, verdict: "fail", status: "draft", startedAt: today.toISOString() },
    { ...base, cycleNumber: `${code}-WAIT`, verdict: "pass", status: "submitted", startedAt: today.toISOString(), submittedAt: today.toISOString() },
    { ...base, cycleNumber: `${code}-OK`, verdict: "pass", status: "approved", startedAt: today.toISOString() },
  ]);
  const [test] = await ctx.db
    .insert(periodicTests)
    .values({ siteId: s.id, sterilizerId: sterilizer.id, kind: "bowie-dick", performedAt: today.toISOString(), performedBy: people.technician.id, result: "pass" })
    .returning();
  await ctx.db.insert(testSchedules).values({ sterilizerId: sterilizer.id, kind: "air-leakage", intervalDays: 7 });
  const [mail] = await ctx.db
    .insert(mailOutbox)
    .values({ to: [people.engineer.email], subject: `Mail of ${code}`, html: "<p>x</p>", text: "x", siteId: s.id })
    .returning();
  const { recordAuditEvent } = await import("@/db/queries/audit");
  await recordAuditEvent({ actorId: people.engineer.id, actorEmail: people.engineer.email, siteId: s.id, action: "test.event", entityType: "test", entityId: `event-${code}` });
  await recordAuditEvent({ actorEmail: people.technician.email, siteId: s.id, action: "auth.sign-in-failed", entityType: "user", entityId: people.technician.id });
  return { siteId: s.id, people, sterilizerId: sterilizer.id, profileId: profile.id, instrumentId: instrument.id, mailId: mail.id, periodicTestId: test.id };
}

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  schema = await import("@/db/schema");
  site.a = await seedSite("a", "A");
  site.b = await seedSite("b", "B");
});
afterAll(() => ctx.cleanup());

const a = (role: Actor["role"]) => site.a.people[role];
const idsOf = (rows: Array<{ id: string }>) => rows.map((r) => r.id);

describe("users", () => {
  it("an administrator lists only the own site's accounts", async () => {
    const { listUsers } = await import("@/lib/services/users");
    const rows = await listUsers({ actor: a("admin") });
    expect(rows).toHaveLength(4);
    expect(rows.every((r) => r.email.endsWith("@a.example"))).toBe(true);
  });

  it("cannot change, disable or reset the password of another site's account: 404, nothing changed, nothing audited", async () => {
    const { resetPassword, unlockUser, updateUser } = await import("@/lib/services/users");
    const target = site.b.people.engineer;
    const before = await ctx.db.select().from(schema.users).where(eq(schema.users.id, target.id));
    await expect(updateUser({ actor: a("admin"), id: target.id, changes: { role: "auditor", disabled: true }, reason: "x" })).rejects.toMatchObject({ status: 404 });
    await expect(resetPassword({ actor: a("admin"), id: target.id })).rejects.toMatchObject({ status: 404 });
    await expect(unlockUser({ actor: a("admin"), id: target.id, reason: "x" })).rejects.toMatchObject({ status: 404 });
    expect(await ctx.db.select().from(schema.users).where(eq(schema.users.id, target.id))).toEqual(before);
    expect(await ctx.db.select().from(schema.auditEvents).where(eq(schema.auditEvents.entityId, target.id))).toHaveLength(0);
  });

  it("a new account joins the administrator's own site", async () => {
    const { createUser } = await import("@/lib/services/users");
    const created = await createUser({ actor: a("admin"), input: { email: "new@a.example", name: "New Person", role: "technician" } });
    const [row] = await ctx.db.select().from(schema.users).where(eq(schema.users.id, created.id));
    expect(row.siteId).toBe(site.a.siteId);
  });
});

describe("audit events", () => {
  it("the ledger lists only the own site's events, whatever the filter asks for", async () => {
    const { listAuditEvents } = await import("@/lib/services/audit");
    const all = await listAuditEvents({ actor: a("auditor"), filter: {} });
    expect(all.items.length).toBeGreaterThan(0);
    expect(all.items.every((e) => e.siteId === site.a.siteId)).toBe(true);
    const foreign = await listAuditEvents({ actor: a("auditor"), filter: { entityId: "event-B" } });
    expect(foreign).toEqual({ items: [], total: 0 });
  });
});

describe("mail outbox", () => {
  it("the outbox shows only the own site's mail", async () => {
    const { getMailOutbox } = await import("@/lib/services/mail");
    const { rows, counts } = await getMailOutbox({ actor: a("admin") });
    expect(idsOf(rows)).toEqual([site.a.mailId]);
    expect(counts).toEqual({ pending: 1, sent: 0, failed: 0 });
  });

  it("another site's mail cannot be retried (404) and sending due mail sends only the own site's", async () => {
    const { retryMail, sendDueMail } = await import("@/lib/services/mail");
    await expect(retryMail({ actor: a("admin"), id: site.b.mailId })).rejects.toMatchObject({ status: 404 });
    const fake = await useFakeResend();
    try {
      expect(await sendDueMail({ actor: a("admin") })).toMatchObject({ sent: 1 });
      expect(fake.received().map((m) => m.subject)).toEqual(["Mail of A"]);
    } finally {
      await fake.stop();
    }
    const [other] = await ctx.db.select().from(schema.mailOutbox).where(eq(schema.mailOutbox.id, site.b.mailId));
    expect(other).toMatchObject({ status: "pending", attempts: 0 });
  });
});

describe("sterilizers", () => {
  it("lists and offers only the own site's sterilizers (page and API list)", async () => {
    const { listSterilizers } = await import("@/lib/services/equipment");
    const { listSterilizerCatalog } = await import("@/lib/services/catalog");
    expect(idsOf(await listSterilizers({ actor: a("engineer") }))).toEqual([site.a.sterilizerId]);
    expect(idsOf(await listSterilizerCatalog({ actor: a("technician") }))).toEqual([site.a.sterilizerId]);
  });

  it("another site's sterilizer is not found, cannot be edited or scheduled, and stays as it was", async () => {
    const { getSterilizerPage, updateSterilizer, saveSchedule, removeSchedule } = await import("@/lib/services/equipment");
    const id = site.b.sterilizerId;
    const before = await ctx.db.select().from(schema.sterilizers).where(eq(schema.sterilizers.id, id));
    const input = { name: "Taken over", serialNumber: "SER-B", chamberVolumeL: 10, model: null, location: null, airDetectorFitted: false, defaultProfileId: null };
    await expect(getSterilizerPage({ actor: a("engineer"), id })).rejects.toMatchObject({ status: 404 });
    await expect(updateSterilizer({ actor: a("engineer"), id, input, active: false, reason: "x" })).rejects.toMatchObject({ status: 404 });
    await expect(saveSchedule({ actor: a("engineer"), sterilizerId: id, kind: "air-leakage", intervalDays: 1, reason: "x" })).rejects.toMatchObject({ status: 404 });
    await expect(removeSchedule({ actor: a("engineer"), sterilizerId: id, kind: "air-leakage", reason: "x" })).rejects.toMatchObject({ status: 404 });
    expect(await ctx.db.select().from(schema.sterilizers).where(eq(schema.sterilizers.id, id))).toEqual(before);
    expect(await ctx.db.select().from(schema.testSchedules).where(eq(schema.testSchedules.sterilizerId, id))).toMatchObject([{ intervalDays: 7 }]);
  });
});

describe("acceptance profiles", () => {
  it("lists only the own site's profiles; another site's is not found and cannot be edited or used as a default", async () => {
    const { listProfiles, getProfile, updateProfile } = await import("@/lib/services/profiles");
    const { listProfileCatalog } = await import("@/lib/services/catalog");
    const { createSterilizer } = await import("@/lib/services/equipment");
    expect(idsOf(await listProfiles({ actor: a("engineer") }))).toEqual([site.a.profileId]);
    expect(idsOf(await listProfileCatalog({ actor: a("technician") }))).toEqual([site.a.profileId]);
    const id = site.b.profileId;
    await expect(getProfile({ actor: a("engineer"), id })).rejects.toMatchObject({ status: 404 });
    const limits = {
      name: "Hijacked",
      sterilizationTempC: 121,
      bandK: 3,
      holdingTimeS: 900,
      maxEquilibrationS: 15,
      maxSpreadK: 2,
      saturationLimitK: 2,
      f0ReferenceC: 121.1,
      f0ZK: 10,
      maxSampleIntervalS: null,
      freeSpaceEarlyK: 5,
      freeSpaceEarlyS: 60,
      freeSpaceK: 2,
      leakRateLimitKpaPerMin: 0.13,
      leakVacuumSetPointKpaAbs: 7,
      basis: "en-285" as const,
      basisReason: null,
    };
    await expect(updateProfile({ actor: a("engineer"), id, input: limits, reason: "x" })).rejects.toMatchObject({ status: 404 });
    const [row] = await ctx.db.select().from(schema.acceptanceProfiles).where(eq(schema.acceptanceProfiles.id, id));
    expect(row).toMatchObject({ name: "134 °C B", active: true });
    const input = { name: "New", serialNumber: "NEW-1", chamberVolumeL: 10, model: null, location: null, airDetectorFitted: false, defaultProfileId: id };
    await expect(createSterilizer({ actor: a("engineer"), input })).rejects.toMatchObject({ status: 422, field: "defaultProfileId" });
  });
});

describe("instruments", () => {
  it("lists only the own site's instruments; another site's is not found and its certificates and mapping stay untouched", async () => {
    const { listInstruments, getInstrumentPage, addCalibrationCertificate, clearSavedMapping } = await import("@/lib/services/instruments");
    const { listInstrumentCatalog } = await import("@/lib/services/catalog");
    expect(idsOf(await listInstruments({ actor: a("engineer") }))).toEqual([site.a.instrumentId]);
    expect(idsOf(await listInstrumentCatalog({ actor: a("technician") }))).toEqual([site.a.instrumentId]);
    const id = site.b.instrumentId;
    await expect(getInstrumentPage({ actor: a("engineer"), id })).rejects.toMatchObject({ status: 404 });
    const cert = { instrumentId: id, certificateNumber: "FAKE", issuedBy: "x", calibratedOn: inDays(-1), dueOn: inDays(365), uncertaintyK: null, notes: null };
    await expect(addCalibrationCertificate({ actor: a("engineer"), input: cert })).rejects.toMatchObject({ status: 404 });
    await expect(clearSavedMapping({ actor: a("engineer"), instrumentId: id, reason: "x" })).rejects.toMatchObject({ status: 404 });
    expect(await ctx.db.select().from(schema.calibrationCertificates).where(eq(schema.calibrationCertificates.instrumentId, id))).toHaveLength(1);
    const [row] = await ctx.db.select().from(schema.instruments).where(eq(schema.instruments.id, id));
    expect(row.savedMapping).toEqual({ time: "Time" });
  });
});

describe("periodic tests", () => {
  it("the schedule and the history hold only the own site's sterilizers, even when filtered by another site's sterilizer", async () => {
    const { getScheduleOverview, listPeriodicTests, listSterilizerChoices } = await import("@/lib/services/periodic-tests");
    const { rows } = await getScheduleOverview({ actor: a("technician") });
    expect(rows.map((r) => r.sterilizerId)).toEqual([site.a.sterilizerId]);
    expect(idsOf((await listPeriodicTests({ actor: a("technician"), filter: {} })).items)).toEqual([site.a.periodicTestId]);
    expect(await listPeriodicTests({ actor: a("technician"), filter: { sterilizer: site.b.sterilizerId } })).toMatchObject({ items: [], total: 0 });
    expect(idsOf((await listSterilizerChoices({ actor: a("technician") })).sterilizers)).toEqual([site.a.sterilizerId]);
  });

  it("a test cannot be recorded for another site's sterilizer", async () => {
    const { recordBowieDick } = await import("@/lib/services/periodic-test-records");
    const { indicatorSheetPng, photoFile } = await import("../support/indicator-photo");
    const photo = photoFile(indicatorSheetPng(), "sheet.png");
    const input = { sterilizerId: site.b.sterilizerId, performedAt: today.toISOString(), notes: null, outcome: "uniform" as const, indicatorLot: "L-1", photo };
    await expect(recordBowieDick({ actor: a("technician"), input })).rejects.toMatchObject({ status: 404 });
    expect(await ctx.db.select().from(schema.periodicTests).where(eq(schema.periodicTests.sterilizerId, site.b.sterilizerId))).toHaveLength(1);
  });
});

describe("the home dashboard", () => {
  it("an engineer's lists (review, failures, tests due, calibrations due) come from the own site only", async () => {
    const { getHomeDashboard } = await import("@/lib/services/dashboard");
    const home = await getHomeDashboard({ actor: a("engineer") });
    if (home.kind !== "worker") throw new Error(`expected the engineer's dashboard, got ${home.kind}`);
    expect(home.siteName).toBe("Site A");
    expect(home.review?.items.map((c) => c.cycleNumber)).toEqual(["A-WAIT"]);
    expect(home.review?.total).toBe(1);
    expect(home.failures.map((c) => c.cycleNumber)).toEqual(["A-FAIL"]);
    expect(home.testsDue.map((r) => r.sterilizerName)).toEqual(["Sterilizer A"]);
    expect(home.calibrations.map((c) => c.instrumentId)).toEqual([site.a.instrumentId]);
  });

  it("a technician's own drafts, an auditor's approved records and an administrator's counts are the own site's", async () => {
    const { getHomeDashboard } = await import("@/lib/services/dashboard");
    const tech = await getHomeDashboard({ actor: a("technician") });
    if (tech.kind !== "worker") throw new Error("expected the technician's dashboard");
    expect(tech.mine.map((c) => c.cycleNumber)).toEqual(["A-FAIL"]);
    const auditor = await getHomeDashboard({ actor: a("auditor") });
    if (auditor.kind !== "auditor") throw new Error("expected the auditor's dashboard");
    expect(auditor.approved.map((c) => c.cycleNumber)).toEqual(["A-OK"]);
    const admin = await getHomeDashboard({ actor: a("admin") });
    if (admin.kind !== "admin") throw new Error("expected the administrator's dashboard");
    // Site A: its 4 seeded accounts and the one created above; one failed sign-in each site.
    expect(admin.overview).toEqual({ users: 5, disabled: 0, failedSignIns: 1 });
  });
});

describe("site settings", () => {
  it("an administrator changes only the own site", async () => {
    const { updateSiteSettings } = await import("@/lib/services/site");
    await updateSiteSettings({ actor: a("admin"), changes: { name: "Site A renamed", timeZone: "UTC", atmosphereKpa: null, altitudeM: 250, address: null }, reason: "survey" });
    const rows = await ctx.db.select({ id: schema.sites.id, name: schema.sites.name, altitudeM: schema.sites.altitudeM }).from(schema.sites);
    expect(rows).toContainEqual({ id: site.a.siteId, name: "Site A renamed", altitudeM: 250 });
    expect(rows).toContainEqual({ id: site.b.siteId, name: "Site B", altitudeM: null });
  });
});

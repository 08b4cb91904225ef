import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { useTemporaryDatabase } from "../support/test-db";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({
  ...(await original<typeof import("next-auth")>()),
  getServerSession: async () => session.current,
}));
// Server actions revalidate pages; outside a Next request there is nothing to revalidate.
vi.mock("next/cache", () => ({ revalidatePath: () => undefined, revalidateTag: () => undefined }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const ids: Record<string, string> = {};
const IDLE = { status: "idle" as const };

function form(values: Record<string, string>) {
  const fd = new FormData();
  for (const [k, v] of Object.entries(values)) fd.set(k, v);
  return fd;
}
const as = (key: string | null) => {
  session.current = key ? { user: { id: ids[key] } } : null;
};

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { users, sites, sterilizers, acceptanceProfiles, cycles } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const [site] = await ctx.db.insert(sites).values({ name: "Test site", code: "T", timeZone: "Europe/London" }).returning();
  const [other] = await ctx.db.insert(sites).values({ name: "Other site", code: "O" }).returning();
  ids.site = site.id;
  const passwordHash = await hashPassword("a test password");
  for (const role of ["technician", "engineer", "auditor"] as const) {
    const [u] = await ctx.db
      .insert(users)
      .values({ email: `${role}@test.example`, name: role, role, passwordHash, siteId: site.id })
      .returning();
    ids[role] = u.id;
  }
  const [profile] = await ctx.db.insert(acceptanceProfiles).values({ siteId: site.id, name: "134 °C / 3 min", sterilizationTempC: 134, holdingTimeS: 180, basis: "en-285" }).returning();
  ids.profile = profile.id;
  const [st] = await ctx.db.insert(sterilizers).values({ siteId: site.id, name: "Porous load 1", serialNumber: "S-1", chamberVolumeL: 445, defaultProfileId: profile.id }).returning();
  ids.sterilizer = st.id;
  const [foreign] = await ctx.db.insert(sterilizers).values({ siteId: other.id, name: "Elsewhere", serialNumber: "X-1", chamberVolumeL: 300 }).returning();
  ids.foreignSterilizer = foreign.id;
  // One cycle analysed against the profile, so the profile is "in use".
  await ctx.db.insert(cycles).values({ siteId: site.id, sterilizerId: st.id, profileId: profile.id, cycleNumber: "C-1", createdBy: ids.technician, verdict: "pass" });
});
afterAll(() => ctx.cleanup());

async function auditEventsFor(entityId: string) {
  const { auditEvents } = await import("@/db/schema");
  const { eq } = await import("drizzle-orm");
  return ctx.db.select().from(auditEvents).where(eq(auditEvents.entityId, entityId));
}

describe("recording an air leakage test", () => {
  it("computes (p3 − p2)/10 min on the server, stores the verdict and writes an audit event", async () => {
    as("technician");
    const { recordAirLeakageAction } = await import("@/app/(portal)/periodic-tests/actions");
    // 45 → 60 mbar over 10 min = 1.5 mbar/min = 0.15 kPa/min, over the 0.13 kPa/min limit (EN 285 / HTM 2010 [found]).
    const state = await recordAirLeakageAction(IDLE, form({ sterilizerId: ids.sterilizer, performedAt: new Date(Date.now() - 3_600_000).toISOString(), unit: "mbar", p1: "40", p2: "45", p3: "60" }));
    expect(state.status).toBe("ok");
    expect(state.message).toMatch(/FAIL/);

    const { periodicTests } = await import("@/db/schema");
    const { eq } = await import("drizzle-orm");
    const [row] = await ctx.db.select().from(periodicTests).where(eq(periodicTests.sterilizerId, ids.sterilizer));
    expect(row).toMatchObject({ kind: "air-leakage", result: "fail", performedBy: ids.technician, siteId: ids.site });
    const m = row.measurements as Record<string, number>;
    expect(m.leakRateKpaPerMin).toBeCloseTo(0.15, 9);
    expect(m.limitKpaPerMin).toBe(0.13);
    expect(m.p2Kpa).toBeCloseTo(4.5, 12);

    const events = await auditEventsFor(row.id);
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({ action: "periodic-test.record", actorId: ids.technician, entityType: "periodic-test" });
    expect(JSON.parse(events[0].newValue!)).toMatchObject({ result: "fail", kind: "air-leakage" });
    const { verifyAuditChain } = await import("@/lib/services/audit");
    expect((await verifyAuditChain()).ok).toBe(true);
  });

  it("a rise of 1.3 kPa in 10 min passes, and the schedule counts it as done once an engineer has approved it", async () => {
    as("engineer");
    const { saveScheduleAction } = await import("@/app/(portal)/sterilizers/actions");
    expect((await saveScheduleAction(IDLE, form({ sterilizerId: ids.sterilizer, kind: "air-leakage", intervalDays: "7" }))).status).toBe("ok");
    as("technician");
    const { recordAirLeakageAction } = await import("@/app/(portal)/periodic-tests/actions");
    const state = await recordAirLeakageAction(IDLE, form({ sterilizerId: ids.sterilizer, performedAt: new Date().toISOString(), unit: "kPa", p1: "4.0", p2: "5,0", p3: "6.3" }));
    expect(state).toMatchObject({ status: "ok" });
    expect(state.message).toMatch(/PASS/);
    const { getScheduleOverview } = await import("@/lib/services/periodic-tests");
    const { getUserById } = await import("@/db/queries/users");
    const engineer = (await getUserById({ id: ids.engineer }))!;
    const airLeakage = async () => (await getScheduleOverview({ actor: { ...engineer } })).rows.find((r) => r.kind === "air-leakage")!;
    // Unsigned, it does not count yet (issue 10: only signed results count for the schedule).
    expect((await airLeakage()).status.state).toBe("never");
    // This pass and the failing test above both wait for a signature.
    expect((await airLeakage()).recordsAwaitingSignOff).toBe(2);
    const { listPeriodicTestsForReview, signPeriodicTest } = await import("@/lib/services/periodic-test-review");
    const waiting = (await listPeriodicTestsForReview({ actor: { ...engineer } })).find((r) => r.result === "pass")!;
    await signPeriodicTest({ actor: { ...engineer }, id: waiting.id, password: "a test password", meaning: "approved", reason: null });
    expect((await airLeakage()).status.state).toBe("ok");
  });

  it("says which reading is missing and saves nothing", async () => {
    as("technician");
    const { recordAirLeakageAction } = await import("@/app/(portal)/periodic-tests/actions");
    const state = await recordAirLeakageAction(IDLE, form({ sterilizerId: ids.sterilizer, performedAt: new Date().toISOString(), unit: "kPa", p1: "4", p2: "", p3: "abc" }));
    expect(state.status).toBe("error");
    expect(state.fieldErrors).toMatchObject({ p2: "Enter p2.", p3: "P3 must be a number." });
  });

  it("refuses a sterilizer of another site as not found", async () => {
    as("technician");
    const { recordAirLeakageAction } = await import("@/app/(portal)/periodic-tests/actions");
    const state = await recordAirLeakageAction(IDLE, form({ sterilizerId: ids.foreignSterilizer, performedAt: new Date().toISOString(), unit: "kPa", p1: "4", p2: "5", p3: "5.5" }));
    expect(state).toMatchObject({ status: "error", message: "That sterilizer was not found on your site." });
  });

  it("an auditor cannot record a test", async () => {
    as("auditor");
    const { recordBowieDickAction } = await import("@/app/(portal)/periodic-tests/actions");
    const state = await recordBowieDickAction(IDLE, form({ sterilizerId: ids.sterilizer, performedAt: new Date().toISOString(), outcome: "uniform" }));
    expect(state.status).toBe("error");
    expect(state.message).toMatch(/role does not allow/);
  });
});

describe("steam dryness recorded through the action", () => {
  it("DOMAIN §2.8 worked check: m_c = 0.075 kg → D = 0.988 [computed], stored with h_s and L from IF97", async () => {
    as("engineer");
    const { recordDrynessAction } = await import("@/app/(portal)/periodic-tests/actions");
    const state = await recordDrynessAction(
      IDLE,
      form({
        sterilizerId: ids.sterilizer,
        performedAt: new Date().toISOString(),
        initialWaterTempC: "20",
        finalWaterTempC: "80",
        waterMassKg: "0.650",
        condensateMassKg: "0.075",
        steamTempC: "134",
        load: "metal",
      }),
    );
    expect(state.status).toBe("ok");
    const { periodicTests } = await import("@/db/schema");
    const { eq } = await import("drizzle-orm");
    const [row] = await ctx.db.select().from(periodicTests).where(eq(periodicTests.kind, "steam-dryness"));
    expect(row.result).toBe("pass");
    expect((row.measurements as { dryness: number }).dryness).toBeCloseTo(0.988, 3);
  });
});

describe("who may change equipment", () => {
  it("a technician cannot create a sterilizer: error state, nothing written", async () => {
    as("technician");
    const { createSterilizerAction } = await import("@/app/(portal)/sterilizers/actions");
    const state = await createSterilizerAction(IDLE, form({ name: "Sneaky", serialNumber: "S-99", chamberVolumeL: "100" }));
    expect(state.status).toBe("error");
    expect(state.message).toMatch(/role does not allow/);
    const { sterilizers } = await import("@/db/schema");
    const { eq } = await import("drizzle-orm");
    expect(await ctx.db.select().from(sterilizers).where(eq(sterilizers.serialNumber, "S-99"))).toHaveLength(0);
  });

  it("the role is checked on the server itself: requireRole refuses with 403", async () => {
    as("technician");
    const { requireRole } = await import("@/lib/auth/guards");
    await expect(requireRole("equipment:manage")).rejects.toMatchObject({ status: 403 });
  });

  it("an engineer creates one, audited; a clashing serial number is refused beside the field", async () => {
    as("engineer");
    const { createSterilizerAction } = await import("@/app/(portal)/sterilizers/actions");
    const ok = await createSterilizerAction(IDLE, form({ name: "Benchtop 2", serialNumber: "B-2", chamberVolumeL: "23", airDetectorFitted: "on", defaultProfileId: ids.profile }));
    expect(ok.status).toBe("ok");
    const { sterilizers } = await import("@/db/schema");
    const { eq } = await import("drizzle-orm");
    const [row] = await ctx.db.select().from(sterilizers).where(eq(sterilizers.serialNumber, "B-2"));
    expect(row).toMatchObject({ chamberVolumeL: 23, airDetectorFitted: true, siteId: ids.site });
    expect((await auditEventsFor(row.id)).map((e) => e.action)).toEqual(["sterilizer.create"]);
    const clash = await createSterilizerAction(IDLE, form({ name: "Again", serialNumber: "b-2", chamberVolumeL: "23" }));
    expect(clash).toMatchObject({ status: "error", fieldErrors: { serialNumber: expect.stringMatching(/already belongs/) } });
  });
});

describe("acceptance profiles", () => {
  const limits = {
    sterilizationTempC: "134",
    bandK: "3",
    holdingTimeS: "210",
    maxEquilibrationS: "15",
    maxSpreadK: "2",
    saturationLimitK: "2",
    f0ReferenceC: "121.1",
    f0ZK: "10",
    basis: "en-285",
    basisReason: "site protocol rev. B",
  };

  it("refuses a sterilization temperature outside 100–140 °C beside the field", async () => {
    as("engineer");
    const { createProfileAction } = await import("@/app/(portal)/profiles/actions");
    const state = await createProfileAction(IDLE, form({ ...limits, name: "Too hot", sterilizationTempC: "150" }));
    expect(state.fieldErrors?.sterilizationTempC).toBe("The sterilization temperature must be between 100 and 140 °C.");
  });

  it("editing a profile that cycles used creates a new version, retires the old one and moves the sterilizer's default", async () => {
    as("engineer");
    const { updateProfileAction } = await import("@/app/(portal)/profiles/actions");
    const state = await updateProfileAction(IDLE, form({ ...limits, id: ids.profile, name: "134 °C / 3.5 min", reason: "Protocol revision B asks for 3.5 min" }));
    expect(state.status).toBe("ok");
    expect(state.message).toMatch(/new version/);
    const { acceptanceProfiles, sterilizers } = await import("@/db/schema");
    const { eq } = await import("drizzle-orm");
    const [old] = await ctx.db.select().from(acceptanceProfiles).where(eq(acceptanceProfiles.id, ids.profile));
    expect(old).toMatchObject({ active: false, holdingTimeS: 180 });
    const [fresh] = await ctx.db.select().from(acceptanceProfiles).where(eq(acceptanceProfiles.name, "134 °C / 3.5 min"));
    expect(fresh).toMatchObject({ active: true, holdingTimeS: 210 });
    const [st] = await ctx.db.select().from(sterilizers).where(eq(sterilizers.id, ids.sterilizer));
    expect(st.defaultProfileId).toBe(fresh.id);
    const events = await auditEventsFor(fresh.id);
    expect(events[0]).toMatchObject({ action: "profile.new-version", reason: "Protocol revision B asks for 3.5 min" });
    expect(JSON.parse(events[0].oldValue!)).toMatchObject({ holdingTimeS: 180 });
  });

  it("an edit without a reason is refused", async () => {
    as("engineer");
    const { updateProfileAction } = await import("@/app/(portal)/profiles/actions");
    const state = await updateProfileAction(IDLE, form({ ...limits, id: ids.profile, name: "x y z" }));
    expect(state.fieldErrors?.reason).toMatch(/reason/);
  });
});

describe("instruments and calibration", () => {
  it("an engineer records a certificate (audited) and a due date before the calibration date is refused beside the field", async () => {
    as("engineer");
    const { createInstrumentAction, addCertificateAction } = await import("@/app/(portal)/instruments/actions");
    expect((await createInstrumentAction(IDLE, form({ name: "Logger C", serialNumber: "L-C", kind: "logger", channelCount: "12" }))).status).toBe("ok");
    const { instruments, calibrationCertificates } = await import("@/db/schema");
    const { eq } = await import("drizzle-orm");
    const [inst] = await ctx.db.select().from(instruments).where(eq(instruments.serialNumber, "L-C"));
    ids.instrument = inst.id;
    const bad = await addCertificateAction(IDLE, form({ instrumentId: inst.id, certificateNumber: "C-1", issuedBy: "Test lab", calibratedOn: "2025-03-01", dueOn: "2025-02-01" }));
    expect(bad.fieldErrors?.dueOn).toMatch(/after the calibration date/);
    const ok = await addCertificateAction(IDLE, form({ instrumentId: inst.id, certificateNumber: "C-1", issuedBy: "Test lab", calibratedOn: "2025-03-01", dueOn: "2026-03-01", uncertaintyK: "0,2" }));
    expect(ok.status).toBe("ok");
    const [cert] = await ctx.db.select().from(calibrationCertificates).where(eq(calibrationCertificates.instrumentId, inst.id));
    expect(cert).toMatchObject({ certificateNumber: "C-1", uncertaintyK: 0.2 });
    expect((await auditEventsFor(inst.id)).map((e) => e.action)).toEqual(["instrument.create", "calibration.add"]);
  });

  it("clearing a saved mapping needs an engineer and a reason, and keeps the old mapping in the ledger", async () => {
    const { instruments } = await import("@/db/schema");
    const { eq } = await import("drizzle-orm");
    await ctx.db
      .update(instruments)
      .set({ savedMapping: { time: "Time", pressure: "P" } })
      .where(eq(instruments.id, ids.instrument));
    const { clearMappingAction } = await import("@/app/(portal)/instruments/actions");
    as("technician");
    expect((await clearMappingAction(IDLE, form({ instrumentId: ids.instrument, reason: "probes re-wired" }))).message).toMatch(/role does not allow/);
    as("engineer");
    expect((await clearMappingAction(IDLE, form({ instrumentId: ids.instrument }))).fieldErrors?.reason).toBeTruthy();
    expect((await clearMappingAction(IDLE, form({ instrumentId: ids.instrument, reason: "probes re-wired" }))).status).toBe("ok");
    const [row] = await ctx.db.select().from(instruments).where(eq(instruments.id, ids.instrument));
    expect(row.savedMapping).toBeNull();
    const cleared = (await auditEventsFor(ids.instrument)).find((e) => e.action === "instrument.mapping-cleared")!;
    expect(JSON.parse(cleared.oldValue!)).toEqual({ savedMapping: { time: "Time", pressure: "P" } });
    expect(cleared.reason).toBe("probes re-wired");
  });
});

import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { useTemporaryDatabase } from "../support/test-db";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined, revalidateTag: () => undefined }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const ids: Record<string, string> = {};
type Who = "technician" | "engineer" | "auditor" | "admin" | "foreignEngineer";
const actors = {} as Record<Who, { id: string; email: string; name: string; role: "technician" | "engineer" | "auditor" | "admin"; siteId: string }>;

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { users, sites, sterilizers, loadingPatterns } = await import("@/db/schema");
  // Auckland keeps daylight saving time in December: UTC+13, so its calendar turns a new day at 11:00 UTC.
  const [site] = await ctx.db.insert(sites).values({ name: "Harbour site", code: "H", timeZone: "Pacific/Auckland" }).returning();
  const [other] = await ctx.db.insert(sites).values({ name: "Other site", code: "O" }).returning();
  for (const [key, role, siteId] of [
    ["technician", "technician", site.id],
    ["engineer", "engineer", site.id],
    ["auditor", "auditor", site.id],
    ["admin", "admin", site.id],
    ["foreignEngineer", "engineer", other.id],
  ] as const) {
    const [u] = await ctx.db
      .insert(users)
      .values({ email: `${key}@test.example`, name: `The ${key}`, role, passwordHash: "not used", siteId })
      .returning();
    ids[key] = u.id;
    actors[key] = { id: u.id, email: u.email, name: u.name, role, siteId };
  }
  const [porous] = await ctx.db.insert(sterilizers).values({ siteId: site.id, name: "Porous 1", serialNumber: "P-1", chamberVolumeL: 320 }).returning();
  ids.porous = porous.id;
  const pattern = (name: string, loadType: "wrapped-instruments" | "textiles" | null, requalificationDueOn: string | null) => ({
    siteId: site.id,
    sterilizerId: porous.id,
    name,
    loadType,
    items: [{ name: "Tray", quantity: 1 }],
    positions: [{ id: "P1", label: "Tray centre" }],
    createdBy: ids.engineer,
    requalificationDueOn,
  });
  const rows = await ctx.db
    .insert(loadingPatterns)
    .values([
      pattern("Orthopaedic trays", "wrapped-instruments", "2026-12-02"),
      pattern("Gown packs", "textiles", "2027-06-30"),
      pattern("Mixed load", null, null),
      pattern("Long overdue set", "wrapped-instruments", "2020-01-15"),
    ])
    .returning();
  for (const r of rows) ids[r.name] = r.id;
});
afterAll(() => ctx.cleanup());

async function overview(who: Who, now: Date) {
  const { getRequalificationOverview } = await import("@/lib/services/requalification");
  const { patterns } = await getRequalificationOverview({ actor: actors[who], now });
  return Object.fromEntries(patterns.map((p) => [p.name, p]));
}

async function ledger(entityId: string) {
  const { auditEvents } = await import("@/db/schema");
  const { and, eq } = await import("drizzle-orm");
  return ctx.db
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.entityType, "loading-pattern"), eq(auditEvents.entityId, entityId)));
}

describe("requalification due dates on the site's calendar", () => {
  it("a pattern due on 2 December is due (not overdue) at 22:59 in Auckland, and overdue from midnight there (11:00 UTC)", async () => {
    // 2026-12-02T09:59Z = 22:59 on 2 December in Auckland (UTC+13): the due date is today, not yet past.
    const before = await overview("engineer", new Date("2026-12-02T09:59:00Z"));
    expect(before["Orthopaedic trays"].state).toBe("due-soon");
    // 2026-12-02T11:30Z = 00:30 on 3 December in Auckland, although it is still 2 December in UTC.
    const after = await overview("engineer", new Date("2026-12-02T11:30:00Z"));
    expect(after["Orthopaedic trays"].state).toBe("overdue");
  });

  it("tells never qualified, qualified, due within 30 days and overdue apart, overdue first", async () => {
    const { getRequalificationOverview } = await import("@/lib/services/requalification");
    const { patterns, today } = await getRequalificationOverview({ actor: actors.technician, now: new Date("2026-12-02T11:30:00Z") });
    expect(today).toBe("2026-12-03");
    expect(patterns.map((p) => [p.name, p.state])).toEqual([
      ["Long overdue set", "overdue"],
      ["Orthopaedic trays", "overdue"],
      ["Mixed load", "never"],
      ["Gown packs", "ok"],
    ]);
    // 2027-06-30 is 28 days after 2 June 2027 (worked by hand): inside the 30-day window.
    const june = await overview("auditor", new Date("2027-06-02T00:00:00Z"));
    expect(june["Gown packs"].state).toBe("due-soon");
    // Without the before-use mark nothing is held.
    expect(patterns.every((p) => p.blockedNotice === null)).toBe(true);
  });

  it("gives an administrator (no study:read) no patterns", async () => {
    expect(await overview("admin", new Date("2026-12-02T11:30:00Z"))).toEqual({});
  });
});

describe("marking a pattern required before use", () => {
  it("is refused to a technician and an auditor (403) and to another site's engineer (404), changing nothing", async () => {
    const { setPatternRequiredBeforeUse } = await import("@/lib/services/requalification");
    const call = (who: Who) => setPatternRequiredBeforeUse({ actor: actors[who], patternId: ids["Long overdue set"], requiredBeforeUse: true, reason: "Yearly requalification missed" });
    await expect(call("technician")).rejects.toMatchObject({ status: 403 });
    await expect(call("auditor")).rejects.toMatchObject({ status: 403 });
    await expect(call("foreignEngineer")).rejects.toMatchObject({ status: 404 });
    expect(await ledger(ids["Long overdue set"])).toHaveLength(0);
  });

  it("needs a reason", async () => {
    const { setPatternRequiredBeforeUse } = await import("@/lib/services/requalification");
    await expect(setPatternRequiredBeforeUse({ actor: actors.engineer, patternId: ids["Long overdue set"], requiredBeforeUse: true, reason: "  " })).rejects.toMatchObject({
      status: 422,
      field: "reason",
    });
    expect(await ledger(ids["Long overdue set"])).toHaveLength(0);
  });

  it("is written to the ledger old → new with the reason, and the board then holds the load of an overdue pattern", async () => {
    const { setPatternRequiredBeforeUseAction } = await import("@/app/(portal)/sterilizers/[id]/actions");
    session.current = { user: { id: ids.engineer } };
    const form = new FormData();
    form.set("patternId", ids["Long overdue set"]);
    form.set("requiredBeforeUse", "true");
    form.set("reason", "Yearly requalification missed; hold wrapped instruments until the study is approved");
    const state = await setPatternRequiredBeforeUseAction({ status: "idle" }, form);
    expect(state.status).toBe("ok");
    const events = await ledger(ids["Long overdue set"]);
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({
      action: "loading-pattern.required-before-use",
      actorId: ids.engineer,
      reason: "Yearly requalification missed; hold wrapped instruments until the study is approved",
    });
    expect(JSON.parse(events[0].oldValue!)).toEqual({ requiredBeforeUse: false });
    expect(JSON.parse(events[0].newValue!)).toEqual({ requiredBeforeUse: true });

    const patterns = await overview("technician", new Date("2026-12-02T11:30:00Z"));
    expect(patterns["Long overdue set"].blockedNotice).toBe("Not to be used for wrapped instruments until requalified.");

    // The home page's board: the sterilizer stays in use; the held load is named beside it.
    const { getHomeDashboard } = await import("@/lib/services/dashboard");
    const home = await getHomeDashboard({ actor: actors.technician });
    const board = home.board.find((b) => b.id === ids.porous)!;
    expect(board.notices).toEqual(["Not to be used for wrapped instruments until requalified."]);
  });

  it("holds a never-qualified pattern too (fail closed), naming it when it has no load type", async () => {
    const { setPatternRequiredBeforeUse } = await import("@/lib/services/requalification");
    await setPatternRequiredBeforeUse({ actor: actors.engineer, patternId: ids["Mixed load"], requiredBeforeUse: true, reason: "Not to be run before its first study" });
    const patterns = await overview("engineer", new Date("2026-12-02T11:30:00Z"));
    expect(patterns["Mixed load"].blockedNotice).toBe("Not to be used for the load “Mixed load” until qualified.");
    expect(patterns["Gown packs"].blockedNotice).toBeNull();
  });

  it("records nothing when the mark does not change", async () => {
    const { setPatternRequiredBeforeUse } = await import("@/lib/services/requalification");
    const result = await setPatternRequiredBeforeUse({ actor: actors.engineer, patternId: ids["Long overdue set"], requiredBeforeUse: true, reason: "Again" });
    expect(result.changed).toBe(false);
    expect(await ledger(ids["Long overdue set"])).toHaveLength(1);
  });
});

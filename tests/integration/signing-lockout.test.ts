import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { useTemporaryDatabase } from "../support/test-db";

// Counts the passwords really checked at signing (argon2), while checking them for real.
const checks = vi.hoisted(() => ({ count: 0 }));
vi.mock("@/lib/auth/password", async (original) => {
  const real = await original<typeof import("@/lib/auth/password")>();
  return { ...real, verifyPassword: async (hash: string, password: string) => (checks.count++, real.verifyPassword(hash, password)) };
});

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const PASSWORD = "the right password for tests";
type Person = { id: string; email: string; name: string; role: "engineer"; siteId: string };
const people: Record<string, Person> = {};

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { users, sites } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const [site] = await ctx.db.insert(sites).values({ name: "Test site", code: "T" }).returning();
  const passwordHash = await hashPassword(PASSWORD);
  for (const key of ["racer", "steady", "newcomer"]) {
    const [u] = await ctx.db
      .insert(users)
      .values({ email: `${key}@test.example`, name: key, role: "engineer", passwordHash, siteId: site.id, mustChangePassword: key === "newcomer" })
      .returning();
    people[key] = { id: u.id, email: u.email, name: u.name, role: "engineer", siteId: site.id };
  }
});
afterAll(() => ctx.cleanup());

async function reauth(person: Person, password: string, now = new Date()) {
  const { reauthenticate } = await import("@/lib/services/reauthenticate");
  return reauthenticate({ actor: person, password, now, entity: { type: "cycle", id: "cycle-1" } });
}
async function events(userId: string) {
  const { auditEvents } = await import("@/db/schema");
  return (await ctx.db.select().from(auditEvents)).filter((e) => e.actorId === userId);
}

describe("the signature lockout, counted atomically", () => {
  it("50 parallel wrong passwords: at most 5 are checked, one lock event, and then even the right password is refused", async () => {
    checks.count = 0;
    const outcomes = await Promise.allSettled(Array.from({ length: 50 }, (_, i) => reauth(people.racer, `wrong ${i}`)));
    expect(outcomes.every((o) => o.status === "rejected")).toBe(true);
    expect(checks.count).toBeLessThanOrEqual(5);
    const log = await events(people.racer.id);
    expect(log.filter((e) => e.action === "signature.locked")).toHaveLength(1);
    expect(log.filter((e) => e.action === "signature.failed").length + 1).toBe(checks.count);
    const statuses = outcomes.map((o) => (o.status === "rejected" ? (o.reason as { status: number }).status : 200));
    expect(statuses.filter((s) => s === 401)).toHaveLength(4);
    expect(statuses.filter((s) => s === 423)).toHaveLength(46);
    await expect(reauth(people.racer, PASSWORD)).rejects.toMatchObject({ status: 423, message: expect.stringMatching(/Signing is locked after 5 wrong passwords; try again after \d\d:\d\d UTC/) });
  });

  it("a right password ends the run of failures; the lock runs out after 15 minutes", async () => {
    const t0 = new Date("2026-02-01T09:00:00.000Z");
    for (let i = 0; i < 4; i++) await expect(reauth(people.steady, "wrong", t0)).rejects.toMatchObject({ status: 401 });
    await expect(reauth(people.steady, PASSWORD, t0)).resolves.toMatchObject({ id: people.steady.id });
    for (let i = 0; i < 4; i++) await expect(reauth(people.steady, "wrong", t0)).rejects.toMatchObject({ status: 401 });
    await expect(reauth(people.steady, "wrong", t0)).rejects.toMatchObject({ status: 423 });
    await expect(reauth(people.steady, PASSWORD, new Date(t0.getTime() + 14 * 60_000))).rejects.toMatchObject({ status: 423 });
    await expect(reauth(people.steady, PASSWORD, new Date(t0.getTime() + 15 * 60_000 + 1000))).resolves.toMatchObject({ id: people.steady.id });
  });

  it("an account still on its one-time password cannot sign (403), and nothing is counted", async () => {
    checks.count = 0;
    await expect(reauth(people.newcomer, PASSWORD)).rejects.toMatchObject({ status: 403, message: expect.stringMatching(/^Choose your own password first/) });
    expect(checks.count).toBe(0);
  });
});

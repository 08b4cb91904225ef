import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import type { JWT } from "next-auth/jwt";
import type { Session } from "next-auth";
import { useTemporaryDatabase } from "../support/test-db";

// getServerSession runs next-auth's own jwt and session callbacks on the token under test, as a request would.
const cookie = vi.hoisted(() => ({ token: null as null | Record<string, unknown> }));
vi.mock("next-auth", async (original) => {
  const real = await original<typeof import("next-auth")>();
  return {
    ...real,
    getServerSession: async () => {
      if (!cookie.token) return null;
      const { authOptions } = await import("@/lib/auth/options");
      const callbacks = authOptions().callbacks!;
      const token = await callbacks.jwt!({ token: cookie.token as JWT } as never);
      return callbacks.session!({ session: { user: {}, expires: "" } as unknown as Session, token } as never);
    },
  };
});

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const PASSWORD = "the right password for tests";
type Person = { id: string; email: string; name: string; role: "engineer" | "admin"; siteId: string };
const people: Record<string, Person> = {};

beforeAll(async () => {
  process.env.PAPIN_SESSION_IDLE_MINUTES = "30";
  process.env.PAPIN_SESSION_MAX_HOURS = "12";
  ctx = await useTemporaryDatabase();
  const { users, sites } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const [site] = await ctx.db.insert(sites).values({ name: "Test site", code: "T" }).returning();
  const passwordHash = await hashPassword(PASSWORD);
  for (const [key, role] of [
    ["engineer", "engineer"],
    ["admin", "admin"],
  ] as const) {
    const [u] = await ctx.db
      .insert(users)
      .values({ email: `${key}@test.example`, name: key, role, passwordHash, siteId: site.id })
      .returning();
    people[key] = { id: u.id, email: u.email, name: u.name, role, siteId: site.id };
  }
});
afterAll(() => ctx.cleanup());
afterEach(() => vi.useRealTimers());

/** A session as sign-in makes it: authorize, then the jwt callback with the user. */
async function signIn(email: string, password: string): Promise<JWT> {
  const { authOptions } = await import("@/lib/auth/options");
  const options = authOptions();
  const provider = options.providers[0] as unknown as { options: { authorize: (c: unknown, r: unknown) => Promise<unknown> } };
  const user = await provider.options.authorize({ email, password }, { headers: {} });
  expect(user).not.toBeNull();
  return options.callbacks!.jwt!({ token: { email, name: email }, user, trigger: "signIn" } as never);
}
async function actorWith(token: JWT | null) {
  cookie.token = token as Record<string, unknown> | null;
  const { currentUser } = await import("@/lib/auth/guards");
  return currentUser();
}

describe("revocable sessions", () => {
  it("sign-out ends the session everywhere: the old token is refused, and the ledger says so once", async () => {
    const token = await signIn(people.engineer.email, PASSWORD);
    const other = await signIn(people.engineer.email, PASSWORD);
    expect(await actorWith(token)).toMatchObject({ id: people.engineer.id });
    const { authOptions } = await import("@/lib/auth/options");
    await authOptions().events!.signOut!({ token } as never);
    await authOptions().events!.signOut!({ token } as never);
    expect(await actorWith(token)).toBeNull();
    expect(await actorWith(other)).toBeNull();
    const { auditEvents } = await import("@/db/schema");
    expect((await ctx.db.select().from(auditEvents)).filter((e) => e.action === "auth.sign-out")).toHaveLength(1);
    expect(await actorWith(await signIn(people.engineer.email, PASSWORD))).toMatchObject({ id: people.engineer.id });
  });

  it("an administrator's password reset, role change or disabling ends the person's sessions", async () => {
    const { resetPassword, updateUser } = await import("@/lib/services/users");
    const { users } = await import("@/db/schema");
    const { eq } = await import("drizzle-orm");
    let token = await signIn(people.engineer.email, PASSWORD);
    await updateUser({ actor: people.admin, id: people.engineer.id, changes: { role: "auditor" }, reason: "moved to audit" });
    expect(await actorWith(token)).toBeNull();
    await updateUser({ actor: people.admin, id: people.engineer.id, changes: { role: "engineer" }, reason: "back" });

    token = await signIn(people.engineer.email, PASSWORD);
    const renamed = await signIn(people.engineer.email, PASSWORD);
    await updateUser({ actor: people.admin, id: people.engineer.id, changes: { name: "Engineer Renamed" } });
    expect(await actorWith(renamed)).toMatchObject({ name: "Engineer Renamed" });
    await updateUser({ actor: people.admin, id: people.engineer.id, changes: { disabled: true }, reason: "left" });
    await updateUser({ actor: people.admin, id: people.engineer.id, changes: { disabled: false }, reason: "returned" });
    expect(await actorWith(token)).toBeNull();

    token = await signIn(people.engineer.email, PASSWORD);
    const { oneTimePassword } = await resetPassword({ actor: people.admin, id: people.engineer.id });
    expect(await actorWith(token)).toBeNull();
    // Put the known password back for the next tests (a reset leaves a one-time password to be changed).
    const { hashPassword } = await import("@/lib/auth/password");
    expect(oneTimePassword).not.toBe(PASSWORD);
    await ctx.db
      .update(users)
      .set({ passwordHash: await hashPassword(PASSWORD), mustChangePassword: false })
      .where(eq(users.id, people.engineer.id));
  });

  it("idle for more than 30 minutes: signed out; activity keeps the session, refreshed at most once a minute", async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(new Date("2026-03-01T08:00:00.000Z"));
    const token = await signIn(people.admin.email, PASSWORD);
    const { authOptions } = await import("@/lib/auth/options");
    const jwt = authOptions().callbacks!.jwt!;
    vi.setSystemTime(new Date("2026-03-01T08:00:30.000Z"));
    expect(await jwt({ token } as never)).toBe(token); // under a minute: the same token, no new cookie
    vi.setSystemTime(new Date("2026-03-01T08:29:00.000Z"));
    const refreshed = await jwt({ token } as never);
    expect(refreshed.seenAt).toBe(Date.parse("2026-03-01T08:29:00.000Z"));
    vi.setSystemTime(new Date("2026-03-01T08:58:00.000Z"));
    expect(await actorWith(refreshed)).toMatchObject({ id: people.admin.id });
    expect(await actorWith(token)).toBeNull(); // the token without the refresh has been idle 58 min
    vi.setSystemTime(new Date("2026-03-01T08:59:01.000Z"));
    expect(await actorWith(refreshed)).toBeNull(); // 30 min and 1 s after its last activity
  });

  it("an active session still ends 12 hours after sign-in", async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(new Date("2026-03-02T06:00:00.000Z"));
    let token = await signIn(people.admin.email, PASSWORD);
    const { authOptions } = await import("@/lib/auth/options");
    const jwt = authOptions().callbacks!.jwt!;
    for (let minutes = 20; minutes <= 12 * 60; minutes += 20) {
      vi.setSystemTime(new Date(Date.parse("2026-03-02T06:00:00.000Z") + minutes * 60_000));
      token = await jwt({ token } as never);
    }
    expect(await actorWith(token)).toMatchObject({ id: people.admin.id }); // exactly 12 h: still inside
    vi.setSystemTime(new Date("2026-03-02T18:00:01.000Z"));
    expect(await actorWith(token)).toBeNull();
  });

  it("a token without the session fields (made before sessions carried them) is signed out", async () => {
    expect(await actorWith({ uid: people.admin.id, role: "admin", siteId: people.admin.siteId })).toBeNull();
  });
});

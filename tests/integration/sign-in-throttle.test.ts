import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { useTemporaryDatabase } from "../support/test-db";

// Counts how many passwords are really checked (argon2), while checking them for real.
const checks = vi.hoisted(() => ({ count: 0 }));
vi.mock("@/lib/auth/password", async (original) => {
  const real = await original<typeof import("@/lib/auth/password")>();
  return { ...real, verifyPassword: async (hash: string, password: string) => (checks.count++, real.verifyPassword(hash, password)) };
});

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const PASSWORD = "the right password for tests";
const people: Record<string, { id: string; email: string; name: string; role: "engineer" | "admin"; siteId: string }> = {};

beforeAll(async () => {
  process.env.PAPIN_SIGNIN_MAX_FAILURES = "5";
  process.env.PAPIN_SIGNIN_LOCK_MINUTES = "15";
  ctx = await useTemporaryDatabase();
  const { users, sites } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const [site] = await ctx.db.insert(sites).values({ name: "Berlin site", code: "BER", timeZone: "Europe/Berlin" }).returning();
  const passwordHash = await hashPassword(PASSWORD);
  for (const [key, role] of [
    ["engineer", "engineer"],
    ["other", "engineer"],
    ["spare", "engineer"],
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
beforeEach(() => {
  delete process.env.PAPIN_TRUST_PROXY;
});

const at = (iso: string, plusS = 0) => new Date(new Date(iso).getTime() + plusS * 1000);
async function attempt(email: string, password: string, now: Date, headers?: Record<string, string>) {
  const { signInWithPassword } = await import("@/lib/services/sign-in");
  const result = await signInWithPassword({ email, password, now, headers });
  return result.ok ? "ok" : result.code;
}
async function ledger(action?: string) {
  const { auditEvents } = await import("@/db/schema");
  const rows = await ctx.db.select().from(auditEvents);
  return action ? rows.filter((e) => e.action === action) : rows;
}

describe("sign-in throttling per account", () => {
  it("delays, then locks after 5 failures; the right password is refused while locked; one ledger event; an administrator unlocks", async () => {
    const t0 = "2026-01-15T10:00:00.000Z";
    const email = people.engineer.email;
    const before = (await ledger()).length;
    expect(await attempt(email, "wrong 1", at(t0))).toBe("CredentialsSignin");
    expect(await attempt(email, "wrong 2", at(t0))).toBe("CredentialsSignin");
    // After 2 failures the next attempt waits 1 s (delay table 0, 0, 1, 2, 4 s): refused unchecked.
    checks.count = 0;
    expect(await attempt(email, PASSWORD, at(t0, 0.5))).toBe("SignInDelay|1");
    expect(checks.count).toBe(0);
    expect(await attempt(email, "wrong 3", at(t0, 1))).toBe("CredentialsSignin");
    expect(await attempt(email, "wrong 4", at(t0, 3))).toBe("CredentialsSignin");
    const code = await attempt(email, "wrong 5", at(t0, 7));
    expect(code).toBe("AccountLocked|2026-01-15T10:15:07.000Z|Europe/Berlin");
    const { signInErrorMessage } = await import("@/lib/auth/messages");
    // Berlin is UTC+1 in January (CET): 10:15 UTC is 11:15 there (worked by hand).
    expect(signInErrorMessage(code)).toBe("Too many failed sign-ins: this account is locked until 11:15 site time (10:15 UTC); ask an administrator to unlock it.");

    checks.count = 0;
    expect(await attempt(email, PASSWORD, at(t0, 60))).toMatch(/^AccountLocked\|2026-01-15T10:15:07/);
    expect(await attempt(email, "wrong again", at(t0, 120))).toMatch(/^AccountLocked/);
    expect(checks.count).toBe(0);

    const locked = await ledger("account.locked");
    expect(locked).toHaveLength(1);
    expect(locked[0]).toMatchObject({ entityType: "user", entityId: people.engineer.id, actorEmail: email });
    expect(await ledger("auth.sign-in-failed")).toHaveLength(0);
    // Five failures and a lock: the ledger grew by the lock event only.
    expect((await ledger()).length).toBe(before + 1);

    const { listUsers, unlockUser } = await import("@/lib/services/users");
    const rows = await listUsers({ actor: people.admin, now: at(t0, 180) });
    expect(rows.find((r) => r.id === people.engineer.id)?.signInLockedUntil).toBe("2026-01-15T10:15:07.000Z");
    await unlockUser({ actor: people.admin, id: people.engineer.id, reason: "called from the ward, identity checked", now: at(t0, 180) });
    const [unlocked] = await ledger("account.unlocked");
    expect(unlocked).toMatchObject({ entityId: people.engineer.id, actorId: people.admin.id, reason: "called from the ward, identity checked" });
    expect(JSON.parse(unlocked.oldValue ?? "{}")).toMatchObject({ signInLockedUntil: "2026-01-15T10:15:07.000Z" });
    expect(await attempt(email, PASSWORD, at(t0, 181))).toBe("ok");
    expect(await ledger("auth.sign-in")).toHaveLength(1);
  });

  it("a lock runs out after the configured time, and the right password then works", async () => {
    const t0 = "2026-01-15T12:00:00.000Z";
    const email = people.other.email;
    for (const s of [0, 0, 1, 3, 7]) await attempt(email, "wrong", at(t0, s));
    expect(await attempt(email, PASSWORD, at(t0, 14 * 60))).toMatch(/^AccountLocked/);
    expect(await attempt(email, PASSWORD, at(t0, 7 + 15 * 60))).toBe("ok");
  });

  it("parallel wrong passwords cannot outrun the count: of 30 at once, only those the delay table lets through are checked", async () => {
    checks.count = 0;
    const now = at("2026-01-16T08:00:00.000Z");
    const results = await Promise.all(Array.from({ length: 30 }, () => attempt(people.spare.email, "wrong", now)));
    // 0 and 1 earlier failures need no wait; the third attempt must wait 1 s.
    expect(checks.count).toBe(2);
    expect(results.filter((r) => r === "CredentialsSignin")).toHaveLength(2);
    expect(results.filter((r) => r.startsWith("SignInDelay"))).toHaveLength(28);
  });

  it("an unknown e-mail grows nothing but its own throttle row, which goes away once stale", async () => {
    const { signInThrottle } = await import("@/db/schema");
    const before = (await ledger()).length;
    const t0 = "2026-01-17T08:00:00.000Z";
    for (const s of [0, 0, 1, 3, 7, 15, 31, 62]) await attempt("nobody@test.example", "guess", at(t0, s));
    expect((await ledger()).length).toBe(before);
    const rows = await ctx.db.select().from(signInThrottle);
    expect(rows.filter((r) => r.key.includes("nobody"))).toEqual([expect.objectContaining({ key: "account:nobody@test.example", failures: 5 })]);
    // After the lock has run out the next attempt (any e-mail) clears the row.
    await attempt(people.spare.email, "wrong", at(t0, 3600));
    expect((await ctx.db.select().from(signInThrottle)).filter((r) => r.key.includes("nobody"))).toHaveLength(0);
  });
});

describe("sign-in throttling per client address", () => {
  it("behind a trusted proxy, one address spraying many accounts is locked after 4 × 5 failures; other addresses are not", async () => {
    process.env.PAPIN_TRUST_PROXY = "true";
    const t0 = "2026-01-18T08:00:00.000Z";
    // The last X-Forwarded-For entry is the one the trusted proxy added; the first is whatever the client claimed.
    const from = { "x-forwarded-for": "10.9.9.9, 203.0.113.7" };
    const ledgerBefore = (await ledger()).length;
    const delays = [0, 0, 1, 2, 4, 8, 16, 30];
    let t = 0;
    const codes: string[] = [];
    for (let i = 0; i < 20; i++) {
      t += delays[Math.min(i, delays.length - 1)];
      codes.push(await attempt(`spray${i}@test.example`, "guess", at(t0, t), from));
    }
    expect(codes.slice(0, 19).every((c) => c === "CredentialsSignin")).toBe(true);
    expect(codes[19]).toMatch(/^AddressLocked\|/);
    expect(await attempt(people.admin.email, PASSWORD, at(t0, t + 60), from)).toMatch(/^AddressLocked/);
    expect(await attempt(people.admin.email, PASSWORD, at(t0, t + 60), { "x-forwarded-for": "203.0.113.8" })).toBe("ok");
    // Unknown e-mails and an address lock: nothing in the ledger but the admin's sign-in.
    expect((await ledger()).slice(ledgerBefore).map((e) => e.action)).toEqual(["auth.sign-in"]);
  });

  it('without PAPIN_TRUST_PROXY the header is ignored: every request is the bucket "direct"', async () => {
    const { clientAddress } = await import("@/lib/auth/sign-in-throttle");
    expect(clientAddress({ "x-forwarded-for": "203.0.113.7" }, false)).toBe("direct");
    expect(clientAddress({ "x-forwarded-for": "1.2.3.4, 203.0.113.7" }, true)).toBe("203.0.113.7");
    expect(clientAddress({}, true)).toBe("direct");
  });
});

describe("next-auth's authorize", () => {
  it("hands a lock to the form as its code, and a wrong password as a plain refusal", async () => {
    const { authOptions } = await import("@/lib/auth/options");
    const provider = authOptions().providers[0] as unknown as { options: { authorize: (c: unknown, r: unknown) => Promise<unknown> } };
    const authorize = provider.options.authorize;
    const email = "locked-out@test.example";
    await expect(authorize({ email, password: "x" }, { headers: {} })).resolves.toBeNull();
    const { signInThrottle } = await import("@/db/schema");
    await ctx.db
      .insert(signInThrottle)
      .values({ key: `account:${email}`, failures: 5, lockedUntil: "2999-01-01T00:00:00.000Z", lastFailureAt: new Date().toISOString() })
      .onConflictDoUpdate({
        target: signInThrottle.key,
        set: { failures: 5, lockedUntil: "2999-01-01T00:00:00.000Z" },
      });
    await expect(authorize({ email, password: "x" }, { headers: {} })).rejects.toThrow(/^AccountLocked\|2999-01-01T00:00:00.000Z\|$/);
    await expect(authorize({ email: people.admin.email, password: PASSWORD }, { headers: {} })).resolves.toMatchObject({ id: people.admin.id, sessionVersion: 0 });
  });
});

// The session read straight from its cookie (issue 12: next-auth's session machinery on every API request) must give
// exactly what next-auth would, and step aside whenever next-auth has something to do: activity to write back, a
// session past its limits, a cookie it cannot read.
import { beforeEach, describe, expect, it, vi } from "vitest";
import { encode } from "next-auth/jwt";

const jar = vi.hoisted(() => new Map<string, string>());
vi.mock("next/headers", () => ({
  cookies: async () => ({ get: (name: string) => (jar.has(name) ? { name, value: jar.get(name)! } : undefined), has: (name: string) => jar.has(name) }),
}));

const SECRET = "unit-test-secret-for-the-session-cookie-0123";
const NAME = "next-auth.session-token";

beforeEach(() => {
  jar.clear();
  vi.stubEnv("NEXTAUTH_SECRET", SECRET);
  vi.stubEnv("NEXTAUTH_URL", "http://papin.test");
  vi.stubEnv("PAPIN_SESSION_IDLE_MINUTES", "30");
  vi.stubEnv("PAPIN_SESSION_MAX_HOURS", "12");
});

async function cookieWith(claims: Record<string, unknown>) {
  jar.set(NAME, await encode({ token: claims, secret: SECRET, maxAge: 12 * 3600 }));
}

describe("sessionFromCookie", () => {
  it("names the account and session version of a session active within the last minute", async () => {
    const { sessionFromCookie } = await import("@/lib/auth/session-cookie");
    const now = Date.now();
    await cookieWith({ uid: "user-1", sv: 3, authAt: now - 3_600_000, seenAt: now - 10_000 });
    expect(await sessionFromCookie()).toEqual({ id: "user-1", sessionVersion: 3 });
  });

  it("steps aside when the last activity is due to be written back, so next-auth writes the new cookie", async () => {
    const { sessionFromCookie } = await import("@/lib/auth/session-cookie");
    const now = Date.now();
    await cookieWith({ uid: "user-2", sv: 1, authAt: now - 600_000, seenAt: now - 61_000 });
    expect(await sessionFromCookie()).toBeUndefined();
  });

  it("steps aside for a session idle too long or past its lifetime, and for a cookie without the session fields", async () => {
    const { sessionFromCookie } = await import("@/lib/auth/session-cookie");
    const now = Date.now();
    await cookieWith({ uid: "user-3", sv: 1, authAt: now - 3_600_000, seenAt: now - 31 * 60_000 });
    expect(await sessionFromCookie()).toBeUndefined();
    await cookieWith({ uid: "user-3", sv: 1, authAt: now - 13 * 3_600_000, seenAt: now - 5_000 });
    expect(await sessionFromCookie()).toBeUndefined();
    await cookieWith({ uid: "user-3", authAt: now, seenAt: now });
    expect(await sessionFromCookie()).toBeUndefined();
  });

  it("steps aside without a cookie, for an altered one, for one sealed with another secret and for a split one", async () => {
    const { sessionFromCookie } = await import("@/lib/auth/session-cookie");
    expect(await sessionFromCookie()).toBeUndefined();
    const now = Date.now();
    await cookieWith({ uid: "user-4", sv: 1, authAt: now, seenAt: now });
    jar.set(NAME, `${jar.get(NAME)!.slice(0, -4)}AAAA`);
    expect(await sessionFromCookie()).toBeUndefined();
    jar.set(NAME, await encode({ token: { uid: "user-4", sv: 1, authAt: now, seenAt: now }, secret: `${SECRET}x`, maxAge: 3600 }));
    expect(await sessionFromCookie()).toBeUndefined();
    await cookieWith({ uid: "user-4", sv: 1, authAt: now, seenAt: now });
    jar.set(`${NAME}.0`, "part");
    expect(await sessionFromCookie()).toBeUndefined();
  });
});

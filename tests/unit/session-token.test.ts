// The decoded session cookie is kept per cookie (issue 12: no key derivation and decryption on every request), but
// never past the cookie's own expiry, and a cookie that does not decode is never accepted.
import { afterEach, describe, expect, it, vi } from "vitest";
import { encode } from "next-auth/jwt";
import { decodeSessionToken } from "@/lib/auth/session-token";

const secret = "unit-test-secret-not-for-production-0123456789";

afterEach(() => vi.useRealTimers());

describe("decodeSessionToken", () => {
  it("decodes a cookie to its claims, the same on a second request", async () => {
    const token = await encode({ token: { uid: "u1", sv: 2 }, secret, maxAge: 3600 });
    const first = await decodeSessionToken({ token, secret });
    expect(first).toMatchObject({ uid: "u1", sv: 2 });
    expect(await decodeSessionToken({ token, secret })).toEqual(first);
  });

  it("refuses a kept cookie once it has expired (past next-auth's 15 s tolerance)", async () => {
    const token = await encode({ token: { uid: "u2" }, secret, maxAge: 60 });
    expect(await decodeSessionToken({ token, secret })).toMatchObject({ uid: "u2" });
    vi.useFakeTimers({ now: Date.now() + 120_000 });
    await expect(decodeSessionToken({ token, secret })).rejects.toThrow();
  });

  it("refuses an altered cookie and a cookie sealed with another secret", async () => {
    const token = await encode({ token: { uid: "u3" }, secret, maxAge: 3600 });
    await expect(decodeSessionToken({ token: `${token.slice(0, -4)}AAAA`, secret })).rejects.toThrow();
    await expect(decodeSessionToken({ token: await encode({ token: { uid: "u3" }, secret: `${secret}x`, maxAge: 3600 }), secret })).rejects.toThrow();
  });
});

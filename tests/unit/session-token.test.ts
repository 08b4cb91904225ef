// The decoded session cookie is kept per cookie (issue 12: no key derivation and decryption on every request), but
// never past the cookie's own expiry, and a cookie that does not decode is never accepted.
import { afterEach, describe, expect, it, vi } from "vitest";
import { decode, encode } from "next-auth/jwt";
import { decodeSessionToken, encodeSessionToken } from "@/lib/auth/session-token";

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

describe("encodeSessionToken", () => {
  it("sends back the cookie itself when the claims to seal are exactly those it carries", async () => {
    const token = await encode({ token: { uid: "u4", sv: 1, seenAt: 1 }, secret, maxAge: 3600 });
    const claims = (await decodeSessionToken({ token, secret }))!;
    expect(await encodeSessionToken({ token: claims, secret, maxAge: 3600 })).toBe(token);
  });

  it("seals anew when a claim changed (the last activity written back), or under another secret", async () => {
    const token = await encode({ token: { uid: "u5", sv: 1, seenAt: 1 }, secret, maxAge: 3600 });
    const claims = (await decodeSessionToken({ token, secret }))!;
    const moved = await encodeSessionToken({ token: { ...claims, seenAt: 2 }, secret, maxAge: 3600 });
    expect(moved).not.toBe(token);
    expect(await decode({ token: moved, secret })).toMatchObject({ uid: "u5", seenAt: 2 });
    const otherSecret = `${secret}x`;
    const resealed = await encodeSessionToken({ token: claims, secret: otherSecret, maxAge: 3600 });
    expect(resealed).not.toBe(token);
    expect(await decode({ token: resealed, secret: otherSecret })).toMatchObject({ uid: "u5", seenAt: 1 });
  });
});

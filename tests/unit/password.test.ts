import { describe, expect, it } from "vitest";
import { hashPassword, oneTimePassword, verifyPassword } from "@/lib/auth/password";

describe("password hashing", () => {
  it("stores an argon2id hash that verifies the right password only", async () => {
    const hash = await hashPassword("correct horse battery");
    expect(hash.startsWith("$argon2id$")).toBe(true);
    expect(hash).not.toContain("correct horse");
    expect(await verifyPassword(hash, "correct horse battery")).toBe(true);
    expect(await verifyPassword(hash, "correct horse batterY")).toBe(false);
  });

  it("salts each hash, so the same password gives different hashes", async () => {
    expect(await hashPassword("same password!")).not.toBe(await hashPassword("same password!"));
  });

  it("treats a malformed stored hash as a failed check, not a crash", async () => {
    expect(await verifyPassword("not-a-hash", "anything")).toBe(false);
  });

  it("makes one-time passwords of 4 × 5 unambiguous characters, different each time", () => {
    const made = new Set(Array.from({ length: 50 }, () => oneTimePassword()));
    expect(made.size).toBe(50);
    for (const p of made) expect(p).toMatch(/^[a-hjkmnp-z2-9]{5}(-[a-hjkmnp-z2-9]{5}){3}$/);
  });
});

import { createHash } from "node:crypto";
import canonicalizeJson from "canonicalize";

/** RFC 8785 canonical JSON: the same value always gives the same bytes, whatever the key order. */
export function canonicalJson(value: unknown): string {
  const text = canonicalizeJson(value);
  if (text === undefined) throw new Error("This value cannot be written as canonical JSON.");
  return text;
}

export function sha256Hex(data: string | Uint8Array): string {
  return createHash("sha256").update(data).digest("hex");
}

export const GENESIS_HASH = "0".repeat(64);

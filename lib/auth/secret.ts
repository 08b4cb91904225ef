import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { randomBytes } from "node:crypto";
import path from "node:path";
import { env } from "@/lib/env";

/**
 * Production needs NEXTAUTH_SECRET from the environment. In development a secret is made on
 * first run and kept in data/, so the quick start needs no configuration.
 */
export function sessionSecret(): string {
  const { NEXTAUTH_SECRET: fromEnv, NODE_ENV } = env();
  if (fromEnv && fromEnv.length >= 16) return fromEnv;
  if (NODE_ENV === "production") {
    throw new Error("NEXTAUTH_SECRET is not set: a production server needs a secret of at least 16 characters.");
  }
  const file = path.resolve("data", ".session-secret");
  if (existsSync(file)) return readFileSync(file, "utf8").trim();
  mkdirSync(path.dirname(file), { recursive: true });
  const secret = randomBytes(32).toString("base64url");
  writeFileSync(file, secret, { mode: 0o600 });
  return secret;
}

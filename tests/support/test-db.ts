import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";

/**
 * Points Papin at a new, migrated SQLite file. Call before importing anything that reads the
 * environment (db/, lib/auth/...), then import those modules dynamically.
 */
export async function useTemporaryDatabase() {
  const dir = mkdtempSync(path.join(tmpdir(), "papin-test-"));
  process.env.DATABASE_URL = `file:${path.join(dir, "papin.db")}`;
  process.env.NEXTAUTH_SECRET ??= "test-secret-0123456789abcdef";
  const { getDb } = await import("@/db");
  const { migrateDatabase } = await import("@/db/migrate");
  const db = getDb();
  await migrateDatabase(db);
  return {
    db,
    dir,
    cleanup: () => rmSync(dir, { recursive: true, force: true }),
  };
}

/** The database's own words for a failed statement (drizzle wraps them in a query error). */
export async function failureOf(promise: Promise<unknown>): Promise<string> {
  try {
    await promise;
  } catch (error) {
    const parts: string[] = [];
    for (let e: unknown = error; e instanceof Error; e = (e as Error & { cause?: unknown }).cause) parts.push(e.message);
    return parts.join(" | ");
  }
  throw new Error("The statement was expected to fail but succeeded.");
}

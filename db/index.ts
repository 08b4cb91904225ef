import { createClient, type Client } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import { mkdirSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import * as schema from "./schema";
import { env } from "@/lib/env";
import { closeConnectionsThatMeetBusy, retryingWhenBusy } from "./busy-retry";

export type Database = LibSQLDatabase<typeof schema>;
export type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];
export type Executor = Database | Transaction;

type Cache = { client?: Client; db?: Database; url?: string };
// Survives hot reloads in development, so each edit does not open another connection pool.
const cache = globalThis as unknown as { __papinDb?: Cache };
cache.__papinDb ??= {};

/** The file behind an embedded database's URL; null for a libSQL server. */
export function filePathOf(url: string): string | null {
  if (!url.startsWith("file:")) return null;
  const rest = url.slice("file:".length);
  if (rest.startsWith("//")) return fileURLToPath(url);
  return path.resolve(rest);
}

export function openClient(url: string, authToken?: string, { busyTimeoutMs = 5000 } = {}): Client {
  const file = filePathOf(url);
  if (file) mkdirSync(path.dirname(file), { recursive: true });
  closeConnectionsThatMeetBusy();
  // `timeout` becomes SQLite's busy timeout on every pooled connection.
  return createClient({ url, authToken, timeout: busyTimeoutMs });
}

export async function applyFilePragmas(client: Client, url: string) {
  if (!filePathOf(url)) return;
  await client.execute("PRAGMA journal_mode = WAL");
  await client.execute("PRAGMA foreign_keys = ON");
}

export function getDb(): Database {
  const { DATABASE_URL, DATABASE_AUTH_TOKEN } = env();
  const c = cache.__papinDb!;
  if (!c.db || c.url !== DATABASE_URL) {
    c.client = openClient(DATABASE_URL, DATABASE_AUTH_TOKEN);
    c.db = retryingWhenBusy(c.client, drizzle(c.client, { schema }));
    c.url = DATABASE_URL;
  }
  return c.db;
}

export function databaseUrl(): string {
  return env().DATABASE_URL;
}

export { schema };

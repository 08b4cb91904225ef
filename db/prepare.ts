/**
 * Run before the server starts (npm run dev / npm start): applies migrations, then loads the demo
 * site when the database is empty and PAPIN_DEMO is not 0. `--reset` deletes an embedded database
 * file first; `--no-demo` only migrates; `--start` (npm start) first refuses to go on without the
 * production settings, so a server never starts "ready" only to answer 500 to everyone.
 */
import { existsSync, renameSync, rmSync } from "node:fs";
import path from "node:path";
import { drizzle } from "drizzle-orm/libsql";
import { applyFilePragmas, openClient } from "./index";
import * as schema from "./schema";
import { migrateDatabase } from "./migrate";
import { loadDemoSite } from "./seed";
import { env, demoEnabled, productionStartRefusal } from "@/lib/env";

async function main() {
  const args = new Set(process.argv.slice(2));
  const refusal = args.has("--start") ? productionStartRefusal() : null;
  if (refusal) {
    console.error(refusal);
    process.exit(1);
  }
  const { DATABASE_URL, DATABASE_AUTH_TOKEN, PAPIN_DEMO_PASSWORD } = env();
  if (args.has("--reset")) {
    if (!DATABASE_URL.startsWith("file:")) {
      throw new Error("db:reset only deletes an embedded database file; reset a libSQL server with its own tools.");
    }
    const file = path.resolve(DATABASE_URL.slice("file:".length));
    for (const suffix of ["", "-wal", "-shm"]) if (existsSync(file + suffix)) rmSync(file + suffix);
    console.log(`Deleted ${path.relative(process.cwd(), file)}.`);
    // The old ledger's anchors would call the new ledger tampered with: kept aside, not deleted.
    const { ledgerAnchorFile } = await import("@/lib/services/ledger-anchors");
    const anchors = ledgerAnchorFile();
    if (existsSync(anchors)) renameSync(anchors, `${anchors}.before-reset-${new Date().toISOString().replace(/[-:.]/g, "")}`);
  }
  const client = openClient(DATABASE_URL, DATABASE_AUTH_TOKEN);
  await applyFilePragmas(client, DATABASE_URL);
  const db = drizzle(client, { schema });
  await migrateDatabase(db);
  console.log(`Database ready (${DATABASE_URL.startsWith("file:") ? DATABASE_URL : "libSQL server"}).`);
  if (!args.has("--no-demo") && demoEnabled()) {
    const started = Date.now();
    const outcome = await loadDemoSite(db, { password: PAPIN_DEMO_PASSWORD });
    if (outcome.loaded) console.log(`Demo site loaded: ${outcome.summary} (${((Date.now() - started) / 1000).toFixed(1)} s).`);
    else console.log("Demo site: the database already holds data, nothing loaded.");
  }
  client.close();
}

/** The deepest plain reason behind a failure (drizzle wraps the driver's error in a query error). */
function reasonOf(error: unknown): string {
  const messages: string[] = [];
  for (let e: unknown = error; e instanceof Error; e = (e as Error & { cause?: unknown }).cause) messages.push(e.message);
  const all = messages.join(" | ");
  if (/HTTP status 401|401 Unauthorized/i.test(all)) return "the libSQL server at DATABASE_URL refused DATABASE_AUTH_TOKEN (HTTP 401)";
  if (/ECONNREFUSED|fetch failed/i.test(all)) return `nothing answers at DATABASE_URL (${env().DATABASE_URL})`;
  return messages.at(-1) ?? String(error);
}

main().catch((error: unknown) => {
  console.error(`Papin could not prepare its database: ${reasonOf(error)}`);
  process.exit(1);
});

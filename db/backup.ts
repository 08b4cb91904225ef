/**
 * Backup and restore of the embedded database file.
 *
 *   npm run db:backup [-- --to <file>]   a consistent online copy (VACUUM INTO), by default data/backups/papin-<UTC>.db
 *   npm run db:restore -- <file>         puts a backup back in place; the current file is kept as <name>.before-restore-<UTC>
 *
 * A restore refuses a file that is not a Papin database, one made by a newer Papin, one whose audit chain does not
 * verify, and a live database that something (the portal) still holds open. An older backup is migrated first.
 * A libSQL server is backed up with the server's own tooling.
 */
import { spawnSync } from "node:child_process";
import { chmodSync, copyFileSync, existsSync, mkdirSync, openSync, readFileSync, readSync, readdirSync, readlinkSync, realpathSync, closeSync, renameSync, rmSync, statSync } from "node:fs";
import path from "node:path";
import { drizzle } from "drizzle-orm/libsql";
import { filePathOf, openClient, schema } from "./index";
import { MIGRATIONS_FOLDER, migrateDatabase } from "./migrate";
import { env, environmentForChildProcess } from "@/lib/env";
import type { verifyAuditChain } from "@/lib/services/audit";

const root = path.resolve(import.meta.dirname, "..");
const PAPIN_TABLES = ["__drizzle_migrations", "sites", "users", "cycles", "reports", "audit_events"];

class Refusal extends Error {}

function relative(file: string): string {
  const inside = path.relative(process.cwd(), file);
  return inside && !inside.startsWith("..") ? inside : file;
}
const utcStamp = () =>
  new Date()
    .toISOString()
    .replace(/[-:]/g, "")
    .replace(/\.\d+Z$/, "Z");

async function main() {
  const [command, ...args] = process.argv.slice(2);
  const { DATABASE_URL } = env();
  const live = filePathOf(DATABASE_URL);
  if (command === "chain") return printChain();
  if (command !== "backup" && command !== "restore") throw new Refusal("Use `npm run db:backup [-- --to <file>]` or `npm run db:restore -- <file>`.");
  if (!live) {
    throw new Refusal(
      `DATABASE_URL names a libSQL server, not a file: ${command === "backup" ? "back it up" : "restore it"} with the server's own tooling (its snapshots or dumps); Papin's db:${command} handles the embedded file only.`,
    );
  }
  if (command === "backup") await backup(live, optionValue(args, "--to"));
  else
    await restore(
      live,
      args.find((a) => !a.startsWith("--")),
    );
}

function optionValue(args: string[], name: string): string | undefined {
  const at = args.indexOf(name);
  if (at < 0) return undefined;
  const value = args[at + 1];
  if (!value || value.startsWith("--")) throw new Refusal(`${name} needs a file name.`);
  return value;
}

async function backup(live: string, to: string | undefined) {
  if (!existsSync(live)) throw new Refusal(`There is no database at ${relative(live)} to back up.`);
  const target = path.resolve(to ?? path.join("data", "backups", `papin-${utcStamp()}.db`));
  if (existsSync(target)) throw new Refusal(`${relative(target)} already exists; name another file with --to.`);
  mkdirSync(path.dirname(target), { recursive: true });
  const client = openClient(`file:${live}`);
  try {
    // One read transaction: a consistent copy while the portal keeps writing.
    await client.execute({ sql: "VACUUM INTO ?", args: [target] });
  } finally {
    client.close();
  }
  chmodSync(target, 0o600); // it holds password hashes
  const { events } = await inspect(target);
  console.log(`Backed up ${relative(live)} to ${relative(target)} (${events} audit events, ${(statSync(target).size / 1e6).toFixed(1)} MB).`);
}

async function restore(live: string, source: string | undefined) {
  if (!source) throw new Refusal("Name the backup to restore: npm run db:restore -- <file>.");
  const from = path.resolve(source);
  if (!existsSync(from) || !statSync(from).isFile()) throw new Refusal(`There is no file at ${source}.`);
  if (!hasSqliteHeader(from)) throw new Refusal(`${source} is not a Papin database: it is not an SQLite file.`);
  if (existsSync(live) && openInAnotherProcess(live)) throw new Refusal(inUse(live));
  const stamp = utcStamp();
  const staged = `${live}.restoring-${stamp}`;
  mkdirSync(path.dirname(live), { recursive: true });
  copyFileSync(from, staged); // checked and migrated as a copy: the backup itself is never written to
  let kept: string | null = null;
  try {
    const { events } = await inspect(staged, source);
    await migrateCopy(staged);
    const chain = chainOf(staged);
    if (!chain.ok) throw new Refusal(`${source} was not restored: its audit chain does not verify (${(chain.problem ?? "no reason given").replace(/\.$/, "")}).`);
    if (existsSync(live)) {
      await takeOver(live);
      kept = `${live}.before-restore-${stamp}`;
      renameSync(live, kept);
      // A journal with a live header belongs to the kept file (SQLite rolls it back there); a spent one goes.
      if (existsSync(`${live}-journal`) && !isSpentJournal(`${live}-journal`)) renameSync(`${live}-journal`, `${kept}-journal`);
    }
    for (const suffix of ["-wal", "-shm", "-journal"]) rmSync(live + suffix, { force: true });
    renameSync(staged, live);
    console.log(`Restored ${relative(from)} to ${relative(live)} (${events} audit events, chain verified).${kept ? ` The previous database is kept as ${relative(kept)}.` : ""}`);
  } finally {
    rmSync(staged, { force: true });
  }
}

function firstBytes(file: string, length: number): Buffer {
  const bytes = Buffer.alloc(length);
  const fd = openSync(file, "r");
  try {
    readSync(fd, bytes, 0, length, 0);
  } finally {
    closeSync(fd);
  }
  return bytes;
}

const hasSqliteHeader = (file: string) => firstBytes(file, 16).toString("latin1") === "SQLite format 3\0";
const isSpentJournal = (file: string) => firstBytes(file, 8).every((b) => b === 0);

/** Refuses what is not a sound Papin database of this version or an older one; counts its audit events. */
async function inspect(file: string, name = relative(file)): Promise<{ events: number }> {
  const client = openClient(`file:${file}`);
  try {
    const integrity = String((await client.execute("PRAGMA integrity_check")).rows[0]?.[0]);
    if (integrity !== "ok") throw new Refusal(`${name} is damaged: SQLite's integrity check says "${integrity}".`);
    const tables = new Set((await client.execute("SELECT name FROM sqlite_master WHERE type = 'table'")).rows.map((r) => String(r[0])));
    const missing = PAPIN_TABLES.filter((t) => !tables.has(t));
    if (missing.length) throw new Refusal(`${name} is not a Papin database: it has no ${missing.join(", ")} table${missing.length > 1 ? "s" : ""}.`);
    const known = new Set(migrationJournal().map((m) => m.when));
    const applied = (await client.execute("SELECT created_at FROM __drizzle_migrations")).rows.map((r) => Number(r[0]));
    const unknown = applied.filter((when) => !known.has(when));
    if (unknown.length) throw new Refusal(`${name} was made by a newer Papin (a migration of ${new Date(unknown[0]).toISOString()} is unknown here); restore it with that version.`);
    const events = Number((await client.execute("SELECT count(*) FROM audit_events")).rows[0]?.[0] ?? 0);
    return { events };
  } finally {
    client.close();
  }
}

function migrationJournal(): Array<{ when: number; tag: string }> {
  return JSON.parse(readFileSync(path.join(MIGRATIONS_FOLDER, "meta", "_journal.json"), "utf8")).entries;
}

async function migrateCopy(file: string) {
  const client = openClient(`file:${file}`);
  try {
    await migrateDatabase(drizzle(client, { schema }));
  } finally {
    client.close();
  }
}

type ChainState = Awaited<ReturnType<typeof verifyAuditChain>>;

/** The portal's own verifier, run on another file in a child process (it reads the database named by DATABASE_URL). */
function chainOf(file: string): ChainState {
  const tsx = path.join(root, "node_modules", "tsx", "dist", "cli.mjs");
  const child = spawnSync(process.execPath, [tsx, "--tsconfig", path.join(root, "db", "tsconfig.scripts.json"), path.join(root, "db", "backup.ts"), "chain"], {
    cwd: root,
    env: { ...environmentForChildProcess(), DATABASE_URL: `file:${file}`, DATABASE_AUTH_TOKEN: "" },
    encoding: "utf8",
  });
  if (child.status !== 0) return { ok: false, events: 0, problem: child.stderr.trim() || "the verifier did not run" };
  return JSON.parse(child.stdout) as ChainState;
}

async function printChain() {
  const { verifyAuditChain } = await import("@/lib/services/audit");
  process.stdout.write(JSON.stringify(await verifyAuditChain()));
}

const inUse = (live: string) => `${relative(live)} is in use (is the portal running?): stop it, then restore.`;

/**
 * Takes the live file over for the swap: an exclusive lock, refused at once while any other process (the portal)
 * holds the database open, then back to a rollback journal so no write-ahead log is left beside it.
 */
async function takeOver(live: string) {
  if (openInAnotherProcess(live)) throw new Refusal(inUse(live));
  const client = openClient(`file:${live}`, undefined, { busyTimeoutMs: 0 });
  try {
    await client.execute("PRAGMA locking_mode = EXCLUSIVE");
    await client.execute("BEGIN EXCLUSIVE");
  } catch {
    client.close();
    throw new Refusal(inUse(live));
  }
  await client.execute("PRAGMA journal_mode = DELETE");
  // The exclusive lock stays with this process until it exits, after the swap.
}

/** Where the system shows open files (Linux's /proc): whether another process holds this one open, even idle. */
function openInAnotherProcess(file: string): boolean {
  if (!existsSync("/proc/self/fd")) return false;
  const target = realpathSync(file);
  for (const pid of readdirSync("/proc")) {
    if (!/^\d+$/.test(pid) || Number(pid) === process.pid) continue;
    let fds: string[];
    try {
      fds = readdirSync(`/proc/${pid}/fd`);
    } catch {
      continue; // gone, or not ours to read
    }
    if (fds.some((fd) => linkTarget(`/proc/${pid}/fd/${fd}`) === target)) return true;
  }
  return false;
}

function linkTarget(link: string): string | null {
  try {
    return readlinkSync(link);
  } catch {
    return null;
  }
}

main().catch((error: unknown) => {
  console.error(error instanceof Refusal ? error.message : `Papin's database tool failed: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
});

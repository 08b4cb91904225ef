import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { spawn, spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { copyFileSync, existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { createClient } from "@libsql/client";

// The live database is opened by child processes only, and by this process at the very end: a restore refuses a
// file that another process holds open, this test's own connection included.
const tsx = path.resolve("node_modules/tsx/dist/cli.mjs");
const scriptsConfig = path.resolve("db/tsconfig.scripts.json");
let dir = "";
let live = "";
let backupFile = "";
let firstBackup = { status: null as number | null, out: "" };

function run(script: string, args: string[], databaseUrl = `file:${live}`) {
  const child = spawnSync(process.execPath, [tsx, "--tsconfig", scriptsConfig, script, ...args], { env: { ...process.env, DATABASE_URL: databaseUrl }, encoding: "utf8" });
  return { status: child.status, out: `${child.stdout}${child.stderr}`.trim() };
}
const tool = (args: string[], databaseUrl?: string) => run("db/backup.ts", args, databaseUrl);
const writeSite = (name: string) => expect(run("tests/support/ledger-writer.ts", ["site", name])).toEqual({ status: 0, out: "" });
const fingerprint = (file: string) => createHash("sha256").update(readFileSync(file)).digest("hex");

/** Opens another file than the live one (this process may hold those open). */
async function query(file: string, sql: string) {
  const client = createClient({ url: `file:${file}` });
  try {
    return (await client.execute(sql)).rows;
  } finally {
    client.close();
  }
}

beforeAll(() => {
  dir = mkdtempSync(path.join(tmpdir(), "papin-backup-"));
  live = path.join(dir, "papin.db");
  backupFile = path.join(dir, "backups", "before-the-change.db");
  writeSite("Marlow Bridge General");
  firstBackup = tool(["backup", "--to", backupFile]);
}, 120_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("npm run db:restore refuses", () => {
  it("a file that is not a Papin database, and one whose audit chain was rewritten, leaving the live file alone", async () => {
    const before = fingerprint(live);
    const text = path.join(dir, "notes.txt");
    writeFileSync(text, "not a database");
    expect(tool(["restore", text])).toEqual({ status: 1, out: `${text} is not a Papin database: it is not an SQLite file.` });

    const foreign = path.join(dir, "foreign.db");
    await query(foreign, "CREATE TABLE things (id INTEGER PRIMARY KEY)");
    expect(tool(["restore", foreign]).out).toBe(`${foreign} is not a Papin database: it has no __drizzle_migrations, sites, users, cycles, reports, audit_events tables.`);

    const rewritten = path.join(dir, "rewritten.db");
    copyFileSync(backupFile, rewritten);
    await query(rewritten, "DROP TRIGGER audit_events_no_update");
    await query(rewritten, `UPDATE audit_events SET new_value = '{"name":"Someone else"}'`);
    expect(tool(["restore", rewritten])).toEqual({ status: 1, out: `${rewritten} was not restored: its audit chain does not verify (Event 1 was changed after it was written).` });

    expect(readdirSync(dir).filter((f) => f.includes(".restoring-") || f.includes(".before-restore-"))).toEqual([]);
    expect(fingerprint(live)).toBe(before);
  }, 120_000);
});

describe("npm run db:backup and db:restore on the embedded file", () => {
  it("backs up online, refuses to restore under a running portal, then brings the content and a verified chain back", async () => {
    expect(firstBackup.out).toMatch(/^Backed up .*papin\.db to .*before-the-change\.db \(1 audit events, [\d.]+ MB\)\.$/);
    expect(firstBackup.status).toBe(0);

    writeSite("Renamed after the backup");

    const portal = spawn(process.execPath, [tsx, "--tsconfig", scriptsConfig, "tests/support/ledger-writer.ts", "hold"], { env: { ...process.env, DATABASE_URL: `file:${live}` } });
    try {
      await new Promise((resolve) => portal.stdout.once("data", resolve));
      expect(tool(["restore", backupFile])).toEqual({ status: 1, out: `${live} is in use (is the portal running?): stop it, then restore.` });
    } finally {
      portal.kill();
      await new Promise((resolve) => portal.once("exit", resolve));
    }

    const restored = tool(["restore", backupFile]);
    expect(restored.out).toMatch(/^Restored .* \(1 audit events, chain verified\)\. The previous database is kept as .*papin\.db\.before-restore-\d{8}T\d{6}Z\.$/);
    expect(restored.status).toBe(0);
    const kept = readdirSync(dir).filter((f) => f.startsWith("papin.db.before-restore-"));
    expect(kept).toHaveLength(1);
    expect(await query(path.join(dir, kept[0]), "SELECT name FROM sites")).toEqual([expect.objectContaining({ name: "Renamed after the backup" })]);
    expect(await query(path.join(dir, kept[0]), "SELECT count(*) AS n FROM audit_events")).toEqual([expect.objectContaining({ n: 2 })]);

    process.env.DATABASE_URL = `file:${live}`;
    const { verifyAuditChain } = await import("@/lib/services/audit");
    expect(await verifyAuditChain()).toEqual({ ok: true, events: 1 });
    const { getDb } = await import("@/db");
    const { sites } = await import("@/db/schema");
    expect((await getDb().select().from(sites)).map((s) => s.name)).toEqual(["Marlow Bridge General"]);
  }, 120_000);

  it("on a libSQL server, both say to use the server's own tooling and make nothing", () => {
    for (const command of ["backup", "restore"]) {
      const answer = tool([command, backupFile], "http://127.0.0.1:9");
      expect(answer.out).toMatch(/^DATABASE_URL names a libSQL server, not a file: .* with the server's own tooling/);
      expect(answer.status).toBe(1);
    }
    expect(existsSync(path.join(dir, "data"))).toBe(false);
  });
});

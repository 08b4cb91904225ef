import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { copyFileSync, existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync } from "node:fs";
import { createServer } from "node:net";
import path from "node:path";

export const ROOT = path.resolve(import.meta.dirname, "../../..");
const CACHE_DIR = path.join(ROOT, "node_modules/.cache/papin");
const BUILD_ID = path.join(ROOT, ".next/BUILD_ID");
// What a production build is made of; a file here newer than the build means the server would run stale code.
const SOURCES = ["app", "components", "lib", "db", "fonts", "proxy.ts", "instrumentation.ts", "next.config.mjs", "tailwind.config.ts", "postcss.config.mjs", "package.json"];
const READY_TIMEOUT_MS = 90_000;

/** A step of the HTTP bench that cannot go on; its message is printed as is. */
export class BenchStop extends Error {}

function newestMtimeMs(entry: string): number {
  if (!existsSync(entry)) return 0;
  const stat = statSync(entry);
  if (!stat.isDirectory()) return stat.mtimeMs;
  return Math.max(0, ...readdirSync(entry).map((name) => newestMtimeMs(path.join(entry, name))));
}

/** Refuses to measure a missing or stale production build: the bench serves what `npx next build` made. */
export function assertFreshBuild(): void {
  if (!existsSync(BUILD_ID)) throw new BenchStop("The HTTP bench serves the production build, and there is none: run `npx next build` first (or set PAPIN_BENCH_CYCLES=0 to skip it).");
  const builtMs = statSync(BUILD_ID).mtimeMs;
  const stale = SOURCES.map((s) => path.join(ROOT, s)).find((s) => newestMtimeMs(s) > builtMs);
  if (stale) throw new BenchStop(`The production build is older than ${path.relative(ROOT, stale)}: run \`npx next build\` again before the bench (or set PAPIN_BENCH_CYCLES=0 to skip it).`);
}

function latestMigrationTag(): string {
  const journal = JSON.parse(readFileSync(path.join(ROOT, "db/migrations/meta/_journal.json"), "utf8")) as { entries: { tag: string }[] };
  return journal.entries.at(-1)!.tag;
}

/**
 * A database file with the demo site and `cycles` load cycles (`npm run db:seed-load`), seeded once per count and
 * schema (the cache file is named after the latest migration, so a new migration seeds again) and kept in
 * node_modules/.cache/papin; the caller copies it before serving, so every run starts from the same rows.
 */
export function seededDatabase(cycles: number): string {
  const cached = path.join(CACHE_DIR, `bench-${cycles}-cycles-${latestMigrationTag()}.db`);
  if (existsSync(cached)) return cached;
  mkdirSync(CACHE_DIR, { recursive: true });
  const partial = `${cached}.partial`;
  for (const suffix of ["", "-wal", "-shm"]) rmSync(partial + suffix, { force: true });
  console.error(`Seeding ${cycles.toLocaleString("en")} cycles once for this schema (about 4–5 minutes for 100,000); cached as ${path.relative(ROOT, cached)}.`);
  const seeded = spawnSync(process.execPath, [path.join(ROOT, "node_modules/tsx/dist/cli.mjs"), "--tsconfig", "db/tsconfig.scripts.json", "db/seed-load.ts", "--cycles", String(cycles)], {
    cwd: ROOT,
    env: { ...process.env, DATABASE_URL: `file:${partial}`, PAPIN_DEMO: "1", PAPIN_LEDGER_ANCHOR_FILE: `${partial}.anchors.jsonl` },
    stdio: ["ignore", "inherit", "inherit"],
  });
  if (seeded.status !== 0) throw new BenchStop(`npm run db:seed-load -- --cycles ${cycles} failed (exit ${seeded.status}); see its message above.`);
  rmSync(`${partial}.anchors.jsonl`, { force: true });
  // The seeding process closed its connection, which checkpoints the WAL into the file; anything left is folded in by the server.
  renameSync(partial, cached);
  for (const suffix of ["-wal", "-shm"]) if (existsSync(partial + suffix)) renameSync(partial + suffix, cached + suffix);
  return cached;
}

const copies = new Set<string>();

/** Copies the cached database (with its WAL, if any) to `file`; the copy is removed by removeDatabase or when the bench exits. */
export function copyDatabase(from: string, file: string): void {
  copies.add(file);
  for (const suffix of ["", "-wal"]) if (existsSync(from + suffix)) copyFileSync(from + suffix, file + suffix);
}

export function removeDatabase(file: string): void {
  for (const suffix of ["", "-wal", "-shm", ".anchors.jsonl"]) rmSync(file + suffix, { force: true });
  copies.delete(file);
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once("error", reject);
    probe.listen(0, "127.0.0.1", () => {
      const { port } = probe.address() as { port: number };
      probe.close(() => resolve(port));
    });
  });
}

export type Server = { url: string; stop: () => Promise<void> };
const running = new Set<ChildProcess>();
// Children die with the bench, and its database copies go, whichever way it ends.
process.once("exit", () => {
  running.forEach((child) => child.kill("SIGKILL"));
  copies.forEach(removeDatabase);
});
for (const signal of ["SIGINT", "SIGTERM"] as const) process.once(signal, () => process.exit(130));

/** `next start` on the built app and the given database file, on a port the system chose; resolves once /api/health answers. */
export async function startServer(databaseFile: string): Promise<Server> {
  const port = await freePort();
  const url = `http://127.0.0.1:${port}`;
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: "production",
    DATABASE_URL: `file:${databaseFile}`,
    NEXTAUTH_URL: url,
    NEXTAUTH_SECRET: "bench-secret-not-for-production-0123456789",
    PAPIN_DEMO: "1",
    // The ledger's anchors of this throwaway database stay beside it, never in the operator's anchor file.
    PAPIN_LEDGER_ANCHOR_FILE: `${databaseFile}.anchors.jsonl`,
  };
  // Mail stays in the outbox: the bench must not reach any mail service.
  delete env.RESEND_API_KEY;
  delete env.RESEND_BASE_URL;
  const child = spawn(process.execPath, [path.join(ROOT, "node_modules/next/dist/bin/next"), "start", "-H", "127.0.0.1", "-p", String(port)], { cwd: ROOT, env, stdio: ["ignore", "pipe", "pipe"] });
  running.add(child);
  let output = "";
  const keep = (chunk: Buffer) => (output = (output + chunk.toString()).slice(-4000));
  child.stdout!.on("data", keep);
  child.stderr!.on("data", keep);
  const exited = new Promise<void>((resolve) => child.once("exit", () => resolve()));
  const stop = async () => {
    if (child.exitCode === null && child.signalCode === null) child.kill("SIGTERM");
    // A graceful stop finishes work the server does after answering (drafts being prepared); a minute at most.
    await Promise.race([exited, new Promise((r) => setTimeout(r, 60_000))]);
    if (child.exitCode === null && child.signalCode === null) child.kill("SIGKILL");
    running.delete(child);
  };
  const deadline = Date.now() + READY_TIMEOUT_MS;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) break;
    const ok = await fetch(`${url}/api/health`)
      .then((r) => r.ok)
      .catch(() => false);
    if (ok) return { url, stop };
    await new Promise((r) => setTimeout(r, 200));
  }
  await stop();
  throw new BenchStop(`The production server did not answer /api/health within ${READY_TIMEOUT_MS / 1000} s. Its last output:\n${output.trim()}`);
}

// Starts a TypeScript command of lib/cli/ without tsx's ~0.4 s start-up: the entry is bundled once
// with esbuild into node_modules/.cache/papin/ and rebuilt whenever a source under lib/ is newer.
import { mkdirSync, readdirSync, renameSync, statSync, writeFileSync } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";

const root = path.resolve(import.meta.dirname, "../..");
const name = process.argv[2];
if (!name || !/^[a-z-]+$/.test(name)) {
  process.stderr.write("launch: name the command to run, e.g. analyze\n");
  process.exit(2);
}
process.argv.splice(2, 1);
const entry = path.join(root, "lib", "cli", `${name}.ts`);
const out = path.join(root, "node_modules", ".cache", "papin", `${name}.mjs`);

function newestSource(dir) {
  let newest = 0;
  for (const item of readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, item.name);
    if (item.isDirectory()) newest = Math.max(newest, newestSource(full));
    else if (/\.(ts|tsx|mjs)$/.test(item.name)) newest = Math.max(newest, statSync(full).mtimeMs);
  }
  return newest;
}

let built = 0;
try {
  built = statSync(out).mtimeMs;
} catch {}
if (built < newestSource(path.join(root, "lib"))) {
  const { build } = await import("esbuild");
  const result = await build({
    entryPoints: [entry],
    bundle: true,
    platform: "node",
    format: "esm",
    target: "node20",
    packages: "external",
    tsconfig: path.join(root, "tsconfig.json"),
    write: false,
    logLevel: "silent",
  });
  mkdirSync(path.dirname(out), { recursive: true });
  const temporary = `${out}.${process.pid}.tmp`;
  writeFileSync(temporary, result.outputFiles[0].contents);
  renameSync(temporary, out);
}
await import(pathToFileURL(out).href);

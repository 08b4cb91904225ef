import { existsSync, readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

/**
 * No server code in the browser: reads the client chunks of the last production build
 * (`.next/static`) and fails when one carries the database layer, the PDF renderer or password
 * hashing. `npm test` builds first; run `npx next build` before `npx vitest run` to check by hand.
 *
 * The markers are strings that survive minification (Symbol.for keys, error names, module
 * specifiers). Each was seen in an esbuild browser bundle of its package, and the drizzle and
 * schema markers in the ≈165 KB chunk that `/cycles`, `/cycles/new` and `/review` shipped before
 * lib/domain existed.
 */

const ROOT = process.cwd();
const BUILD_ID = path.join(ROOT, ".next/BUILD_ID");
const STATIC_DIR = path.join(ROOT, ".next/static");

/** The schema's own table names with an underscore: no UI text says `"calibration_certificates"`. */
function schemaTableNames(): string[] {
  const schema = readFileSync(path.join(ROOT, "db/schema.ts"), "utf8");
  const names = [...schema.matchAll(/sqliteTable\(\s*"([a-z_]+)"/g)].map((m) => m[1]).filter((n) => n.includes("_"));
  return names;
}

const quoted = (word: string) => new RegExp(`["'\`]${word}["'\`]`);

function markers(): Array<{ what: string; pattern: RegExp }> {
  return [
    { what: "drizzle-orm", pattern: /drizzle:(?:Name|Columns|IsDrizzleTable|Schema)\b|["'`]drizzle-orm["'`]/ },
    ...schemaTableNames().map((table) => ({ what: `the schema (table ${table})`, pattern: quoted(table) })),
    { what: "the schema (users.password_hash)", pattern: quoted("password_hash") },
    { what: "@libsql/client", pattern: /\bLibsqlError\b|@libsql\// },
    { what: "argon2", pattern: /@node-rs\/argon2/ },
    { what: "@react-pdf/renderer", pattern: /@react-pdf\/|\brenderToBuffer\b/ },
  ];
}

function clientChunks(dir: string): string[] {
  const out: string[] = [];
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) out.push(...clientChunks(full));
    else if (entry.name.endsWith(".js")) out.push(full);
  }
  return out;
}

describe("client bundle", () => {
  it("finds the schema's tables to look for", () => {
    // A schema rewrite that hid its table names would quietly turn the check below off.
    expect(schemaTableNames()).toEqual(expect.arrayContaining(["calibration_certificates", "logger_files", "audit_events"]));
  });

  it("carries no drizzle-orm, schema, @libsql/client, argon2 or @react-pdf/renderer in any client chunk", (ctx) => {
    if (!existsSync(BUILD_ID)) {
      if (process.env.CI) throw new Error("No production build in .next (BUILD_ID missing): CI must run `next build` before the unit tests.");
      const reason = "Skipped the client-bundle check: no production build in .next; run `npx next build` first.";
      console.warn(reason);
      ctx.skip(reason);
    }
    const chunks = clientChunks(STATIC_DIR);
    expect(chunks.length, "client chunks under .next/static").toBeGreaterThan(0);
    const found: string[] = [];
    for (const file of chunks) {
      const text = readFileSync(file, "utf8");
      for (const { what, pattern } of markers()) {
        const match = pattern.exec(text);
        if (match) {
          const kb = Math.round(text.length / 1024);
          found.push(`${path.relative(ROOT, file)} (${kb} KB) carries ${what}: …${text.slice(Math.max(0, match.index - 40), match.index + 40)}…`);
        }
      }
    }
    expect(found, "server code in the browser bundle").toEqual([]);
  });
});

import { sql } from "drizzle-orm";
import { migrate } from "drizzle-orm/libsql/migrator";
import path from "node:path";
import type { Database } from "./index";

export const MIGRATIONS_FOLDER = path.resolve(process.cwd(), "db", "migrations");

export async function migrateDatabase(db: Database, migrationsFolder = MIGRATIONS_FOLDER) {
  await migrate(db, { migrationsFolder });
  await analyzeNewIndexes(db);
}

/**
 * In a database that holds planner statistics (`ANALYZE`, which db:seed-load runs), an index a migration adds has none
 * and SQLite's default guess makes it look better than the measured ones: it was picked for the wrong lists, sorting
 * every row. Such an index is measured at once; a database without statistics (the usual one) is left without them.
 */
async function analyzeNewIndexes(db: Database) {
  const [hasStats] = await db.all<{ name: string }>(sql`select name from sqlite_master where type = 'table' and name = 'sqlite_stat1'`);
  if (!hasStats) return;
  const missing = await db.all<{ name: string }>(sql`
    select i.name from sqlite_master i
     where i.type = 'index' and i.tbl_name in (select tbl from sqlite_stat1) and i.name not in (select idx from sqlite_stat1 where idx is not null)`);
  for (const { name } of missing) await db.run(sql.raw(`ANALYZE "${name.replace(/"/g, '""')}"`));
}

import { migrate } from "drizzle-orm/libsql/migrator";
import path from "node:path";
import type { Database } from "./index";

export const MIGRATIONS_FOLDER = path.resolve(process.cwd(), "db", "migrations");

export async function migrateDatabase(db: Database, migrationsFolder = MIGRATIONS_FOLDER) {
  await migrate(db, { migrationsFolder });
}

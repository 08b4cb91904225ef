import "server-only";
import { sql } from "drizzle-orm";
import { getDb, databaseUrl } from "@/db";

export async function pingDatabase() {
  await getDb().run(sql`select 1`);
  const url = databaseUrl();
  return { kind: url.startsWith("file:") ? "embedded" : "libsql-server" };
}

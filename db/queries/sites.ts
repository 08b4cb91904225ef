import "server-only";
import { asc, eq } from "drizzle-orm";
import { getDb } from "@/db";
import { sites } from "@/db/schema";

export async function listSites() {
  return getDb().select().from(sites).orderBy(asc(sites.name));
}

export async function getSiteById({ id }: { id: string }) {
  const [row] = await getDb().select().from(sites).where(eq(sites.id, id)).limit(1);
  return row;
}

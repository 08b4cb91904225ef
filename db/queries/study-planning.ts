import "server-only";
import { asc, eq } from "drizzle-orm";
import { getDb } from "@/db";
import { loadingPatterns } from "@/db/schema";

/** The site's loading patterns, for planning a study on one of them again (requalification). */
export async function listLoadingPatternsForSite({ siteId }: { siteId: string }) {
  const rows = await getDb()
    .select({
      id: loadingPatterns.id,
      sterilizerId: loadingPatterns.sterilizerId,
      name: loadingPatterns.name,
      loadType: loadingPatterns.loadType,
      positions: loadingPatterns.positions,
      requalificationDueOn: loadingPatterns.requalificationDueOn,
    })
    .from(loadingPatterns)
    .where(eq(loadingPatterns.siteId, siteId))
    .orderBy(asc(loadingPatterns.name));
  return rows.map((r) => ({ ...r, positions: r.positions.length }));
}

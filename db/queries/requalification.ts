import "server-only";
import { and, asc, eq, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";
import { loadingPatterns, sterilizers, studies } from "@/db/schema";

type Audit = Omit<AuditInput, "entityType" | "entityId">;

/** The latest approved study of a pattern (by its last change, which is the QA approval for an approved study). */
const latestApprovedStudy = (column: "id" | "study_number") =>
  sql<
    string | null
  >`(select s.${sql.raw(column)} from ${studies} s where s.loading_pattern_id = ${loadingPatterns.id} and s.status = 'approved' order by coalesce(s.updated_at, s.created_at) desc limit 1)`;

/** The site's loading patterns of active sterilizers (or of one sterilizer), with their requalification facts. */
export async function listPatternRequalification({ siteId, sterilizerId }: { siteId: string; sterilizerId?: string }) {
  return getDb()
    .select({
      id: loadingPatterns.id,
      name: loadingPatterns.name,
      loadType: loadingPatterns.loadType,
      sterilizerId: loadingPatterns.sterilizerId,
      sterilizerName: sterilizers.name,
      dueOn: loadingPatterns.requalificationDueOn,
      requiredBeforeUse: loadingPatterns.requiredBeforeUse,
      studyId: latestApprovedStudy("id"),
      studyNumber: latestApprovedStudy("study_number"),
    })
    .from(loadingPatterns)
    .innerJoin(sterilizers, eq(loadingPatterns.sterilizerId, sterilizers.id))
    .where(and(eq(loadingPatterns.siteId, siteId), eq(sterilizers.active, true), sterilizerId ? eq(loadingPatterns.sterilizerId, sterilizerId) : undefined))
    .orderBy(asc(sterilizers.name), asc(loadingPatterns.name));
}

export async function getPatternOnSite({ siteId, id }: { siteId: string; id: string }) {
  const [row] = await getDb()
    .select()
    .from(loadingPatterns)
    .where(and(eq(loadingPatterns.id, id), eq(loadingPatterns.siteId, siteId)))
    .limit(1);
  return row;
}

/** Sets the "required before use" mark and writes the ledger in the same transaction. */
export async function writePatternRequiredBeforeUse({ siteId, id, requiredBeforeUse, at, audit }: { siteId: string; id: string; requiredBeforeUse: boolean; at: string; audit: Audit }) {
  await getDb().transaction(async (tx) => {
    await tx
      .update(loadingPatterns)
      .set({ requiredBeforeUse, updatedAt: at })
      .where(and(eq(loadingPatterns.id, id), eq(loadingPatterns.siteId, siteId)));
    await appendAuditEvent(tx, { ...audit, entityType: "loading-pattern", entityId: id });
  });
}

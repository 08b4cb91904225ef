import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db";
import { sites, type NewSite } from "@/db/schema";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";

export async function getSiteById({ id }: { id: string }) {
  const [row] = await getDb().select().from(sites).where(eq(sites.id, id)).limit(1);
  return row;
}

/** Writes the changed fields of one site and their audit event in one transaction. */
export async function updateSite({ id, values, audit }: { id: string; values: Partial<NewSite>; audit: Omit<AuditInput, "entityType" | "entityId"> }) {
  await getDb().transaction(async (tx) => {
    await tx.update(sites).set(values).where(eq(sites.id, id));
    await appendAuditEvent(tx, { ...audit, entityType: "site", entityId: id });
  });
}

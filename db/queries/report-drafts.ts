import "server-only";
import { eq } from "drizzle-orm";
import { getDb, type Executor } from "@/db";
import { reportDrafts } from "@/db/schema";

export type StoredDraft = { cycleId: string; inputSha256: string; sha256: string; bytes: Uint8Array; renderedAt: string };

/** The latest draft PDF kept for a cycle; undefined when none is kept. */
export async function getReportDraft({ cycleId }: { cycleId: string }): Promise<StoredDraft | undefined> {
  const [row] = await getDb().select().from(reportDrafts).where(eq(reportDrafts.cycleId, cycleId)).limit(1);
  return row ? { ...row, bytes: new Uint8Array(row.bytes) } : undefined;
}

/** Keeps `draft` as the cycle's latest draft, replacing the one kept before. */
export async function saveReportDraft(draft: StoredDraft): Promise<void> {
  const values = { ...draft, bytes: Buffer.from(draft.bytes.buffer, draft.bytes.byteOffset, draft.bytes.byteLength) };
  await getDb()
    .insert(reportDrafts)
    .values(values)
    .onConflictDoUpdate({ target: reportDrafts.cycleId, set: { inputSha256: values.inputSha256, sha256: values.sha256, bytes: values.bytes, renderedAt: values.renderedAt } });
}

/** Drops the cycle's kept draft (its report is archived: the draft is never served again). */
export async function deleteReportDraft(tx: Executor, { cycleId }: { cycleId: string }): Promise<void> {
  await tx.delete(reportDrafts).where(eq(reportDrafts.cycleId, cycleId));
}

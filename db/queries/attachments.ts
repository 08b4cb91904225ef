import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { getDb, type Executor } from "@/db";
import { attachments, cycles, indicatorSheets, users } from "@/db/schema";
import type { AttachmentOwnerKind } from "@/lib/domain";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";

export type NewAttachment = Omit<typeof attachments.$inferInsert, "id" | "uploadedAt" | "ownerId">;

/** Stores one attachment inside the caller's transaction; its owner is known by then. */
export async function insertAttachment(tx: Executor, { ownerId, values }: { ownerId: string; values: NewAttachment }) {
  const [row] = await tx
    .insert(attachments)
    .values({ ...values, ownerId })
    .returning({ id: attachments.id, sha256: attachments.sha256 });
  return row;
}

const described = {
  id: attachments.id,
  siteId: attachments.siteId,
  ownerKind: attachments.ownerKind,
  ownerId: attachments.ownerId,
  name: attachments.name,
  contentType: attachments.contentType,
  sizeBytes: attachments.sizeBytes,
  sha256: attachments.sha256,
  uploadedAt: attachments.uploadedAt,
  uploadedByName: users.name,
};

/** One attachment of the site, with its bytes; undefined off the site. */
export async function getAttachmentOfSite({ siteId, id }: { siteId: string; id: string }) {
  const [row] = await getDb()
    .select({ ...described, bytes: attachments.bytes })
    .from(attachments)
    .innerJoin(users, eq(attachments.uploadedBy, users.id))
    .where(and(eq(attachments.id, id), eq(attachments.siteId, siteId)))
    .limit(1);
  return row;
}

/** The attachments of one record, oldest first, with their bytes when asked (to hash them again). */
export async function listAttachmentsOf({ ownerKind, ownerId, tx }: { ownerKind: AttachmentOwnerKind; ownerId: string; tx?: Executor }) {
  return (tx ?? getDb())
    .select({ ...described, bytes: attachments.bytes })
    .from(attachments)
    .innerJoin(users, eq(attachments.uploadedBy, users.id))
    .where(and(eq(attachments.ownerKind, ownerKind), eq(attachments.ownerId, ownerId)))
    .orderBy(sql`${attachments}.rowid`);
}

/**
 * A Bowie-Dick cycle's indicator-sheet reading with its photo, in one transaction: the photo, the
 * reading, the cycle's verdict from the sheet and the audit event. False when the cycle had
 * moved out of the status the caller saw.
 */
export async function insertIndicatorSheet({
  cycleId,
  fromStatus,
  sheet,
  photo,
  verdict,
  audit,
}: {
  cycleId: string;
  fromStatus: string;
  sheet: Pick<typeof indicatorSheets.$inferInsert, "result" | "indicatorLot" | "reason" | "recordedBy">;
  photo: NewAttachment;
  verdict: "pass" | "fail";
  audit: (ids: { sheetId: string; attachmentId: string }) => AuditInput;
}): Promise<{ sheetId: string; attachmentId: string } | false> {
  return getDb().transaction(async (tx) => {
    const moved = await tx
      .update(cycles)
      .set({ verdict, updatedAt: new Date().toISOString() })
      .where(and(eq(cycles.id, cycleId), eq(cycles.status, fromStatus as typeof cycles.$inferSelect.status)))
      .returning({ id: cycles.id });
    if (moved.length === 0) return false;
    const attachment = await insertAttachment(tx, { ownerId: cycleId, values: photo });
    const [row] = await tx
      .insert(indicatorSheets)
      .values({ ...sheet, cycleId, attachmentId: attachment.id })
      .returning({ id: indicatorSheets.id });
    const ids = { sheetId: row.id, attachmentId: attachment.id };
    await appendAuditEvent(tx, audit(ids));
    return ids;
  });
}

/** Every indicator-sheet reading of a cycle, newest first, with who recorded it and its photo's stored hash. */
export async function listIndicatorSheetsOfCycle({ cycleId, tx }: { cycleId: string; tx?: Executor }) {
  return (
    (tx ?? getDb())
      .select({
        id: indicatorSheets.id,
        result: indicatorSheets.result,
        indicatorLot: indicatorSheets.indicatorLot,
        reason: indicatorSheets.reason,
        recordedBy: indicatorSheets.recordedBy,
        recordedByName: users.name,
        recordedAt: indicatorSheets.recordedAt,
        attachmentId: indicatorSheets.attachmentId,
      })
      .from(indicatorSheets)
      .innerJoin(users, eq(indicatorSheets.recordedBy, users.id))
      .where(eq(indicatorSheets.cycleId, cycleId))
      // Insertion order: two readings within one millisecond still come out in the order they were made.
      .orderBy(sql`${indicatorSheets}.rowid desc`)
  );
}

/** Sets a Bowie-Dick cycle's verdict to its sheet's (null without one) after something else wrote the analysis verdict. */
export async function setCycleVerdict({ cycleId, verdict }: { cycleId: string; verdict: "pass" | "fail" | null }) {
  await getDb().update(cycles).set({ verdict }).where(eq(cycles.id, cycleId));
}

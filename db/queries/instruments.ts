import "server-only";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { calibrationCertificates, cycles, instruments, sterilizers, type NewInstrument } from "@/db/schema";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";

type Audit = Omit<AuditInput, "entityType" | "entityId">;

/** The site's instruments (in use first) and every certificate they hold. */
export async function listInstrumentsWithCertificates({ siteId }: { siteId: string }) {
  const db = getDb();
  const rows = await db.select().from(instruments).where(eq(instruments.siteId, siteId)).orderBy(desc(instruments.active), asc(instruments.name));
  const certificates = rows.length
    ? await db
        .select()
        .from(calibrationCertificates)
        .where(
          inArray(
            calibrationCertificates.instrumentId,
            rows.map((r) => r.id),
          ),
        )
    : [];
  return { rows, certificates };
}

/** Certificates of one instrument (checked to be on the site before), newest calibration first. */
export async function listCertificatesOfInstrument({ instrumentId }: { instrumentId: string }) {
  return getDb()
    .select()
    .from(calibrationCertificates)
    .where(eq(calibrationCertificates.instrumentId, instrumentId))
    .orderBy(desc(calibrationCertificates.calibratedOn), desc(calibrationCertificates.createdAt));
}

export async function listRecentCyclesOfInstrument({ siteId, instrumentId, limit }: { siteId: string; instrumentId: string; limit: number }) {
  return getDb()
    .select({ id: cycles.id, cycleNumber: cycles.cycleNumber, verdict: cycles.verdict, status: cycles.status, startedAt: cycles.startedAt, sterilizerName: sterilizers.name })
    .from(cycles)
    .innerJoin(sterilizers, eq(cycles.sterilizerId, sterilizers.id))
    .where(and(eq(cycles.siteId, siteId), eq(cycles.instrumentId, instrumentId)))
    .orderBy(desc(cycles.startedAt))
    .limit(limit);
}

/** The site's instrument with this serial number, compared without case. */
export async function findInstrumentBySerial({ siteId, serialNumber }: { siteId: string; serialNumber: string }) {
  const [row] = await getDb()
    .select({ name: instruments.name })
    .from(instruments)
    .where(and(eq(instruments.siteId, siteId), sql`lower(${instruments.serialNumber}) = ${serialNumber.toLowerCase()}`))
    .limit(1);
  return row;
}

export async function insertInstrument({ values, audit }: { values: NewInstrument; audit: Audit }) {
  return getDb().transaction(async (tx) => {
    const [created] = await tx.insert(instruments).values(values).returning();
    await appendAuditEvent(tx, { ...audit, entityType: "instrument", entityId: created.id });
    return created;
  });
}

export async function findCertificate({ instrumentId, certificateNumber }: { instrumentId: string; certificateNumber: string }) {
  const [row] = await getDb()
    .select({ id: calibrationCertificates.id })
    .from(calibrationCertificates)
    .where(and(eq(calibrationCertificates.instrumentId, instrumentId), eq(calibrationCertificates.certificateNumber, certificateNumber)))
    .limit(1);
  return row;
}

type NewCertificate = typeof calibrationCertificates.$inferInsert;

/** Adds a certificate; the audit event's new value carries the certificate's id. */
export async function insertCertificate({ values, audit }: { values: NewCertificate; audit: Audit }) {
  return getDb().transaction(async (tx) => {
    const [created] = await tx.insert(calibrationCertificates).values(values).returning();
    await appendAuditEvent(tx, { ...audit, newValue: { ...values, certificateId: created.id }, entityType: "instrument", entityId: values.instrumentId });
    return created;
  });
}

export async function clearInstrumentMapping({ siteId, id, audit }: { siteId: string; id: string; audit: Audit }) {
  await getDb().transaction(async (tx) => {
    await tx
      .update(instruments)
      .set({ savedMapping: null })
      .where(and(eq(instruments.id, id), eq(instruments.siteId, siteId)));
    await appendAuditEvent(tx, { ...audit, entityType: "instrument", entityId: id });
  });
}

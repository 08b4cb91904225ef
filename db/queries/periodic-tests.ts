import "server-only";
import { and, count, desc, eq, gte, inArray, lte, max, sql, type SQL } from "drizzle-orm";
import { getDb, type Executor } from "@/db";
import { CYCLE_STATUSES, cycles, periodicTests, periodicTestSignatures, sterilizers, testSchedules, users, type PeriodicTestKind, type TestKind } from "@/db/schema";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";
import type { PeriodicRecordStatus } from "@/lib/domain";
import { insertAttachment, type NewAttachment } from "./attachments";
import { latestConfirmedCycleAt } from "./cycle-outcomes";

/** Only a signed result is evidence: approved (a pass) or failure-confirmed (a fail). Submitted and returned records do not count. */
const SIGNED_RESULT_STATUSES = ["approved", "failure-confirmed"] as const satisfies readonly PeriodicRecordStatus[];

/**
 * What the schedule of the site's sterilizers (or one of them) is judged from: each scheduled
 * test, the latest pass and the latest attempt of each recorded kind, and for the kinds
 * evidenced by a logged cycle the latest approved pass, the latest approved failure and the
 * passing cycles still waiting for sign-off. Only signed periodic-test records count.
 */
export async function getScheduleFacts({
  siteId,
  sterilizerId,
  cycleEvidencedKinds,
}: {
  siteId: string;
  sterilizerId?: string;
  cycleEvidencedKinds: ReadonlyArray<Extract<PeriodicTestKind, TestKind>>;
}) {
  const db = getDb();
  const ofSterilizer = sterilizerId ? eq(periodicTests.sterilizerId, sterilizerId) : undefined;
  const byCycle = inArray(cycles.testKind, [...cycleEvidencedKinds]);
  const signed = inArray(periodicTests.status, SIGNED_RESULT_STATUSES);
  const [schedules, passes, attempts, cyclePasses, cycleFailures, awaitingSignOff, recordsAwaitingSignOff] = await Promise.all([
    db
      .select({ sterilizerId: testSchedules.sterilizerId, kind: testSchedules.kind, intervalDays: testSchedules.intervalDays, sterilizerName: sterilizers.name, sterilizerActive: sterilizers.active })
      .from(testSchedules)
      .innerJoin(sterilizers, eq(testSchedules.sterilizerId, sterilizers.id))
      .where(and(eq(sterilizers.siteId, siteId), sterilizerId ? eq(sterilizers.id, sterilizerId) : undefined)),
    db
      .select({ sterilizerId: periodicTests.sterilizerId, kind: periodicTests.kind, at: max(periodicTests.performedAt) })
      .from(periodicTests)
      .where(and(eq(periodicTests.siteId, siteId), eq(periodicTests.result, "pass"), signed, ofSterilizer))
      .groupBy(periodicTests.sterilizerId, periodicTests.kind),
    // The latest signed attempt of each kind, whatever its result.
    db
      .select({ sterilizerId: periodicTests.sterilizerId, kind: periodicTests.kind, at: periodicTests.performedAt, result: periodicTests.result })
      .from(periodicTests)
      .where(
        and(
          eq(periodicTests.siteId, siteId),
          ofSterilizer,
          signed,
          sql`${periodicTests.performedAt} = (select max(p2.performed_at) from periodic_tests p2 where p2.sterilizer_id = ${periodicTests.sterilizerId} and p2.kind = ${periodicTests.kind} and p2.status in ('approved', 'failure-confirmed'))`,
        ),
      ),
    latestCyclesOfEachKind({ siteId, kinds: cycleEvidencedKinds, result: "pass" }),
    latestCyclesOfEachKind({ siteId, kinds: cycleEvidencedKinds, result: "fail", also: sql`c.status = 'failure-confirmed' and c.verdict = 'fail'` }),
    // Not yet signed: draft or submitted. The unary + keeps SQLite on the site-and-status index (a few rows), off a walk of
    // every passing cycle or of every cycle in sterilizer order.
    db
      .select({ sterilizerId: cycles.sterilizerId, kind: cycles.testKind, n: count() })
      .from(cycles)
      .where(and(eq(cycles.siteId, siteId), inArray(cycles.status, UNSIGNED_CYCLE_STATUSES), sql`+${cycles.verdict} = 'pass'`, byCycle))
      .groupBy(sql`+${cycles.sterilizerId}`, sql`+${cycles.testKind}`),
    db
      .select({ sterilizerId: periodicTests.sterilizerId, kind: periodicTests.kind, n: count() })
      .from(periodicTests)
      .where(and(eq(periodicTests.siteId, siteId), eq(periodicTests.status, "submitted"), ofSterilizer))
      .groupBy(periodicTests.sterilizerId, periodicTests.kind),
  ]);
  return { schedules, passes, attempts, cyclePasses, cycleFailures, awaitingSignOff, recordsAwaitingSignOff };
}

/** Cycle statuses before a signature (neither approved, failure-confirmed nor returned). */
const UNSIGNED_CYCLE_STATUSES = CYCLE_STATUSES.filter((s) => s !== "approved" && s !== "failure-confirmed" && s !== "returned");

/** Per sterilizer of the site and kind, the latest confirmed cycle of `result` (and `also`): one index lookup each (cycles_outcome_idx). */
async function latestCyclesOfEachKind({ siteId, kinds, result, also }: { siteId: string; kinds: readonly string[]; result: "pass" | "fail"; also?: SQL }) {
  const at = latestConfirmedCycleAt({ sterilizerId: sql`s.id`, kind: sql`k.value`, result, siteId, also });
  return getDb().all<{ sterilizerId: string; kind: TestKind; at: string }>(sql`
    select * from (select s.id as sterilizerId, k.value as kind, ${at} as at from sterilizers s, json_each(${JSON.stringify(kinds)}) k where s.site_id = ${siteId})
     where at is not null`);
}

export type PeriodicTestFilter = { sterilizer?: string; kind?: string; result?: "pass" | "fail"; status?: PeriodicRecordStatus; from?: string; to?: string };

/** One page of the site's recorded tests, newest first. */
export async function listPeriodicTestsOfSite({ siteId, filter, page, pageSize }: { siteId: string; filter: PeriodicTestFilter; page: number; pageSize: number }) {
  const db = getDb();
  const conditions: Array<SQL | undefined> = [eq(periodicTests.siteId, siteId)];
  if (filter.sterilizer) conditions.push(eq(periodicTests.sterilizerId, filter.sterilizer));
  if (filter.kind) conditions.push(eq(periodicTests.kind, filter.kind as PeriodicTestKind));
  if (filter.result) conditions.push(eq(periodicTests.result, filter.result));
  if (filter.status) conditions.push(eq(periodicTests.status, filter.status));
  if (filter.from) conditions.push(gte(periodicTests.performedAt, filter.from));
  if (filter.to) conditions.push(lte(periodicTests.performedAt, `${filter.to}T23:59:59.999Z`));
  const where = and(...conditions);
  const [items, [{ total }]] = await Promise.all([
    db
      .select({
        id: periodicTests.id,
        kind: periodicTests.kind,
        performedAt: periodicTests.performedAt,
        result: periodicTests.result,
        status: periodicTests.status,
        measurements: periodicTests.measurements,
        notes: periodicTests.notes,
        sterilizerId: periodicTests.sterilizerId,
        sterilizerName: sterilizers.name,
        performedByName: users.name,
      })
      .from(periodicTests)
      .innerJoin(sterilizers, eq(periodicTests.sterilizerId, sterilizers.id))
      .innerJoin(users, eq(periodicTests.performedBy, users.id))
      .where(where)
      .orderBy(desc(periodicTests.performedAt))
      .limit(pageSize)
      .offset((page - 1) * pageSize),
    db.select({ total: count() }).from(periodicTests).where(where),
  ]);
  return { items, total };
}

export async function listSterilizerChoicesOfSite({ siteId }: { siteId: string }) {
  return getDb()
    .select({ id: sterilizers.id, name: sterilizers.name, serialNumber: sterilizers.serialNumber, active: sterilizers.active, chamberVolumeL: sterilizers.chamberVolumeL })
    .from(sterilizers)
    .where(eq(sterilizers.siteId, siteId))
    .orderBy(desc(sterilizers.active), sterilizers.name);
}

/** A new record with its audit event and, for a Bowie-Dick test, the photo of its indicator sheet, in one transaction. */
export async function insertPeriodicTest({ values, photo, audit }: { values: typeof periodicTests.$inferInsert; photo?: NewAttachment; audit: Omit<AuditInput, "entityType" | "entityId"> }) {
  return getDb().transaction(async (tx) => {
    const [created] = await tx.insert(periodicTests).values(values).returning();
    const attachment = photo ? await insertAttachment(tx, { ownerId: created.id, values: photo }) : undefined;
    const newValue = attachment ? { ...(audit.newValue as object), photo: { attachment: attachment.id, name: photo!.name, sha256: attachment.sha256 } } : audit.newValue;
    await appendAuditEvent(tx, { ...audit, newValue, entityType: "periodic-test", entityId: created.id });
    return created;
  });
}

/** One record of the site with its sterilizer and who recorded it; undefined off the site. */
export async function getPeriodicTestOfSite({ siteId, id, tx }: { siteId: string; id: string; tx?: Executor }) {
  const [row] = await (tx ?? getDb())
    .select({ test: periodicTests, sterilizerName: sterilizers.name, sterilizerSerial: sterilizers.serialNumber, performedByName: users.name })
    .from(periodicTests)
    .innerJoin(sterilizers, eq(periodicTests.sterilizerId, sterilizers.id))
    .innerJoin(users, eq(periodicTests.performedBy, users.id))
    .where(and(eq(periodicTests.id, id), eq(periodicTests.siteId, siteId)))
    .limit(1);
  return row;
}

export async function listPeriodicTestSignatures({ periodicTestId }: { periodicTestId: string }) {
  return getDb().select().from(periodicTestSignatures).where(eq(periodicTestSignatures.periodicTestId, periodicTestId)).orderBy(periodicTestSignatures.signedAt);
}

/**
 * Applies a signature to a submitted record in one transaction: the status, the signature, the
 * signer's cleared failure count and the audit event. `before` runs first and may refuse (the
 * record changed since it was hashed). False when the record was no longer submitted.
 */
export async function applyPeriodicTestSignature({
  signature,
  nextStatus,
  audit,
  before,
}: {
  signature: typeof periodicTestSignatures.$inferInsert & { id: string };
  nextStatus: PeriodicRecordStatus;
  audit: AuditInput;
  before: (tx: Executor) => Promise<void>;
}): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    await before(tx);
    const moved = await tx
      .update(periodicTests)
      .set({ status: nextStatus })
      .where(and(eq(periodicTests.id, signature.periodicTestId), eq(periodicTests.status, "submitted")))
      .returning({ id: periodicTests.id });
    if (moved.length === 0) return false;
    await tx.insert(periodicTestSignatures).values(signature);
    await tx.update(users).set({ failedSigningAttempts: 0, signingLockedUntil: null }).where(eq(users.id, signature.userId));
    await appendAuditEvent(tx, audit);
    return true;
  });
}

/** The site's records waiting for an engineer's signature, the longest-waiting first. */
export async function listPeriodicTestsAwaitingReview({ siteId }: { siteId: string }) {
  return getDb()
    .select({
      id: periodicTests.id,
      kind: periodicTests.kind,
      performedAt: periodicTests.performedAt,
      result: periodicTests.result,
      sterilizerName: sterilizers.name,
      performedBy: periodicTests.performedBy,
      performedByName: users.name,
      createdAt: periodicTests.createdAt,
    })
    .from(periodicTests)
    .innerJoin(sterilizers, eq(periodicTests.sterilizerId, sterilizers.id))
    .innerJoin(users, eq(periodicTests.performedBy, users.id))
    .where(and(eq(periodicTests.siteId, siteId), eq(periodicTests.status, "submitted")))
    .orderBy(periodicTests.createdAt);
}

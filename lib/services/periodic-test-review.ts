import "server-only";
import type { PeriodicTestSignature } from "@/db/schema";
import { listAttachmentsOf } from "@/db/queries/attachments";
import { applyPeriodicTestSignature, getPeriodicTestOfSite, listPeriodicTestSignatures, listPeriodicTestsAwaitingReview } from "@/db/queries/periodic-tests";
import { AppError } from "@/lib/errors";
import { can } from "@/lib/auth/permissions";
import { canonicalJson, sha256Hex } from "@/lib/integrity";
import { isIndicatorTest, type PeriodicRecordStatus, type PeriodicSignatureMeaning } from "@/lib/domain";
import { assertAllowed, type Actor } from "./access";
import { reauthenticate } from "./reauthenticate";
import { getSiteContext } from "./site";
import { refreshSterilizerStatus } from "./sterilizer-status";

type Executor = NonNullable<Parameters<typeof getPeriodicTestOfSite>[0]["tx"]>;
type SignedFields = Pick<PeriodicTestSignature, "periodicTestId" | "userId" | "printedName" | "role" | "meaning" | "reason" | "signedAt">;

/** What a signature on a periodic-test record binds (21 CFR 11.70): the record as entered and each photo's hash, recomputed from its bytes. */
async function recordContent({ siteId, id, tx }: { siteId: string; id: string; tx?: Executor }) {
  const row = await getPeriodicTestOfSite({ siteId, id, tx });
  if (!row) return null;
  const t = row.test;
  const photos = await listAttachmentsOf({ ownerKind: "periodic-test", ownerId: id, tx });
  return {
    record: {
      id: t.id,
      siteId: t.siteId,
      sterilizerId: t.sterilizerId,
      kind: t.kind,
      performedAt: t.performedAt,
      performedBy: t.performedBy,
      result: t.result,
      measurements: t.measurements,
      notes: t.notes,
    },
    attachments: photos.map((p) => ({ id: p.id, name: p.name, contentType: p.contentType, sha256: sha256Hex(new Uint8Array(p.bytes)) })),
  };
}

const signatureHash = (content: NonNullable<Awaited<ReturnType<typeof recordContent>>>, signed: SignedFields) => sha256Hex(canonicalJson({ record: content, signature: signed }));

const NEXT_STATUS: Record<PeriodicSignatureMeaning, PeriodicRecordStatus> = { approved: "approved", "failure-confirmed": "failure-confirmed", returned: "returned" };

export type PeriodicSignInput = { actor: Actor; id: string; password: string; meaning: PeriodicSignatureMeaning; reason: string | null };

/**
 * An engineer's electronic signature on a periodic-test record, as on a cycle: the password is
 * re-entered, the record's content is hashed into the signature, and the record's status follows
 * the meaning. A pass can only be approved, a fail only confirmed as a failure; either can be
 * returned with a reason. Whoever recorded the test cannot sign it.
 */
export async function signPeriodicTest({ actor, id, password, meaning, reason }: PeriodicSignInput) {
  const siteId = actor.siteId;
  const found = siteId ? await getPeriodicTestOfSite({ siteId, id }) : undefined;
  if (!siteId || !found) throw new AppError(404, "That periodic-test record was not found.");
  if (!can(actor.role, "periodic-test:sign")) throw new AppError(403, "Only validation engineers sign periodic-test records.");
  const now = new Date();
  const signer = await reauthenticate({ actor, password, now, entity: { type: "periodic-test", id } });
  const test = found.test;
  const cleanReason = reason?.trim() || null;
  if (meaning === "returned" && !cleanReason) throw new AppError(422, "Give the reason for returning this record, so whoever recorded it knows what to correct.", "reason");
  if (test.status !== "submitted")
    throw new AppError(409, `This record is ${test.status === "returned" ? "returned" : `already signed (${test.status})`}; only a record awaiting review can be signed.`);
  if (meaning === "approved" && test.result !== "pass") throw new AppError(409, "This test failed; it cannot be approved. Confirm the failure, or return it with the reason.");
  if (meaning === "failure-confirmed" && test.result !== "fail") throw new AppError(409, "This test passed; there is no failure to confirm. Approve it, or return it with the reason.");
  if (test.performedBy === actor.id) throw new AppError(403, "You recorded this test yourself; another engineer must sign it.");
  const content = await recordContent({ siteId, id });
  if (!content) throw new AppError(404, "That periodic-test record was not found.");
  if (isIndicatorTest(test.kind) && meaning !== "returned" && content.attachments.length === 0) {
    throw new AppError(409, "This Bowie-Dick record has no photo of its indicator sheet; return it so the test is recorded again with the photo.");
  }

  const signedAt = now.toISOString();
  const signed: SignedFields = { periodicTestId: id, userId: signer.id, printedName: signer.name, role: signer.role, meaning, reason: cleanReason, signedAt };
  const recordHash = signatureHash(content, signed);
  const signatureId = crypto.randomUUID();
  const nextStatus = NEXT_STATUS[meaning];
  const applied = await applyPeriodicTestSignature({
    signature: { id: signatureId, ...signed, recordHash },
    nextStatus,
    before: async (tx) => {
      const again = await recordContent({ siteId, id, tx });
      if (!again || signatureHash(again, signed) !== recordHash) throw new AppError(409, "The record changed while you were signing; reload it and sign again.");
    },
    audit: {
      actorId: actor.id,
      actorEmail: actor.email,
      siteId,
      action: `periodic-test.sign.${meaning}`,
      entityType: "periodic-test",
      entityId: id,
      oldValue: { status: "submitted" },
      newValue: { status: nextStatus, signature: signatureId, recordHash },
      reason: cleanReason,
    },
  });
  if (!applied) throw new AppError(409, "Someone else signed this record a moment ago; reload to see their decision.");
  await refreshSterilizerStatus({ sterilizerId: test.sterilizerId, actor, cause: `periodic-test.sign.${meaning}` });
  return { id: signatureId, periodicTestId: id, meaning, status: nextStatus, signedAt, recordHash, printedName: signer.name };
}

/** The record page of one periodic test: what was measured, its photo, its signatures (each re-checked) and what the actor may do. */
export async function getPeriodicTestRecord({ actor, id }: { actor: Actor; id: string }) {
  assertAllowed(actor, "equipment:read", "see periodic tests");
  const siteId = actor.siteId;
  const found = siteId ? await getPeriodicTestOfSite({ siteId, id }) : undefined;
  if (!siteId || !found) return null;
  const [content, signatures, photos, { timeZone }] = await Promise.all([
    recordContent({ siteId, id }),
    listPeriodicTestSignatures({ periodicTestId: id }),
    listAttachmentsOf({ ownerKind: "periodic-test", ownerId: id }),
    getSiteContext({ actor }),
  ]);
  const t = found.test;
  const maySign = can(actor.role, "periodic-test:sign");
  const signBlocked = !maySign
    ? null
    : t.status !== "submitted"
      ? "This record is no longer awaiting review."
      : t.performedBy === actor.id
        ? "You recorded this test yourself; another engineer must sign it."
        : null;
  return {
    id: t.id,
    kind: t.kind,
    status: t.status,
    result: t.result,
    performedAt: t.performedAt,
    createdAt: t.createdAt,
    notes: t.notes,
    measurements: t.measurements,
    sterilizer: { id: t.sterilizerId, name: found.sterilizerName, serialNumber: found.sterilizerSerial },
    performedBy: { id: t.performedBy, name: found.performedByName },
    photos: photos.map((p) => ({ id: p.id, name: p.name, contentType: p.contentType, sizeBytes: p.sizeBytes, sha256: p.sha256, uploadedAt: p.uploadedAt, url: `/api/attachments/${p.id}` })),
    signatures: signatures.map(({ id: sigId, recordHash, ...signed }) => ({ id: sigId, ...signed, recordHash, valid: !!content && signatureHash(content, signed) === recordHash })),
    timeZone,
    maySign,
    signBlocked,
  };
}
export type PeriodicTestRecordView = NonNullable<Awaited<ReturnType<typeof getPeriodicTestRecord>>>;

/** The periodic-test records of the actor's site waiting for a signature (the review queue's second list). */
export async function listPeriodicTestsForReview({ actor }: { actor: Actor }) {
  assertAllowed(actor, "review:queue", "see the review queue");
  if (!actor.siteId) return [];
  return listPeriodicTestsAwaitingReview({ siteId: actor.siteId });
}

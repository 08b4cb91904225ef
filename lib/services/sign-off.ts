import "server-only";
import { getCycleRow } from "@/db/queries/cycles";
import { applySignature, listUploaderIds, markCycleSubmitted } from "@/db/queries/reviews";
import type { Actor } from "@/db/queries/users";
import { enqueueCycleApprovedMail, enqueueCycleRejectedMail, enqueueCycleSubmittedMail } from "@/lib/services/mail";
import type { Cycle, SignatureMeaning } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { can } from "@/lib/auth/permissions";
import { sha256Hex } from "@/lib/integrity";
import type { CycleDetail } from "@/lib/cycles/contracts";
import { assertAllowed } from "./access";
import { getCycleDetail } from "./cycles";
import { reauthenticate } from "./reauthenticate";
import { assertBowieDickSignable } from "./bowie-dick";
import { buildRecordBundle, signatureHash, type SignedFields } from "./record-bundle";
import { renderReport, reportNumberFor } from "./reports";
import { anchorLedgerHeadAfterArchive } from "./ledger-anchors";

export async function submitCycle({ actor, id }: { actor: Actor; id: string }) {
  const cycle = await getCycleRow({ actor, id });
  if (!cycle) throw new AppError(404, "That cycle was not found.");
  assertAllowed(actor, "cycle:submit", "submit cycles");
  if (cycle.status === "submitted") throw new AppError(409, "This cycle is already waiting for review.");
  if (cycle.status === "approved") throw new AppError(409, "This cycle is approved and locked; a correction must be a new, linked record.");
  if (!cycle.currentAnalysisId) throw new AppError(409, "This cycle has no analysis yet; upload a logger file first.");
  const moved = await markCycleSubmitted({
    cycleId: id,
    fromStatus: cycle.status,
    submittedBy: actor.id,
    at: new Date().toISOString(),
    audit: {
      actorId: actor.id,
      actorEmail: actor.email,
      siteId: cycle.siteId,
      action: "cycle.submit",
      entityType: "cycle",
      entityId: id,
      oldValue: { status: cycle.status },
      newValue: { status: "submitted" },
    },
    inside: async (tx) => {
      await enqueueCycleSubmittedMail(tx, { cycleId: id });
    },
  });
  if (!moved) throw new AppError(409, "The cycle changed while you were submitting it; reload and try again.");
  return { id, status: "submitted" as const };
}

export type SignInput = { actor: Actor; id: string; password: string; meaning: SignatureMeaning; reason?: string | null };

/** Whether this signature may be applied to this cycle now: state, verdict and segregation of duties. */
async function assertSignable(actor: Actor, cycle: Cycle, meaning: SignatureMeaning, reason: string | null) {
  if (meaning === "rejected" && !reason) throw new AppError(400, "Give the reason for rejecting, so the technician knows what to correct.", "reason");
  if (cycle.status !== "submitted") {
    const state = cycle.status === "approved" ? "already approved and locked" : cycle.status === "rejected" ? "returned for correction" : "a draft that has not been submitted";
    throw new AppError(409, `This cycle is ${state}; only a submitted cycle can be signed.`);
  }
  if (meaning === "approved" && cycle.verdict !== "pass") {
    throw new AppError(409, "A cycle whose analysis failed cannot be approved; reject it with the reason, or correct it and analyse again.");
  }
  if (meaning === "approved") {
    const uploaders = await listUploaderIds({ cycleId: cycle.id });
    if (cycle.createdBy === actor.id || uploaders.includes(actor.id)) {
      throw new AppError(403, "You uploaded this cycle yourself; another engineer must approve it.");
    }
  }
  if (!cycle.currentAnalysisId) throw new AppError(409, "This cycle has no analysis to sign.");
}

/**
 * An electronic signature under 21 CFR 11.200: the signer re-enters the password at the moment of
 * signing; the signature stores printed name, role, meaning, reason, UTC time and the hash of the
 * record bundle it applies to. Approval locks the record and archives its report.
 */
export async function signCycle({ actor, id, password, meaning, reason }: SignInput) {
  const cycle = await getCycleRow({ actor, id });
  if (!cycle) throw new AppError(404, "That cycle was not found.");
  if (!can(actor.role, "cycle:sign")) throw new AppError(403, "Only validation engineers sign cycles.");
  const now = new Date();
  const signer = await reauthenticate({ actor, password, now, entity: { type: "cycle", id: cycle.id } });
  const cleanReason = reason?.trim() || null;
  await assertBowieDickSignable({ actor, cycle, meaning });
  await assertSignable(actor, cycle, meaning, cleanReason);
  const analysisId = cycle.currentAnalysisId!;

  const signedAt = now.toISOString();
  const signed: SignedFields = { cycleId: id, analysisId, userId: signer.id, printedName: signer.name, role: signer.role, meaning, reason: cleanReason, signedAt };
  const bundle = await buildRecordBundle({ cycleId: id, analysisId });
  if (!bundle) throw new AppError(409, "The record could not be assembled for signing.");
  const bundleHash = signatureHash(bundle, signed);
  const signatureId = crypto.randomUUID();

  // The approved report is rendered before the transaction (it takes a moment) with the
  // signature it will carry; the transaction then re-checks that nothing moved in between.
  const archived = meaning === "approved" ? await renderApprovedReport(actor, id, { id: signatureId, ...signed, bundleHash }) : undefined;
  const nextStatus = meaning === "approved" ? "approved" : meaning === "rejected" ? "rejected" : "submitted";
  const reportSha256 = archived ? sha256Hex(archived.bytes) : null;

  const applied = await applySignature({
    signature: { id: signatureId, ...signed, bundleHash },
    nextStatus,
    at: signedAt,
    report: archived ? { reportNumber: archived.reportNumber, sha256: reportSha256!, bytes: archived.bytes } : undefined,
    before: async (tx) => {
      const again = await buildRecordBundle({ cycleId: id, analysisId, tx });
      if (!again || signatureHash(again, signed) !== bundleHash) throw new AppError(409, "The record changed while you were signing; reload it and sign again.");
    },
    audit: (reportId) => ({
      actorId: actor.id,
      actorEmail: actor.email,
      siteId: cycle.siteId,
      action: `cycle.sign.${meaning}`,
      entityType: "cycle",
      entityId: id,
      oldValue: { status: "submitted" },
      newValue: { status: nextStatus, signature: signatureId, bundleHash, report: reportId, reportSha256 },
      reason: cleanReason,
    }),
    inside: async (tx) => {
      if (meaning === "approved") await enqueueCycleApprovedMail(tx, { cycleId: id, signerName: signer.name, reportNumber: archived!.reportNumber });
      if (meaning === "rejected") await enqueueCycleRejectedMail(tx, { cycleId: id, reason: cleanReason ?? "", signerName: signer.name });
    },
  });
  if (!applied) throw new AppError(409, "Someone else signed this cycle a moment ago; reload to see their decision.");
  if (archived) await anchorLedgerHeadAfterArchive();
  return { id: signatureId, cycleId: id, meaning, signedAt, bundleHash, printedName: signer.name };
}

async function renderApprovedReport(actor: Actor, id: string, signature: SignedFields & { id: string; bundleHash: string }) {
  const detail = await getCycleDetail({ actor, id });
  if (!detail) throw new AppError(404, "That cycle was not found.");
  const reportNumber = reportNumberFor(detail, signature.signedAt);
  const withSignature: CycleDetail = { ...detail, status: "approved", signatures: [...detail.signatures, { ...signature, valid: true }] };
  return { bytes: await renderReport(actor, withSignature, reportNumber, signature.signedAt, false), reportNumber };
}

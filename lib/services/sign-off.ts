import "server-only";
import { getCycleRow } from "@/db/queries/cycles";
import { applySignature, listContributions, markCycleSubmitted, type ContributionKind } from "@/db/queries/reviews";
import type { Actor } from "@/db/queries/users";
import { enqueueCycleApprovedMail, enqueueCycleFailureConfirmedMail, enqueueCycleRejectedMail, enqueueCycleSubmittedMail } from "@/lib/services/mail";
import type { Cycle } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { can } from "@/lib/auth/permissions";
import { sha256Hex } from "@/lib/integrity";
import { CYCLE_STATUS_LABELS, isLockedCycleStatus, needsCalibratedInstrument, testKindLabel, type CycleStatus, type SigningMeaning } from "@/lib/domain";
import type { CycleDetail } from "@/lib/cycles/contracts";
import { assertAllowed } from "./access";
import { getCycleDetail } from "./cycles";
import { reauthenticate } from "./reauthenticate";
import { assertBowieDickSignable } from "./bowie-dick";
import { buildRecordBundle, signatureHash, type SignedFields } from "./record-bundle";
import { renderReport, reportNumberFor } from "./reports";
import { anchorLedgerHeadAfterArchive } from "./ledger-anchors";
import { refreshSterilizerStatus } from "./sterilizer-status";

export async function submitCycle({ actor, id }: { actor: Actor; id: string }) {
  const cycle = await getCycleRow({ actor, id });
  if (!cycle) throw new AppError(404, "That cycle was not found.");
  assertAllowed(actor, "cycle:submit", "submit cycles");
  if (cycle.status === "submitted") throw new AppError(409, "This cycle is already waiting for review.");
  if (isLockedCycleStatus(cycle.status)) throw new AppError(409, `This cycle is ${CYCLE_STATUS_LABELS[cycle.status].toLowerCase()} and locked; a correction must be a new, linked record.`);
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

export type SignInput = { actor: Actor; id: string; password: string; meaning: SigningMeaning; reason?: string | null; acknowledgeReplacement?: boolean };

/** The signatures that decide the outcome: they close the record, archive its report and count for the sterilizer. */
const isDeciding = (meaning: SigningMeaning): meaning is "approved" | "failure-confirmed" => meaning === "approved" || meaning === "failure-confirmed";

const NEXT_STATUS: Record<SigningMeaning, CycleStatus> = { reviewed: "submitted", approved: "approved", "failure-confirmed": "failure-confirmed", returned: "returned" };

const CONTRIBUTION_WORDS: Record<ContributionKind, string> = {
  registered: "registered this cycle",
  uploaded: "uploaded a file of it",
  analysed: "made one of its analyses",
  edited: "changed its inputs",
};

/** Whether this signature may be applied to this cycle now: state, verdict, segregation of duties, instrument, replaced file. */
async function assertSignable(actor: Actor, cycle: Cycle, detail: CycleDetail, input: SignInput, reason: string | null) {
  const { meaning } = input;
  if (meaning === "returned" && !reason) throw new AppError(400, "Give the reason for returning the cycle, so the technician knows what to correct.", "reason");
  if (cycle.status !== "submitted") {
    const state = isLockedCycleStatus(cycle.status)
      ? `${CYCLE_STATUS_LABELS[cycle.status].toLowerCase()} and locked`
      : cycle.status === "returned"
        ? "returned for correction"
        : "a draft that has not been submitted";
    throw new AppError(409, `This cycle is ${state}; only a submitted cycle can be signed.`);
  }
  if (!cycle.currentAnalysisId) throw new AppError(409, "This cycle has no analysis to sign.");
  if (meaning === "approved" && cycle.verdict !== "pass") {
    throw new AppError(409, "A cycle whose analysis failed cannot be approved: confirm the failure (failure-confirmed), or return it with the reason when the data or an entry is wrong.");
  }
  if (meaning === "failure-confirmed" && cycle.verdict !== "fail") {
    throw new AppError(409, "This cycle's analysis passed, so there is no failure to confirm: approve it, or return it with the reason.");
  }
  if (!isDeciding(meaning)) return;
  const kinds = new Set((await listContributions({ cycleId: cycle.id })).filter((c) => c.userId === actor.id).map((c) => c.kind));
  // The ledger's edit events mostly repeat what the rows say; they are named only when nothing else is.
  if (kinds.size > 1) kinds.delete("edited");
  const own = (Object.keys(CONTRIBUTION_WORDS) as ContributionKind[]).filter((k) => kinds.has(k)).map((k) => CONTRIBUTION_WORDS[k]);
  if (own.length > 0) {
    const list = own.length > 1 ? `${own.slice(0, -1).join(", ")} and ${own[own.length - 1]}` : own[0];
    throw new AppError(403, `Segregation of duties: you ${list}, so another engineer must approve it or confirm its failure.`);
  }
  if (meaning === "approved") assertInstrumentEvidence(detail);
  // A thermometric test's figures are evidence only with the probes' positions (DOMAIN.md §2.3): a gap is an entry to correct, not a failure.
  if (meaning === "approved" && detail.positionProblem) throw new AppError(409, detail.positionProblem);
  const differences = detail.fileReplacement?.differences ?? [];
  if (differences.length > 0 && input.acknowledgeReplacement !== true) {
    throw new AppError(
      409,
      `The logger file was replaced after the first analysis and the recordings differ. ${differences.join(" ")} Acknowledge the replacement (acknowledgeReplacement: true) to sign.`,
      "acknowledgeReplacement",
    );
  }
}

/** Thermometric and logged air-leakage tests are evidence only when measured with an instrument calibrated on the test's date. */
function assertInstrumentEvidence(detail: CycleDetail) {
  if (!needsCalibratedInstrument(detail.testKind)) return;
  const kind = testKindLabel(detail.testKind);
  const instrument = detail.instrument;
  if (!instrument) {
    throw new AppError(409, `A ${kind.toLowerCase()} is evidence only with the instrument that measured it, and this cycle names none; return it so the instrument is named.`);
  }
  const calibration = instrument.calibration;
  const what = `${instrument.name} (serial ${instrument.serialNumber})`;
  if (!calibration) {
    throw new AppError(409, `${what} has no calibration certificate dated on or before the cycle's date, so it was not shown to be calibrated; this test cannot be approved.`);
  }
  if (calibration.lapsed) {
    throw new AppError(
      409,
      `The calibration of ${what} had lapsed on the cycle's date (${calibration.testDate}): certificate ${calibration.certificateNumber} was due on ${calibration.dueOn}. A test measured with it is not evidence, so it cannot be approved.`,
    );
  }
}

/**
 * An electronic signature under 21 CFR 11.200: the signer re-enters the password at the moment of
 * signing; the signature stores printed name, role, meaning, reason, UTC time and the hash of the
 * record bundle it applies to. Approval and a confirmed failure lock the record and archive its report.
 */
export async function signCycle(input: SignInput) {
  const { actor, id, password, meaning } = input;
  const cycle = await getCycleRow({ actor, id });
  if (!cycle) throw new AppError(404, "That cycle was not found.");
  if (!can(actor.role, "cycle:sign")) throw new AppError(403, "Only validation engineers sign cycles.");
  const now = new Date();
  const signer = await reauthenticate({ actor, password, now, entity: { type: "cycle", id: cycle.id } });
  const cleanReason = input.reason?.trim() || null;
  const detail = await getCycleDetail({ actor, id });
  if (!detail) throw new AppError(404, "That cycle was not found.");
  await assertBowieDickSignable({ actor, cycle, meaning });
  await assertSignable(actor, cycle, detail, input, cleanReason);
  const analysisId = cycle.currentAnalysisId!;

  const signedAt = now.toISOString();
  const signed: SignedFields = { cycleId: id, analysisId, userId: signer.id, printedName: signer.name, role: signer.role, meaning, reason: cleanReason, signedAt };
  const bundle = await buildRecordBundle({ cycleId: id, analysisId });
  if (!bundle) throw new AppError(409, "The record could not be assembled for signing.");
  const bundleHash = signatureHash(bundle, signed);
  const signatureId = crypto.randomUUID();
  const nextStatus = NEXT_STATUS[meaning];

  // The archived report is rendered before the transaction (it takes a moment) with the
  // signature it will carry; the transaction then re-checks that nothing moved in between.
  const archived = isDeciding(meaning) ? await renderSignedReport(actor, detail, nextStatus, { id: signatureId, ...signed, bundleHash }) : undefined;
  const reportSha256 = archived ? sha256Hex(archived.bytes) : null;
  const acknowledged = input.acknowledgeReplacement === true && detail.fileReplacement?.differences.length ? detail.fileReplacement.differences : undefined;

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
      newValue: { status: nextStatus, signature: signatureId, bundleHash, report: reportId, reportSha256, ...(acknowledged ? { acknowledgedReplacement: acknowledged } : {}) },
      reason: cleanReason,
    }),
    inside: async (tx) => {
      if (meaning === "approved") await enqueueCycleApprovedMail(tx, { cycleId: id, signerName: signer.name, reportNumber: archived!.reportNumber });
      if (meaning === "failure-confirmed") await enqueueCycleFailureConfirmedMail(tx, { cycleId: id, signerName: signer.name, reportNumber: archived!.reportNumber, reason: cleanReason });
      if (meaning === "returned") await enqueueCycleRejectedMail(tx, { cycleId: id, reason: cleanReason ?? "", signerName: signer.name });
    },
  });
  if (!applied) throw new AppError(409, "Someone else signed this cycle a moment ago; reload to see their decision.");
  if (archived) await anchorLedgerHeadAfterArchive();
  if (isDeciding(meaning)) await refreshStatusAfter(actor, cycle, meaning);
  return { id: signatureId, cycleId: id, meaning, signedAt, bundleHash, printedName: signer.name, status: nextStatus };
}

/** A confirmed outcome moves the sterilizer's status; the signature is already committed, and the status is recomputed on read if this fails. */
async function refreshStatusAfter(actor: Actor, cycle: Cycle, meaning: "approved" | "failure-confirmed") {
  try {
    await refreshSterilizerStatus({ sterilizerId: cycle.sterilizerId, actor, cause: `cycle ${cycle.cycleNumber} ${meaning === "approved" ? "approved" : "failure confirmed"}` });
  } catch (error) {
    console.error("[papin] the sterilizer's status could not be refreshed after a signature", error);
  }
}

async function renderSignedReport(actor: Actor, detail: CycleDetail, status: CycleStatus, signature: SignedFields & { id: string; bundleHash: string }) {
  const reportNumber = reportNumberFor(detail, signature.signedAt);
  const withSignature: CycleDetail = { ...detail, status, signatures: [...detail.signatures, { ...signature, valid: true }] };
  return { bytes: await renderReport(actor, withSignature, reportNumber, signature.signedAt, false), reportNumber };
}

import "server-only";
import type { Executor } from "@/db";
import { appendAuditEvent } from "@/db/ledger";
import { getStudyRecordRows } from "@/db/queries/studies";
import { applyStudySignature, insertStudyReportRow, setRequalificationDue } from "@/db/queries/studies-writes";
import type { Actor } from "@/db/queries/users";
import { AppError, notFound } from "@/lib/errors";
import { canonicalJson, sha256Hex } from "@/lib/integrity";
import type { StudySignatureMeaning } from "@/lib/domain/studies";
import type { Role } from "@/lib/domain";
import type { StudyDetail } from "@/lib/studies/contracts";
import { NEXT_STUDY_STATUS, studySignatureRefusal } from "@/lib/studies/sign-rules";
import { addMonths } from "@/lib/studies/dates";
import { assertAllowed } from "./access";
import { reauthenticate } from "./reauthenticate";
import { auditActor, getSiteContext } from "./site";
import { studyDetailOf, studyOfSite } from "./studies-detail";
import { anchorLedgerHeadAfterArchive } from "./ledger-anchors";
import { renderStudyReportForArchive } from "./studies-report-archive";
import { studyReportNumber } from "./study-report";

/**
 * What a study signature is bound to: criteria, pattern, runs (analysis ids and sensor maps), the indicator readings
 * that count, deviations with their status, and the summary figures. Any change to these changes the hash.
 */
export function studyContent(detail: StudyDetail) {
  return {
    studyId: detail.id,
    studyNumber: detail.studyNumber,
    kind: detail.kind,
    sterilizerId: detail.sterilizer.id,
    profileId: detail.profile.id,
    criteria: detail.criteria,
    protocol: detail.protocol,
    requalificationMonths: detail.requalificationMonths,
    pattern: { id: detail.loadingPattern.id, name: detail.loadingPattern.name, items: detail.loadingPattern.items, positions: detail.loadingPattern.positions },
    runs: detail.runs.map((r) => ({ runNumber: r.runNumber, cycleId: r.cycleId, analysisId: r.analysisId, sensorMap: r.sensorMap })),
    indicators: detail.indicators.filter((i) => i.current).map((i) => i.id),
    deviations: detail.deviations.map((d) => ({ id: d.id, status: d.status })),
    summary: {
      runs: detail.summary.runs.map((r) => ({ runNumber: r.runNumber, judgement: r.judgement, coldSpot: r.coldSpot, spreadK: r.spreadK })),
      positions: detail.summary.positions.map((p) => ({ position: p.position, minF0: p.minF0, minTemp: p.minTemp, maxTemp: p.maxTemp })),
      coldSpot: detail.summary.coldSpot,
      spreadK: detail.summary.spreadK,
      consecutive: detail.summary.consecutive,
    },
  };
}

type Signed = { userId: string; printedName: string; role: Role; meaning: StudySignatureMeaning; reason: string | null; signedAt: string };
const contentHashOf = (detail: StudyDetail, signed: Signed) => sha256Hex(canonicalJson({ content: studyContent(detail), signed }));

/**
 * A study signature (21 CFR 11.200 as for cycles): password re-entered, printed name, role, meaning, reason, UTC time and
 * the hash of what is signed. QA approval archives the study report and sets the pattern's requalification date, in
 * the same transaction as the signature.
 */
export async function signStudy({ actor, id, password, meaning, reason }: { actor: Actor; id: string; password: string; meaning: StudySignatureMeaning; reason?: string | null }) {
  assertAllowed(actor, "study:sign", "sign qualification studies");
  const study = await studyOfSite(actor, id);
  const now = new Date();
  const signer = await reauthenticate({ actor, password, now, entity: { type: "study", id: study.id } });
  const rows = await getStudyRecordRows({ studyId: study.id });
  if (!rows) throw notFound("That study");
  const detail = studyDetailOf(actor, rows);
  const cleanReason = reason?.trim() || null;
  const refusal = studySignatureRefusal(
    {
      actor,
      status: detail.status,
      authorId: detail.author.id,
      signatures: detail.signatures,
      seriesComplete: detail.summary.consecutive.complete,
      pendingRuns: detail.summary.runs.filter((r) => r.judgement === "pending").length,
      openDeviations: detail.deviations.filter((d) => d.status === "open").length,
      runsRequired: detail.criteria.runsRequired,
    },
    meaning,
    cleanReason,
  );
  if (refusal) throw new AppError(refusal.status, refusal.message, refusal.status === 400 ? "reason" : undefined);

  const signedAt = now.toISOString();
  const signed: Signed = { userId: signer.id, printedName: signer.name, role: signer.role, meaning, reason: cleanReason, signedAt };
  const contentHash = contentHashOf(detail, signed);
  const signatureId = crypto.randomUUID();
  const nextStatus = NEXT_STUDY_STATUS[meaning];
  const approving = meaning === "qa-approved";
  const { site, timeZone, today } = approving ? await getSiteContext({ actor, now }) : { site: undefined, timeZone: "UTC", today: "" };
  const dueOn = approving ? addMonths(today, detail.requalificationMonths) : null;
  const reportNumber = studyReportNumber(detail.studyNumber);
  const archived = approving
    ? await renderStudyReportForArchive(
        {
          ...detail,
          status: nextStatus,
          signatures: [...detail.signatures, { id: signatureId, ...signed, role: signer.role, contentHash }],
          loadingPattern: { ...detail.loadingPattern, requalificationDueOn: dueOn },
        },
        { reportNumber, generatedAt: signedAt, site: { name: site?.name ?? "", timeZone } },
      )
    : null;
  const reportSha256 = archived ? sha256Hex(archived) : null;

  const applied = await applyStudySignature({
    studyId: study.id,
    fromStatus: detail.status,
    nextStatus,
    signature: { id: signatureId, studyId: study.id, ...signed, contentHash },
    at: signedAt,
    before: async (tx) => {
      const again = await getStudyRecordRows({ studyId: study.id, tx });
      if (!again || contentHashOf(studyDetailOf(actor, again), signed) !== contentHash) throw new AppError(409, "The study changed while you were signing; reload it and sign again.");
    },
    inside: archived ? (tx) => archiveInside(tx, { actor, detail, signatureId, reportNumber, bytes: archived, sha256: reportSha256!, dueOn: dueOn!, at: signedAt }) : undefined,
    audit: {
      ...auditActor(actor),
      action: `study.sign.${meaning}`,
      entityType: "study",
      entityId: study.id,
      oldValue: { status: detail.status },
      newValue: { status: nextStatus, signature: signatureId, contentHash, ...(archived ? { reportNumber, reportSha256, requalificationDueOn: dueOn } : {}) },
      reason: cleanReason,
    },
  });
  if (!applied) throw new AppError(409, "Someone else signed this study a moment ago; reload to see their decision.");
  if (archived) await anchorLedgerHeadAfterArchive();
  return { id: signatureId, meaning, signedAt, contentHash, printedName: signer.name, status: nextStatus, report: archived ? { reportNumber, sha256: reportSha256 } : null };
}

/** QA approval's part of the transaction: the archived report and the loading pattern's next requalification date. */
async function archiveInside(tx: Executor, input: { actor: Actor; detail: StudyDetail; signatureId: string; reportNumber: string; bytes: Uint8Array; sha256: string; dueOn: string; at: string }) {
  const { actor, detail } = input;
  await insertStudyReportRow(tx, { studyId: detail.id, signatureId: input.signatureId, reportNumber: input.reportNumber, sha256: input.sha256, bytes: input.bytes });
  await setRequalificationDue(tx, { patternId: detail.loadingPattern.id, dueOn: input.dueOn, at: input.at });
  await appendAuditEvent(tx, {
    ...auditActor(actor),
    action: "loading-pattern.requalification-due",
    entityType: "loading-pattern",
    entityId: detail.loadingPattern.id,
    oldValue: { requalificationDueOn: detail.loadingPattern.requalificationDueOn },
    newValue: { requalificationDueOn: input.dueOn, study: detail.id, studyNumber: detail.studyNumber },
  });
}

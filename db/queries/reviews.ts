import "server-only";
import { and, desc, eq, gte, like, lte, ne, or } from "drizzle-orm";
import { getDb, type Executor } from "@/db";
import { cycles, loggerFiles, reports, signatures, sterilizers, users, type SignatureMeaning } from "@/db/schema";
import { appendAuditEvent } from "@/db/ledger";
import { buildRecordBundle, signatureHash, type SignedFields } from "./signature-bundle";
import { getCycleDetail, getCycleRow, getCycleSeries } from "./cycles";
import { enqueueCycleApprovedMail, enqueueCycleRejectedMail, enqueueCycleSubmittedMail } from "@/lib/services/mail";
import type { Actor } from "./users";
import { AppError } from "@/lib/errors";
import { verifyPassword } from "@/lib/auth/password";
import { can } from "@/lib/auth/permissions";
import { sha256Hex } from "@/lib/integrity";
import { renderCycleReport } from "@/lib/reports";
import type { CycleDetail } from "@/lib/cycles/contracts";

/** After this many wrong passwords in a row signing is locked for SIGNING_LOCK_MINUTES. */
export const MAX_SIGNING_FAILURES = 5;
export const SIGNING_LOCK_MINUTES = 15;

export const REPORT_VERIFY_HINT =
  "To check this report, sign in to Papin and drop the PDF on Signed archive → Check a report, or POST it to /api/reports/verify. A byte-for-byte match names the archived record.";

export async function submitCycle({ actor, id, origin }: { actor: Actor; id: string; origin?: string }) {
  const db = getDb();
  const cycle = await getCycleRow({ actor, id });
  if (!cycle) throw new AppError(404, "That cycle was not found.");
  if (!can(actor.role, "cycle:submit")) throw new AppError(403, "Your role does not allow you to submit cycles.");
  if (cycle.status === "submitted") throw new AppError(409, "This cycle is already waiting for review.");
  if (cycle.status === "approved") throw new AppError(409, "This cycle is approved and locked; a correction must be a new, linked record.");
  if (!cycle.currentAnalysisId) throw new AppError(409, "This cycle has no analysis yet; upload a logger file first.");
  const now = new Date().toISOString();
  await db.transaction(async (tx) => {
    const updated = await tx
      .update(cycles)
      .set({ status: "submitted", submittedBy: actor.id, submittedAt: now, updatedAt: now })
      .where(and(eq(cycles.id, id), eq(cycles.status, cycle.status)))
      .returning({ id: cycles.id });
    if (updated.length === 0) throw new AppError(409, "The cycle changed while you were submitting it; reload and try again.");
    await appendAuditEvent(tx, {
      actorId: actor.id,
      actorEmail: actor.email,
      siteId: cycle.siteId,
      action: "cycle.submit",
      entityType: "cycle",
      entityId: id,
      oldValue: { status: cycle.status },
      newValue: { status: "submitted" },
    });
    await enqueueCycleSubmittedMail(tx, { cycleId: id, origin });
  });
  return { id, status: "submitted" as const };
}

export type SignInput = { actor: Actor; id: string; password: string; meaning: SignatureMeaning; reason?: string | null; origin?: string };

/**
 * An electronic signature under 21 CFR 11.200: the signer re-enters the password at the moment of
 * signing; the signature stores printed name, role, meaning, reason, UTC time and the hash of the
 * record bundle it applies to. Approval locks the record and archives its report.
 */
export async function signCycle({ actor, id, password, meaning, reason, origin }: SignInput) {
  const db = getDb();
  const cycle = await getCycleRow({ actor, id });
  if (!cycle) throw new AppError(404, "That cycle was not found.");
  if (!can(actor.role, "cycle:sign")) throw new AppError(403, "Only validation engineers sign cycles.");

  const [signer] = await db.select().from(users).where(eq(users.id, actor.id)).limit(1);
  if (!signer || signer.disabled) throw new AppError(401, "Please sign in again.");
  const now = new Date();
  if (signer.signingLockedUntil && new Date(signer.signingLockedUntil) > now) {
    throw new AppError(423, `Signing is locked after ${MAX_SIGNING_FAILURES} wrong passwords; try again after ${new Date(signer.signingLockedUntil).toISOString().slice(11, 16)} UTC or ask an administrator to reset your password.`);
  }
  if (!(await verifyPassword(signer.passwordHash, password))) {
    const failures = signer.failedSigningAttempts + 1;
    const lockUntil = failures >= MAX_SIGNING_FAILURES ? new Date(now.getTime() + SIGNING_LOCK_MINUTES * 60_000).toISOString() : null;
    await db.transaction(async (tx) => {
      await tx
        .update(users)
        .set({ failedSigningAttempts: lockUntil ? 0 : failures, signingLockedUntil: lockUntil })
        .where(eq(users.id, signer.id));
      await appendAuditEvent(tx, {
        actorId: actor.id,
        actorEmail: actor.email,
        siteId: cycle.siteId,
        action: lockUntil ? "signature.locked" : "signature.failed",
        entityType: "cycle",
        entityId: id,
        reason: lockUntil ? `wrong password ${MAX_SIGNING_FAILURES} times; signing locked for ${SIGNING_LOCK_MINUTES} min` : "wrong password",
      });
    });
    if (lockUntil) throw new AppError(423, `Wrong password. Signing is now locked for ${SIGNING_LOCK_MINUTES} minutes.`, "password");
    throw new AppError(401, `The password is not correct; the signature was not applied (${MAX_SIGNING_FAILURES - failures} attempts left).`, "password");
  }

  const cleanReason = reason?.trim() || null;
  if (meaning === "rejected" && !cleanReason) throw new AppError(400, "Give the reason for rejecting, so the technician knows what to correct.", "reason");
  if (cycle.status !== "submitted") {
    const state = cycle.status === "approved" ? "already approved and locked" : cycle.status === "rejected" ? "returned for correction" : "a draft that has not been submitted";
    throw new AppError(409, `This cycle is ${state}; only a submitted cycle can be signed.`);
  }
  if (meaning === "approved" && cycle.verdict !== "pass") {
    throw new AppError(409, "A cycle whose analysis failed cannot be approved; reject it with the reason, or correct it and analyse again.");
  }
  if (meaning === "approved") {
    const uploaders = await db.select({ by: loggerFiles.uploadedBy }).from(loggerFiles).where(eq(loggerFiles.cycleId, id));
    if (cycle.createdBy === actor.id || uploaders.some((u) => u.by === actor.id)) {
      throw new AppError(403, "You uploaded this cycle yourself; another engineer must approve it.");
    }
  }
  if (!cycle.currentAnalysisId) throw new AppError(409, "This cycle has no analysis to sign.");

  const signedAt = now.toISOString();
  const signed: SignedFields = {
    cycleId: id,
    analysisId: cycle.currentAnalysisId,
    userId: signer.id,
    printedName: signer.name,
    role: signer.role,
    meaning,
    reason: cleanReason,
    signedAt,
  };
  const bundle = await buildRecordBundle(db, { cycleId: id, analysisId: cycle.currentAnalysisId });
  if (!bundle) throw new AppError(409, "The record could not be assembled for signing.");
  const bundleHash = signatureHash(bundle, signed);
  const signatureId = crypto.randomUUID();

  // The approved report is rendered before the transaction (it takes a moment) with the
  // signature it will carry; the transaction then re-checks that nothing moved in between.
  let archived: { bytes: Buffer; reportNumber: string } | undefined;
  if (meaning === "approved") {
    const detail = await getCycleDetail({ actor, id });
    if (!detail) throw new AppError(404, "That cycle was not found.");
    const reportNumber = reportNumberFor(detail, signedAt);
    const withSignature: CycleDetail = {
      ...detail,
      status: "approved",
      signatures: [...detail.signatures, { id: signatureId, ...signed, role: signer.role, bundleHash, valid: true }],
    };
    archived = { bytes: await renderReport(actor, withSignature, reportNumber, signedAt, false), reportNumber };
  }

  await db.transaction(async (tx) => {
    const again = await buildRecordBundle(tx, { cycleId: id, analysisId: cycle.currentAnalysisId! });
    if (!again || signatureHash(again, signed) !== bundleHash) throw new AppError(409, "The record changed while you were signing; reload it and sign again.");
    const nextStatus = meaning === "approved" ? "approved" : meaning === "rejected" ? "rejected" : "submitted";
    const updated = await tx
      .update(cycles)
      .set({ status: nextStatus, updatedAt: signedAt })
      .where(and(eq(cycles.id, id), eq(cycles.status, "submitted")))
      .returning({ id: cycles.id });
    if (updated.length === 0) throw new AppError(409, "Someone else signed this cycle a moment ago; reload to see their decision.");
    await tx.insert(signatures).values({ id: signatureId, ...signed, bundleHash });
    await tx.update(users).set({ failedSigningAttempts: 0, signingLockedUntil: null }).where(eq(users.id, signer.id));
    let reportId: string | null = null;
    if (archived) {
      const [report] = await tx
        .insert(reports)
        .values({ cycleId: id, signatureId, reportNumber: archived.reportNumber, sha256: sha256Hex(archived.bytes), sizeBytes: archived.bytes.byteLength, bytes: archived.bytes })
        .returning({ id: reports.id });
      reportId = report.id;
    }
    await appendAuditEvent(tx, {
      actorId: actor.id,
      actorEmail: actor.email,
      siteId: cycle.siteId,
      action: `cycle.sign.${meaning}`,
      entityType: "cycle",
      entityId: id,
      oldValue: { status: "submitted" },
      newValue: { status: nextStatus, signature: signatureId, bundleHash, report: reportId, reportSha256: archived ? sha256Hex(archived.bytes) : null },
      reason: cleanReason,
    });
    if (meaning === "approved") await enqueueCycleApprovedMail(tx, { cycleId: id, signerName: signer.name, reportNumber: archived!.reportNumber, origin });
    if (meaning === "rejected") await enqueueCycleRejectedMail(tx, { cycleId: id, reason: cleanReason ?? "", signerName: signer.name, origin });
  });
  return { id: signatureId, cycleId: id, meaning, signedAt, bundleHash, printedName: signer.name };
}

function reportNumberFor(detail: CycleDetail, at: string) {
  const stamp = at.slice(0, 19).replace(/[-:T]/g, "");
  return `PR-${detail.sterilizer.serialNumber}-${stamp}-${detail.id.slice(0, 6).toUpperCase()}`;
}

async function renderReport(actor: Actor, detail: CycleDetail, reportNumber: string, generatedAt: string, draft: boolean) {
  const series = await getCycleSeries({ actor, id: detail.id, points: 1200 });
  if (!series) throw new AppError(409, "This cycle has no chart data to print.");
  return renderCycleReport({ detail, series, reportNumber, generatedAt, verifyHint: REPORT_VERIFY_HINT, draft });
}

/**
 * The PDF of a cycle: the archived bytes once approved (never re-rendered, so later code changes
 * cannot alter them), otherwise a fresh draft marked as not approved.
 */
export async function getCycleReport({ actor, id }: { actor: Actor; id: string }) {
  const cycle = await getCycleRow({ actor, id });
  if (!cycle) throw new AppError(404, "That cycle was not found.");
  const db = getDb();
  const [archived] = await db.select().from(reports).where(eq(reports.cycleId, id)).limit(1);
  if (archived && cycle.status === "approved") {
    return { bytes: new Uint8Array(archived.bytes), fileName: `${archived.reportNumber}.pdf`, archived: true, reportNumber: archived.reportNumber };
  }
  const detail = await getCycleDetail({ actor, id });
  if (!detail) throw new AppError(404, "That cycle was not found.");
  const generatedAt = new Date().toISOString();
  const reportNumber = `DRAFT-${detail.cycleNumber}`;
  const bytes = await renderReport(actor, detail, reportNumber, generatedAt, true);
  await db.transaction(async (tx) =>
    appendAuditEvent(tx, { actorId: actor.id, actorEmail: actor.email, siteId: cycle.siteId, action: "report.export-draft", entityType: "cycle", entityId: id }),
  );
  return { bytes: new Uint8Array(bytes), fileName: `${reportNumber}.pdf`, archived: false, reportNumber };
}

/** Byte-for-byte comparison against the archive: the hash finds the candidate, the bytes confirm it. */
export async function verifyReportBytes({ actor, bytes }: { actor: Actor; bytes: Uint8Array }) {
  const sha256 = sha256Hex(bytes);
  const [row] = await getDb()
    .select({ id: reports.id, cycleId: reports.cycleId, reportNumber: reports.reportNumber, stored: reports.bytes, createdAt: reports.createdAt, siteId: cycles.siteId, cycleNumber: cycles.cycleNumber })
    .from(reports)
    .innerJoin(cycles, eq(reports.cycleId, cycles.id))
    .where(eq(reports.sha256, sha256))
    .limit(1);
  const match = !!row && Buffer.compare(Buffer.from(row.stored), Buffer.from(bytes)) === 0 && row.siteId === actor.siteId;
  await recordVerification(actor, { sha256, match, cycleId: match ? row!.cycleId : null });
  if (!match) return { match: false as const, sha256 };
  return { match: true as const, sha256, cycleId: row!.cycleId, reportNumber: row!.reportNumber, cycleNumber: row!.cycleNumber, archivedAt: row!.createdAt };
}

async function recordVerification(actor: Actor, v: { sha256: string; match: boolean; cycleId: string | null }) {
  await getDb().transaction((tx) =>
    appendAuditEvent(tx, {
      actorId: actor.id,
      actorEmail: actor.email,
      siteId: actor.siteId,
      action: "report.verify",
      entityType: "report",
      entityId: v.cycleId,
      newValue: v,
    }),
  );
}

export async function listArchivedReports({ actor, q, from, to }: { actor: Actor; q?: string; from?: string; to?: string }) {
  const needle = q?.trim() ? `%${q.trim()}%` : undefined;
  return getDb()
    .select({
      id: reports.id,
      reportNumber: reports.reportNumber,
      sha256: reports.sha256,
      sizeBytes: reports.sizeBytes,
      createdAt: reports.createdAt,
      cycleId: cycles.id,
      cycleNumber: cycles.cycleNumber,
      verdict: cycles.verdict,
      startedAt: cycles.startedAt,
      sterilizerName: sterilizers.name,
      signerName: signatures.printedName,
    })
    .from(reports)
    .innerJoin(cycles, eq(reports.cycleId, cycles.id))
    .innerJoin(sterilizers, eq(cycles.sterilizerId, sterilizers.id))
    .leftJoin(signatures, eq(reports.signatureId, signatures.id))
    .where(
      and(
        eq(cycles.siteId, actor.siteId ?? ""),
        ne(cycles.status, "draft"),
        needle
          ? or(like(reports.reportNumber, needle), like(cycles.cycleNumber, needle), like(sterilizers.name, needle), like(signatures.printedName, needle))
          : undefined,
        from ? gte(reports.createdAt, from) : undefined,
        to ? lte(reports.createdAt, `${to}T23:59:59.999Z`) : undefined,
      ),
    )
    .orderBy(desc(reports.createdAt));
}

export async function getArchivedReport({ actor, id }: { actor: Actor; id: string }) {
  const [row] = await getDb()
    .select({ bytes: reports.bytes, reportNumber: reports.reportNumber, siteId: cycles.siteId, cycleId: cycles.id })
    .from(reports)
    .innerJoin(cycles, eq(reports.cycleId, cycles.id))
    .where(eq(reports.id, id))
    .limit(1);
  if (!row || row.siteId !== actor.siteId) return undefined;
  await getDb().transaction((tx) =>
    appendAuditEvent(tx, { actorId: actor.id, actorEmail: actor.email, siteId: actor.siteId, action: "report.download", entityType: "cycle", entityId: row.cycleId, newValue: { report: row.reportNumber } }),
  );
  return row;
}

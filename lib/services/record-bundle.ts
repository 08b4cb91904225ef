import "server-only";
import type { Signature } from "@/db/schema";
import { getRecordBundleRows, type RecordBundleRows } from "@/db/queries/signature-bundle";
import { canonicalJson, sha256Hex } from "@/lib/integrity";
import { indicatorSheetBundle } from "./bowie-dick";

type Executor = Parameters<typeof getRecordBundleRows>[0]["tx"];

/**
 * Version 1 of what a signature binds to (21 CFR 11.70): the cycle's fields, the analysis that was
 * shown (its figures, hashed), and the hash of every stored file's bytes, recomputed from the bytes.
 * Kept unchanged so that signatures given before version 2 still verify.
 */
function bundleV1({ cycle, analysis, files }: RecordBundleRows) {
  return {
    cycle: {
      id: cycle.id,
      siteId: cycle.siteId,
      sterilizerId: cycle.sterilizerId,
      profileId: cycle.profileId,
      instrumentId: cycle.instrumentId,
      cycleNumber: cycle.cycleNumber,
      testKind: cycle.testKind,
      loadDescription: cycle.loadDescription,
      startedAt: cycle.startedAt,
      supersedesId: cycle.supersedesId,
    },
    analysis: {
      id: analysis.id,
      engineVersion: analysis.engineVersion,
      inputHash: analysis.inputHash,
      verdict: analysis.verdict,
      limits: analysis.limits,
      resultSha256: sha256Hex(canonicalJson(analysis.result)),
    },
    files: files.map((f) => ({ name: f.name, sha256: sha256Hex(new Uint8Array(f.bytes)) })),
  };
}

/**
 * Version 2 (current): version 1, marked, with one hash of the signed analysis (its input hash and
 * its result), over the files that existed when that analysis was made: a correction uploaded
 * after a return does not change what the earlier signature was given for. (Every upload makes a
 * new analysis, so at signing these are all the cycle's files; hiding one by its time changes the
 * set, and so the hash.)
 */
function bundleOf(rows: RecordBundleRows) {
  const v1 = bundleV1({ ...rows, files: rows.files.filter((f) => f.uploadedAt <= rows.analysis.createdAt) });
  const analysisSha256 = sha256Hex(canonicalJson({ inputHash: rows.analysis.inputHash, result: rows.analysis.result }));
  // The test pack or load and its lot (migration 0020) are bound only when recorded, so records without them keep their hashes.
  const load = rows.cycle.loadType ? { loadType: rows.cycle.loadType, loadLot: rows.cycle.loadLot } : {};
  return { bundleVersion: 2 as const, ...v1, cycle: { ...v1.cycle, ...load }, analysis: { ...v1.analysis, sha256: analysisSha256 } };
}

export type RecordBundle = ReturnType<typeof bundleOf> & { indicatorSheet?: Awaited<ReturnType<typeof indicatorSheetBundle>> };

export async function buildRecordBundle({ cycleId, analysisId, tx }: { cycleId: string; analysisId: string; tx?: Executor }): Promise<RecordBundle | null> {
  const rows = await getRecordBundleRows({ cycleId, analysisId, tx });
  return rows ? currentBundleOf(rows, tx) : null;
}

/** The current recipe (version 2); a Bowie-Dick cycle's verdict is its indicator sheet, so the bundle binds the reading and its photo (absent on other cycles, so their hashes stay as they were). */
async function currentBundleOf(rows: RecordBundleRows, tx?: Executor): Promise<RecordBundle> {
  const indicatorSheet = rows.cycle.testKind === "bowie-dick" ? await indicatorSheetBundle({ cycleId: rows.cycle.id, tx }) : undefined;
  return indicatorSheet ? { ...bundleOf(rows), indicatorSheet } : bundleOf(rows);
}

export type SignedFields = Pick<Signature, "cycleId" | "analysisId" | "userId" | "printedName" | "role" | "meaning" | "reason" | "signedAt">;

export function signatureHash(bundle: RecordBundle | ReturnType<typeof bundleV1>, signed: SignedFields): string {
  return sha256Hex(canonicalJson({ record: bundle, signature: signed }));
}

const signedFieldsOf = (s: Signature): SignedFields => ({
  cycleId: s.cycleId,
  analysisId: s.analysisId,
  userId: s.userId,
  printedName: s.printedName,
  role: s.role,
  meaning: s.meaning,
  reason: s.reason,
  signedAt: s.signedAt,
});

/** Signatures that close the record: the cycle must go on pointing at the analysis they were given for. */
const CLOSING_MEANINGS: ReadonlySet<string> = new Set(["approved", "failure-confirmed"]);

/**
 * Whether the cycle points at another analysis than the signed one without a correction to
 * explain it. A review or a return may be followed by a correction (a newer analysis); a closing
 * signature never may, since the record is then locked.
 */
function repointed({ cycle, currentAnalysis }: RecordBundleRows, signature: Signature): boolean {
  if (cycle.currentAnalysisId === signature.analysisId) return false;
  if (CLOSING_MEANINGS.has(signature.meaning)) return true;
  return !currentAnalysis || currentAnalysis.createdAt <= signature.signedAt;
}

export type SignatureCheck = { valid: boolean; problem: string | null };
const invalid = (problem: string): SignatureCheck => ({ valid: false, problem });

/**
 * Recomputes the bundle from the signature's own analysis as stored now (version 2, or version 1
 * for a signature given before it); a moved signature, a changed record or a cycle re-pointed at
 * another analysis fails, with the reason.
 */
export async function checkSignature({ signature }: { signature: Signature }): Promise<SignatureCheck> {
  const rows = await getRecordBundleRows({ cycleId: signature.cycleId, analysisId: signature.analysisId });
  if (!rows) return invalid("The analysis this signature was given for is no longer part of the record.");
  const signed = signedFieldsOf(signature);
  const matches = signatureHash(await currentBundleOf(rows), signed) === signature.bundleHash || signatureHash(bundleV1(rows), signed) === signature.bundleHash;
  if (!matches) return invalid("The record has changed since this signature was given.");
  if (repointed(rows, signature)) return invalid("The record now points at another analysis than the one signed.");
  return { valid: true, problem: null };
}

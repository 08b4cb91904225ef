import "server-only";
import type { Signature } from "@/db/schema";
import { getRecordBundleRows, type RecordBundleRows } from "@/db/queries/signature-bundle";
import { canonicalJson, sha256Hex } from "@/lib/integrity";
import { indicatorSheetBundle } from "./bowie-dick";

type Executor = Parameters<typeof getRecordBundleRows>[0]["tx"];

/**
 * What a signature binds to (21 CFR 11.70): the cycle's fields, the analysis that was shown
 * (its figures, hashed), and the hash of every stored file's bytes, recomputed from the bytes.
 */
function bundleOf({ cycle, analysis, files }: RecordBundleRows) {
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

export type RecordBundle = ReturnType<typeof bundleOf> & { indicatorSheet?: Awaited<ReturnType<typeof indicatorSheetBundle>> };

export async function buildRecordBundle({ cycleId, analysisId, tx }: { cycleId: string; analysisId: string; tx?: Executor }): Promise<RecordBundle | null> {
  const rows = await getRecordBundleRows({ cycleId, analysisId, tx });
  if (!rows) return null;
  // A Bowie-Dick cycle's verdict is its indicator sheet: the signature binds the reading and its photo (absent on other cycles, so their hashes stay as they were).
  const indicatorSheet = rows.cycle.testKind === "bowie-dick" ? await indicatorSheetBundle({ cycleId, tx }) : undefined;
  return indicatorSheet ? { ...bundleOf(rows), indicatorSheet } : bundleOf(rows);
}

export type SignedFields = Pick<Signature, "cycleId" | "analysisId" | "userId" | "printedName" | "role" | "meaning" | "reason" | "signedAt">;

export function signatureHash(bundle: RecordBundle, signed: SignedFields): string {
  return sha256Hex(canonicalJson({ record: bundle, signature: signed }));
}

/** Recomputes the bundle from what is stored now; a moved signature or a changed record fails. */
export async function signatureIsValid({ signature }: { signature: Signature }): Promise<boolean> {
  const bundle = await buildRecordBundle({ cycleId: signature.cycleId, analysisId: signature.analysisId });
  if (!bundle) return false;
  const { id: _id, bundleHash, ...signed } = signature;
  return signatureHash(bundle, signed) === bundleHash;
}

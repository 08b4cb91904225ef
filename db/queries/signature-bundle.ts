import "server-only";
import { asc, eq } from "drizzle-orm";
import { getDb, type Executor } from "@/db";
import { analyses, cycles, loggerFiles, type Signature } from "@/db/schema";
import { canonicalJson, sha256Hex } from "@/lib/integrity";

/**
 * What a signature binds to (21 CFR 11.70): the cycle's fields, the analysis that was shown
 * (its figures, hashed), and the hash of every stored file's bytes, recomputed from the bytes.
 */
export async function buildRecordBundle(tx: Executor, { cycleId, analysisId }: { cycleId: string; analysisId: string }) {
  const [cycle] = await tx.select().from(cycles).where(eq(cycles.id, cycleId)).limit(1);
  const [analysis] = await tx.select().from(analyses).where(eq(analyses.id, analysisId)).limit(1);
  if (!cycle || !analysis || analysis.cycleId !== cycleId) return null;
  const files = await tx
    .select({ name: loggerFiles.name, bytes: loggerFiles.bytes, sha256: loggerFiles.sha256 })
    .from(loggerFiles)
    .where(eq(loggerFiles.cycleId, cycleId))
    .orderBy(asc(loggerFiles.uploadedAt), asc(loggerFiles.id));
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

export type SignedFields = Pick<Signature, "cycleId" | "analysisId" | "userId" | "printedName" | "role" | "meaning" | "reason" | "signedAt">;

export function signatureHash(bundle: NonNullable<Awaited<ReturnType<typeof buildRecordBundle>>>, signed: SignedFields): string {
  return sha256Hex(canonicalJson({ record: bundle, signature: signed }));
}

/** Recomputes the bundle from what is stored now; a moved signature or a changed record fails. */
export async function signatureIsValid({ signature, tx }: { signature: Signature; tx?: Executor }): Promise<boolean> {
  const bundle = await buildRecordBundle(tx ?? getDb(), { cycleId: signature.cycleId, analysisId: signature.analysisId });
  if (!bundle) return false;
  const { id: _id, bundleHash, ...signed } = signature;
  return signatureHash(bundle, signed) === bundleHash;
}

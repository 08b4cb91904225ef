import type { CycleDetail } from "@/lib/cycles/contracts";
import { SIGNATURE_MEANING_LABELS } from "@/lib/domain";

/** The record's signatures with their manifestation (21 CFR 11.50) and whether each still verifies. */
export function SignatureList({ signatures }: { signatures: CycleDetail["signatures"] }) {
  if (signatures.length === 0) return <p className="text-ink-muted">No signature yet.</p>;
  return (
    <ol className="space-y-2" data-testid="signatures">
      {signatures.map((s) => (
        <li key={s.id} className="rounded-md border border-ink-line px-3 py-2">
          <p className="font-medium">
            {SIGNATURE_MEANING_LABELS[s.meaning]} — {s.printedName} <span className="font-normal text-ink-muted">({s.role})</span>
          </p>
          <p className="text-xs text-ink-muted">{new Date(s.signedAt).toISOString().replace("T", " ").slice(0, 19)} UTC</p>
          {s.reason && <p className="mt-1">Reason: {s.reason}</p>}
          <p className={`mt-1 text-xs ${s.valid ? "text-pass-700" : "text-fail-700"}`}>
            {s.valid ? "✓ Signature verifies against the record as stored" : `✕ Signature no longer matches the record: ${s.problem ?? "the record has changed."} Investigate.`}
          </p>
          <p className="mono mt-0.5 break-all text-ink-faint">{s.bundleHash}</p>
        </li>
      ))}
    </ol>
  );
}

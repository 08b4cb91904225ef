import { STUDY_SIGNATURE_MEANING_LABELS } from "@/lib/domain";
import { formatDateTime } from "@/lib/format";
import type { StudyDetail } from "@/lib/studies/contracts";

/** Every signature on the study in order, with its manifestation: printed name, role, meaning, time, reason. */
export function StudySignatures({ signatures, timeZone }: { signatures: StudyDetail["signatures"]; timeZone: string }) {
  if (signatures.length === 0) return <p className="text-sm text-ink-muted">Not signed yet.</p>;
  return (
    <ol className="space-y-2 text-sm" data-testid="study-signatures">
      {[...signatures]
        .sort((a, b) => a.signedAt.localeCompare(b.signedAt))
        .map((s) => (
          <li key={s.id} className="rounded-md border border-ink-line px-3 py-2">
            <p className="font-medium">
              {STUDY_SIGNATURE_MEANING_LABELS[s.meaning]} — {s.printedName} <span className="font-normal text-ink-muted">({s.role})</span>
            </p>
            <p className="text-xs text-ink-muted">
              {formatDateTime(s.signedAt, timeZone)} · {s.signedAt.slice(0, 19).replace("T", " ")} UTC
            </p>
            {s.reason && <p className="mt-1">Reason: {s.reason}</p>}
          </li>
        ))}
    </ol>
  );
}

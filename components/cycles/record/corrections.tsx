import Link from "next/link";
import type { CycleDetail } from "@/lib/cycles/contracts";
import { EmptyState } from "@/components/ui/panel";
import { Badge, VerdictBadge } from "@/components/ui/badge";
import { formatDateTime } from "@/lib/format";
import { TableFrame } from "@/components/ui/table-frame";

/** Every analysis of the cycle, newest first: when, who, why, the verdict, and beneath it the file read (name and SHA-256). */
export function AnalysisHistory({ history, currentId, timeZone }: { history: CycleDetail["analysisHistory"]; currentId: string | null; timeZone: string }) {
  if (history.length === 0) return <EmptyState title="Not analysed yet" />;
  return (
    <TableFrame label="Analysis history">
      <table className="data-table" data-testid="analysis-history">
        <thead>
          <tr>
            <th scope="col">When</th>
            <th scope="col">By</th>
            <th scope="col">Reason</th>
            <th scope="col">Verdict</th>
          </tr>
        </thead>
        {history.map((h, index) => (
          <tbody key={h.id}>
            <tr>
              <td className="whitespace-nowrap">
                {formatDateTime(h.createdAt, timeZone)}
                {h.id === currentId && (
                  <span className="ml-2">
                    <Badge tone="steam">current</Badge>
                  </span>
                )}
              </td>
              <td>{h.createdByName ?? "—"}</td>
              <td>{h.reason ?? (index === history.length - 1 ? <span className="text-ink-muted">first analysis</span> : "—")}</td>
              <td>
                <VerdictBadge verdict={h.verdict} />
              </td>
            </tr>
            <tr>
              <td colSpan={4} className="text-xs text-ink-muted">
                File <span className="break-all text-ink-soft">{h.fileName}</span>, SHA-256 <span className="mono break-all">{h.fileSha256}</span> · engine{" "}
                <span className="mono">{h.engineVersion}</span>, input <span className="mono break-all">{h.inputHash}</span>
              </td>
            </tr>
          </tbody>
        ))}
      </table>
    </TableFrame>
  );
}

/** What a reviewer must see before signing: a logger file replaced after the first analysis, and files shared with other cycles. */
export function CorrectionNotices({ detail }: { detail: CycleDetail }) {
  const replacement = detail.fileReplacement;
  if (!replacement && detail.sharedFiles.length === 0) return null;
  return (
    <div className="space-y-3" data-testid="correction-notices">
      {replacement && (
        <section role="note" className="rounded-panel border border-caution-500/40 bg-caution-50 px-4 py-3 text-sm" data-testid="file-replaced">
          <h2 className="text-sm font-semibold text-caution-700">Logger file replaced after the first analysis</h2>
          <p className="mt-1 text-ink-soft">
            First file <span className="font-medium break-all">{replacement.first.fileName}</span>, SHA-256 <span className="mono text-xs break-all">{replacement.first.sha256}</span>; now{" "}
            <span className="font-medium break-all">{replacement.current.fileName}</span>, SHA-256 <span className="mono text-xs break-all">{replacement.current.sha256}</span>.
          </p>
          {replacement.differences.length > 0 ? (
            <ul className="mt-1 list-disc pl-5 text-ink-soft">
              {replacement.differences.map((d) => (
                <li key={d}>{d}</li>
              ))}
            </ul>
          ) : (
            <p className="mt-1 text-ink-muted">The new recording starts at the same time with the same channels.</p>
          )}
        </section>
      )}
      {detail.sharedFiles.length > 0 && (
        <section role="note" className="rounded-panel border border-caution-500/40 bg-caution-50 px-4 py-3 text-sm" data-testid="shared-files">
          <h2 className="text-sm font-semibold text-caution-700">A file of this cycle belongs to another cycle too</h2>
          <ul className="mt-1 space-y-1 text-ink-soft">
            {detail.sharedFiles.map((f) => (
              <li key={`${f.sha256}-${f.cycleId}`}>
                <span className="break-all">{f.fileName}</span> is the same file as cycle{" "}
                <Link href={`/cycles/${f.cycleId}`} className="mono text-steam-700 underline">
                  {f.cycleNumber}
                </Link>
                : {f.reason ?? "no reason recorded"}
              </li>
            ))}
          </ul>
        </section>
      )}
    </div>
  );
}

/** The instrument that measured the cycle and the calibration certificate in force on the cycle's date. */
export function InstrumentEvidence({ instrument }: { instrument: CycleDetail["instrument"] }) {
  if (!instrument) return <p className="text-sm text-caution-700">No instrument named: a thermometric or air leakage test cannot be approved without it.</p>;
  const c = instrument.calibration;
  return (
    <dl className="grid grid-cols-[auto_minmax(0,1fr)] gap-x-3 gap-y-1 text-sm" data-testid="instrument-evidence">
      <dt className="text-ink-muted">Instrument</dt>
      <dd>{instrument.name}</dd>
      <dt className="text-ink-muted">Serial</dt>
      <dd className="mono">{instrument.serialNumber}</dd>
      <dt className="text-ink-muted">Certificate</dt>
      <dd className={c ? "mono" : "text-caution-700"}>{c ? c.certificateNumber : "none dated on or before the cycle's date"}</dd>
      {c && (
        <>
          <dt className="text-ink-muted">Calibration due</dt>
          <dd className={c.lapsed ? "font-medium text-fail-700" : ""}>
            {c.dueOn}
            {c.lapsed ? ` — lapsed on the cycle's date (${c.testDate})` : ""}
          </dd>
        </>
      )}
    </dl>
  );
}

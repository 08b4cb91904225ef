import { formatNumber } from "@/lib/format";
import { formatDuration, loadTypeLabel, sensorPositionLabel, STUDY_KIND_LABELS } from "@/lib/domain";
import { TableFrame } from "@/components/ui/table-frame";
import type { StudyDetail } from "@/lib/studies/contracts";

/** The protocol text and the acceptance criteria, each figure with where it comes from. */
export function ProtocolView({ detail }: { detail: StudyDetail }) {
  const c = detail.criteria;
  const p = detail.profile;
  const rows: Array<[string, string]> = [
    ["Kind", STUDY_KIND_LABELS[detail.kind]],
    ["Profile", `${p.name}: ${formatNumber(p.sterilizationTempC, 1)} °C, hold ${formatDuration(p.holdingTimeS)}`],
    ["Consecutive passing runs", String(c.runsRequired)],
    ["Minimum F0 at every load position", `${formatNumber(c.minF0Min, 1)} min (${c.minF0Source === "study" ? "set by this study" : "the profile's hold at its sterilization temperature"})`],
    ["Largest spread between positions", `${formatNumber(c.maxSpreadK, 2)} K (${c.maxSpreadSource === "study" ? "set by this study" : "the profile's"})`],
    ["Indicators", c.indicatorsRequired ? "A biological indicator at every position, read negative" : "Optional; any recorded positive indicator fails the run"],
    ["F0 reference", `Tref ${formatNumber(p.f0ReferenceC, 1)} °C, z ${formatNumber(p.f0ZK, 1)} K`],
    ["Requalification", `every ${detail.requalificationMonths} months after approval`],
  ];
  return (
    <div className="space-y-3">
      <dl className="grid grid-cols-1 gap-x-3 gap-y-1 text-sm sm:grid-cols-[16rem_minmax(0,1fr)]" data-testid="study-criteria">
        {rows.map(([k, v]) => (
          <div key={k} className="contents">
            <dt className="text-ink-muted">{k}</dt>
            <dd>{v}</dd>
          </div>
        ))}
      </dl>
      <div>
        <h3 className="text-sm font-semibold">Protocol</h3>
        {detail.protocol.trim() ? <p className="mt-1 whitespace-pre-wrap text-sm text-ink-soft">{detail.protocol}</p> : <p className="mt-1 text-sm text-ink-muted">No protocol text written yet.</p>}
      </div>
    </div>
  );
}

/** The loading pattern: what it holds, where the probes go, its photo and its requalification date. */
export function PatternView({ detail }: { detail: StudyDetail }) {
  const lp = detail.loadingPattern;
  return (
    <div className="space-y-3 text-sm">
      <p>
        <strong>{lp.name}</strong> · {loadTypeLabel(lp.loadType)}
        {lp.requalificationDueOn && <span className="text-ink-muted"> · requalification due {lp.requalificationDueOn}</span>}
        {lp.requiredBeforeUse && <span className="text-caution-700"> · required before use</span>}
      </p>
      {lp.description && <p className="whitespace-pre-wrap text-ink-soft">{lp.description}</p>}
      {lp.photoAttachmentId && (
        <p>
          <a href={`/api/attachments/${lp.photoAttachmentId}`} className="text-steam-700 underline underline-offset-2">
            Photo or sketch of the pattern
          </a>
        </p>
      )}
      {lp.items.length > 0 && (
        <div>
          <h3 className="font-semibold">Items</h3>
          <ul className="mt-1 list-disc pl-5 text-ink-soft">
            {lp.items.map((item, i) => (
              <li key={i}>
                {item.quantity} × {item.name}
                {item.note && <span className="text-ink-muted"> ({item.note})</span>}
              </li>
            ))}
          </ul>
        </div>
      )}
      <TableFrame label="Probe positions of the pattern">
        <table className="data-table" data-testid="pattern-positions">
          <thead>
            <tr>
              <th>Id</th>
              <th>Label</th>
              <th>Chamber position</th>
              <th>Note</th>
            </tr>
          </thead>
          <tbody>
            {lp.positions.map((pos) => (
              <tr key={pos.id}>
                <td className="mono font-medium">{pos.id}</td>
                <td>{pos.label}</td>
                <td>{pos.sensorPosition ? sensorPositionLabel(pos.sensorPosition) : "—"}</td>
                <td className="text-ink-soft">{pos.note ?? ""}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </TableFrame>
    </div>
  );
}

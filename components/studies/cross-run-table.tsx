import { TableFrame } from "@/components/ui/table-frame";
import { EmptyState } from "@/components/ui/panel";
import { formatNumber } from "@/lib/format";
import { formatDuration, plural } from "@/lib/domain";
import type { StudyDetail } from "@/lib/studies/contracts";

/** Per load position over every run: the lowest F0, the temperature range during holding, the slowest arrival at Ts; the cold spot marked. */
export function CrossRunTable({ detail }: { detail: StudyDetail }) {
  const { positions, coldSpot, spreadK } = detail.summary;
  if (detail.runs.length === 0) return <EmptyState title="Nothing to compare yet.">The figures across runs appear once a run is attached.</EmptyState>;
  const minF0 = detail.criteria.minF0Min;
  return (
    <div className="space-y-3">
      {coldSpot ? (
        <p className="rounded-md border border-steam-500/30 bg-steam-50 px-3 py-2 text-sm" data-testid="cold-spot">
          <strong>Cold spot: {coldSpot.position}</strong> ({coldSpot.label}), lowest F0 {formatNumber(coldSpot.minF0, 1)} min; the cold spot in {coldSpot.runsAsColdSpot} of{" "}
          {plural(coldSpot.runsCounted, "run")}.
        </p>
      ) : (
        <p className="text-sm text-ink-muted">No cold spot: no run has F0 figures for the pattern&apos;s positions.</p>
      )}
      <TableFrame label="Figures across runs by position">
        <table className="data-table" data-testid="cross-run-table">
          <thead>
            <tr>
              <th>Position</th>
              <th>Lowest F0</th>
              <th>Lowest temperature</th>
              <th>Highest temperature</th>
              <th>Slowest equilibration</th>
              <th>Cold spot in runs</th>
            </tr>
          </thead>
          <tbody>
            {positions.map((p) => {
              const isCold = coldSpot?.position === p.position;
              const below = p.minF0 !== null && p.minF0 < minF0;
              return (
                <tr key={p.position} className={isCold ? "bg-steam-50" : ""}>
                  <td className="font-medium">
                    {p.position}
                    {isCold && <span className="ml-1 text-xs font-semibold text-steam-700">(cold spot)</span>}
                    <span className="block text-xs font-normal text-ink-muted">{p.label}</span>
                  </td>
                  <td className={`whitespace-nowrap text-sm ${below ? "font-semibold text-fail-700" : ""}`}>
                    {p.minF0 === null ? "—" : `${formatNumber(p.minF0, 1)} min`}
                    {below && " ✕ below the minimum"}
                  </td>
                  <td className="whitespace-nowrap text-sm">{p.minTemp === null ? "—" : `${formatNumber(p.minTemp, 2)} °C`}</td>
                  <td className="whitespace-nowrap text-sm">{p.maxTemp === null ? "—" : `${formatNumber(p.maxTemp, 2)} °C`}</td>
                  <td className="whitespace-nowrap text-sm">{p.maxEquilibrationS === null ? "Not reached in every run" : formatDuration(p.maxEquilibrationS)}</td>
                  <td className="text-sm">{p.coldSpotRuns.length ? p.coldSpotRuns.map((n) => `run ${n}`).join(", ") : "—"}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </TableFrame>
      <p className="text-xs text-ink-muted">
        F0 at Tref {formatNumber(detail.profile.f0ReferenceC, 1)} °C, z {formatNumber(detail.profile.f0ZK, 1)} K; minimum required {formatNumber(minF0, 1)} min at every position. Largest spread over
        the runs: {spreadK === null ? "—" : `${formatNumber(spreadK, 2)} K`} (an upper bound of the spread at one instant during holding: the highest maximum minus the lowest minimum, or the
        cycle&apos;s own spread at its worst instant when that is smaller and covered every mapped probe).
      </p>
    </div>
  );
}

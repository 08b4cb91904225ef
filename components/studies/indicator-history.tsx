import { formatDateTime } from "@/lib/format";
import { INDICATOR_KIND_LABELS, INDICATOR_RESULT_LABELS, isPositiveIndicator, type PatternPosition } from "@/lib/domain";
import { formatPopulation, indicatorCellKey, type IndicatorCell } from "@/lib/domain/study-evidence";
import type { StudyIndicatorView } from "@/lib/studies/contracts";

type Run = { id: string; runNumber: number };

/** Every reading, newest first per run and position, with what it replaced and why: a correction never hides the earlier result. */
export function IndicatorHistory({ runs, positions, cells, timeZone }: { runs: Run[]; positions: PatternPosition[]; cells: Map<string, IndicatorCell<StudyIndicatorView>>; timeZone: string }) {
  const groups = runs.flatMap((run) => positions.flatMap((p) => ({ run, position: p, cell: cells.get(indicatorCellKey(run.id, p.id)) }))).filter((g) => g.cell);
  const total = groups.reduce((n, g) => n + g.cell!.history.length, 0);
  const corrections = groups.reduce((n, g) => n + g.cell!.history.filter((r) => !r.current).length, 0);
  if (total === 0) return null;
  return (
    <details data-testid="indicator-history">
      <summary className="cursor-pointer text-sm text-steam-700">
        Every reading with lot, population and incubation ({total}; {corrections === 1 ? "1 corrected" : `${corrections} corrected`})
      </summary>
      <div className="mt-2 space-y-3">
        {groups.map(({ run, position, cell }) => (
          <div key={`${run.id}-${position.id}`}>
            <h3 className="text-sm font-semibold">
              Run {run.runNumber} · <span className="mono">{position.id}</span> {position.label}
            </h3>
            <ul className="mt-1 space-y-1 text-sm">
              {cell!.history.map((r) => (
                <li key={r.id} className={r.current ? "" : "text-ink-muted"}>
                  <span className="font-medium">{r.current ? "Counts" : "Replaced"}</span> · {INDICATOR_KIND_LABELS[r.kind]}:{" "}
                  <span className={isPositiveIndicator(r.result) ? "font-semibold text-fail-700" : ""}>
                    {isPositiveIndicator(r.result) ? "✕ " : ""}
                    {INDICATOR_RESULT_LABELS[r.result]}
                  </span>
                  {r.kind === "biological" && (
                    <>
                      {" "}
                      · {r.organism ?? "organism not named"}, {formatPopulation(r.population)} per carrier, incubated {r.incubation ?? "—"}
                    </>
                  )}{" "}
                  · lot {r.lot} · read by {r.readBy}, {formatDateTime(r.readAt, timeZone)} · recorded by {r.recordedBy.name}, {formatDateTime(r.recordedAt, timeZone)}
                  {r.reason && <span className="block text-xs">Reason for the correction: {r.reason}</span>}
                </li>
              ))}
            </ul>
          </div>
        ))}
      </div>
    </details>
  );
}

import { TableFrame } from "@/components/ui/table-frame";
import { INDICATOR_RESULT_LABELS, isPositiveIndicator, type PatternPosition } from "@/lib/domain";
import { indicatorCellKey, type IndicatorCell } from "@/lib/domain/study-evidence";
import type { StudyIndicatorView } from "@/lib/studies/contracts";

type Run = { id: string; runNumber: number; cycleNumber: string };

/** One reading in a cell: a positive one in capitals with ✕ and a frame, so it never rests on colour alone. */
function Reading({ label, reading }: { label: string; reading: StudyIndicatorView | undefined }) {
  if (!reading) return null;
  const positive = isPositiveIndicator(reading.result);
  return (
    <span className={`block rounded px-1.5 py-0.5 text-xs ${positive ? "border-2 border-fail-700 bg-fail-50 font-semibold text-fail-700" : "text-pass-700"}`} data-positive={positive || undefined}>
      {positive ? "✕ POSITIVE — " : "✓ "}
      {label}: {INDICATOR_RESULT_LABELS[reading.result]}
    </span>
  );
}

/** Runs down, positions across: the biological (BI) and chemical (CI) reading that counts in each cell. */
export function IndicatorGrid({
  runs,
  positions,
  cells,
  indicatorsRequired,
}: {
  runs: Run[];
  positions: PatternPosition[];
  cells: Map<string, IndicatorCell<StudyIndicatorView>>;
  indicatorsRequired: boolean;
}) {
  return (
    <TableFrame label="Indicator readings by run and position">
      <table className="data-table" data-testid="indicator-grid">
        <caption className="sr-only">Current indicator reading per run and load position; BI biological, CI chemical</caption>
        <thead>
          <tr>
            <th scope="col">Run</th>
            {positions.map((p) => (
              <th scope="col" key={p.id}>
                <span className="mono">{p.id}</span>
                <span className="block text-xs font-normal text-ink-muted">{p.label}</span>
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {runs.map((run) => (
            <tr key={run.id}>
              <th scope="row" className="whitespace-nowrap">
                Run {run.runNumber}
                <span className="mono block text-xs font-normal text-ink-muted">{run.cycleNumber}</span>
              </th>
              {positions.map((p) => {
                const cell = cells.get(indicatorCellKey(run.id, p.id));
                const biological = cell?.current.biological;
                const chemical = cell?.current.chemical;
                const corrected = cell ? cell.history.length - Object.keys(cell.current).length : 0;
                return (
                  <td key={p.id} className="min-w-36 align-top" data-position={p.id} data-run={run.runNumber}>
                    <Reading label="BI" reading={biological} />
                    <Reading label="CI" reading={chemical} />
                    {!biological && (
                      <span className={`block text-xs ${indicatorsRequired ? "text-caution-700" : "text-ink-faint"}`}>{indicatorsRequired ? "▲ BI not read yet" : "No BI recorded"}</span>
                    )}
                    {corrected > 0 && <span className="block text-xs text-ink-muted">corrected ({corrected} earlier)</span>}
                  </td>
                );
              })}
            </tr>
          ))}
        </tbody>
      </table>
    </TableFrame>
  );
}

import type { AnalysisResult } from "@/lib/analysis/types";
import { clockTimeAt, elapsedFormatter } from "@/lib/cycles/chart-model";
import { gapLines, recordInputRows } from "@/lib/cycles/record-input";
import { TableFrame } from "@/components/ui/table-frame";

/** What the record brings and how it was read: sampling, gaps with their times, missing readings, pressure reference, atmosphere. */
export function RecordInput({ analysis, startedAt, timeZone }: { analysis: AnalysisResult; startedAt: string | null; timeZone: string }) {
  const elapsed = elapsedFormatter(analysis.record.durationS);
  const at = (s: number) => {
    const clock = clockTimeAt(startedAt, s, timeZone);
    return clock ? `${elapsed(s)} · ${clock}` : elapsed(s);
  };
  const gaps = gapLines(analysis.input?.gaps ?? [], at);
  const warnings = analysis.input?.warnings ?? [];
  return (
    <div data-testid="record-input">
      <dl className="grid grid-cols-[minmax(0,12rem)_minmax(0,1fr)] gap-x-3 gap-y-1.5 text-sm">
        {recordInputRows(analysis).map((row) => (
          <div key={row.label} className="contents">
            <dt className="text-ink-muted">{row.label}</dt>
            <dd className={row.caution ? "font-medium text-caution-700" : ""} data-caution={row.caution ? "true" : undefined}>
              {row.caution ? "▲ " : ""}
              {row.value}
            </dd>
          </div>
        ))}
      </dl>
      {gaps.length > 0 && (
        <TableFrame label="Gaps in the plateau" className="mt-3">
          <table className="data-table" data-testid="gap-table">
            <caption className="sr-only">Gaps inside the plateau period</caption>
            <thead>
              <tr>
                <th scope="col">Gap from</th>
                <th scope="col">to</th>
                <th scope="col" className="text-right">
                  Length
                </th>
                <th scope="col">What is missing</th>
              </tr>
            </thead>
            <tbody>
              {gaps.map((g) => (
                <tr key={`${g.from}-${g.what}`} className="bg-fail-50/60">
                  <td className="whitespace-nowrap tabular-nums">{g.from}</td>
                  <td className="whitespace-nowrap tabular-nums">{g.to}</td>
                  <td className="text-right tabular-nums">{g.duration}</td>
                  <td>{g.what}</td>
                </tr>
              ))}
            </tbody>
          </table>
          {startedAt && <p className="mt-1 text-2xs text-ink-faint">Elapsed time since the first sample · clock time at the site ({timeZone}).</p>}
        </TableFrame>
      )}
      {warnings.length > 0 && (
        <ul className="mt-3 list-disc space-y-1 pl-5 text-sm text-caution-700" data-testid="record-warnings">
          {warnings.map((w) => (
            <li key={w}>{w}</li>
          ))}
        </ul>
      )}
    </div>
  );
}

import type { AirLeakageResult } from "@/lib/cycles/contracts";
import { clockTimeAt, elapsedFormatter } from "@/lib/cycles/chart-model";
import { formatDuration, formatLeakRate, formatPressure, plural, agree } from "@/lib/domain";
import { ChecksTableFrame } from "@/components/cycles/record/record-tables";
import { TableFrame } from "@/components/ui/table-frame";

const SOURCE_WORDS = { detected: "found in the trace", marked: "marked by the user", timed: "by the standard's timing" } as const;

/** The air leakage verdict in plain words: summary, why it failed, what needs a look, how the times were found. */
export function AirLeakageFindings({ analysis: a }: { analysis: AirLeakageResult }) {
  const passed = a.verdict === "pass";
  const failed = a.checks.filter((c) => !c.passed);
  return (
    <div className="space-y-4" data-testid="findings">
      <div className={`rounded-md border px-4 py-3 ${passed ? "border-pass-500/30 bg-pass-50" : "border-fail-500/30 bg-fail-50"}`}>
        <p className={`text-sm font-semibold ${passed ? "text-pass-700" : "text-fail-700"}`} data-testid="verdict">
          {passed
            ? `✓ Pass — all ${plural(a.checks.length, "check")} of the air leakage test met their limits`
            : `✕ Fail — ${failed.length} of ${plural(a.checks.length, "check")} of the air leakage test did not meet ${agree(failed.length, "its limit", "their limits")}`}
        </p>
        <p className="mt-1 text-sm text-ink">{a.summary}</p>
      </div>
      {a.diagnoses.length > 0 && (
        <div>
          <h3 className="text-sm font-semibold">Why it failed</h3>
          <ul className="mt-1 space-y-1.5 text-sm">
            {a.diagnoses.map((d) => (
              <li key={d.checkId} className="flex gap-2">
                <span aria-hidden="true" className="text-fail-700">
                  ✕
                </span>
                <span>
                  <span className="font-medium">{a.checks.find((c) => c.id === d.checkId)?.label ?? d.checkId}:</span> {d.text}
                </span>
              </li>
            ))}
          </ul>
        </div>
      )}
      {a.warnings.length > 0 && (
        <div className="rounded-md border border-caution-500/30 bg-caution-50 px-4 py-3 text-sm text-caution-700" data-testid="leak-warnings">
          <p className="font-semibold">Needs a look</p>
          {a.warnings.map((w) => (
            <p key={w} className="mt-1">
              ▲ {w}
            </p>
          ))}
        </div>
      )}
      <p className="text-sm text-ink-soft">{a.findings.join(" ")}</p>
    </div>
  );
}

type TableProps = { analysis: AirLeakageResult; startedAt: string | null; timeZone: string };

/** p1, p2, p3 with their times, the leak rate against its limit, the vacuum reached, and the verdict. */
export function AirLeakageTable({ analysis: a, startedAt, timeZone }: TableProps) {
  const at = elapsedFormatter(a.record.durationS);
  const when = (s: number) => {
    const clock = clockTimeAt(startedAt, s, timeZone);
    return clock ? `${at(s)} · ${clock}` : at(s);
  };
  const rows: Array<{ point: string; time: number; pressure: number | null; source: keyof typeof SOURCE_WORDS; note: string }> = [
    { point: "t1 / p1", time: a.t1, pressure: a.p1, source: a.timeSources.t1, note: "valves closed, pump stopped" },
    { point: "t2 / p2", time: a.t2, pressure: a.p2, source: a.timeSources.t2, note: "after the 5 min wait" },
    { point: "t3 / p3", time: a.t3, pressure: a.p3, source: a.timeSources.t3, note: "10 min later" },
  ];
  return (
    <div className="space-y-4">
      <TableFrame label="Air leakage readings">
        <table className="data-table" data-testid="leak-table">
          <caption className="sr-only">The air leakage test&apos;s three readings</caption>
          <thead>
            <tr>
              <th scope="col">Point</th>
              <th scope="col">Time (since first sample · site clock)</th>
              <th scope="col">Chamber pressure</th>
              <th scope="col">How the time was found</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.point}>
                <th scope="row" className="whitespace-nowrap">
                  {r.point} <span className="font-normal text-ink-muted">({r.note})</span>
                </th>
                <td className="mono">{when(r.time)}</td>
                <td className="mono">{r.pressure === null ? "not in the record" : formatPressure(r.pressure, { digits: 2, reference: "abs" })}</td>
                <td>{SOURCE_WORDS[r.source]}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </TableFrame>
      <ChecksTableFrame caption="Checks of the air leakage test">
        {a.checks.map((c) => (
          <tr key={c.id}>
            <th scope="row">{c.label}</th>
            <td className="mono">{measuredText(c.unit, c.measured)}</td>
            <td className="mono">{`${c.comparison === "at-most" ? "≤" : "≥"} ${measuredText(c.unit, c.limit)}`}</td>
            <td className="text-xs text-ink-soft">{c.basis}</td>
            <td className={c.passed ? "font-semibold text-pass-700" : "font-semibold text-fail-700"}>{c.passed ? "Pass" : "Fail"}</td>
          </tr>
        ))}
      </ChecksTableFrame>
    </div>
  );
}

function measuredText(unit: AirLeakageResult["checks"][number]["unit"], value: number | null): string {
  if (value === null) return "not measured";
  if (unit === "kPa/min") return formatLeakRate(value);
  if (unit === "kPa") return formatPressure(value, { digits: 2, reference: "abs" });
  return formatDuration(value);
}

/** The sidebar's figures: leak rate, rise during the wait, vacuum reached, and the limits the test was judged by. */
export function AirLeakageFigures({ analysis: a }: { analysis: AirLeakageResult }) {
  const rows: Array<[string, string]> = [
    ["Leak rate", formatLeakRate(a.leakRate)],
    ["Limit", `≤ ${formatLeakRate(a.limits.maxLeakRateKpaPerMin)}`],
    ["Rise during the wait (p2 − p1)", a.stabilisationRise === null ? "—" : formatPressure(a.stabilisationRise, { digits: 2 })],
    ["Deepest vacuum", formatPressure(a.vacuum.lowestKpaAbs, { digits: 2, reference: "abs" })],
    ["Vacuum set point", `≤ ${formatPressure(a.limits.vacuumSetPointKpaAbs, { digits: 2, reference: "abs" })}`],
    ["Samples", `${a.record.samples.toLocaleString("en-GB")} every ${a.record.medianSampleIntervalS} s (median)`],
    ["Pressure column", a.pressureChannel],
  ];
  return (
    <dl className="grid grid-cols-[auto_minmax(0,1fr)] gap-x-3 gap-y-1.5 text-sm" data-testid="leak-figures">
      {rows.map(([label, value]) => (
        <div key={label} className="contents">
          <dt className="text-ink-muted">{label}</dt>
          <dd className="mono text-right">{value}</dd>
        </div>
      ))}
    </dl>
  );
}

import type { CycleDetail } from "@/lib/cycles/contracts";
import { thermometricOf } from "@/lib/analysis/types";
import { EmptyState } from "@/components/ui/panel";
import { elapsedFormatter } from "@/lib/cycles/chart-model";
import { formatNumber } from "@/lib/format";
import { formatDuration, plural, agree } from "@/lib/domain";

/** The plain-language verdict: summary, each failed check's diagnosis, each saturation flag. */
export function Findings({ detail }: { detail: CycleDetail }) {
  const a = thermometricOf(detail.analysis);
  if (!a) {
    return (
      <EmptyState title="No analysis yet">
        No logger file on this record has been analysed, so there is no verdict, chart, phase diagram or channel table yet. Add the cycle&apos;s logger file to analyse it.
      </EmptyState>
    );
  }
  const failed = a.checks.filter((c) => !c.passed);
  const ts = a.limits.sterilizationTempC;
  const at = elapsedFormatter(a.record.durationS);
  // a flag's diagnosis already given under "Why it failed" is not repeated
  const said = new Set(a.diagnoses.map((d) => d.text.trim()));
  return (
    <div className="space-y-4" data-testid="findings">
      <div className={`rounded-md border px-4 py-3 ${a.verdict === "pass" ? "border-pass-500/30 bg-pass-50" : "border-fail-500/30 bg-fail-50"}`}>
        <p className={`text-sm font-semibold ${a.verdict === "pass" ? "text-pass-700" : "text-fail-700"}`} data-testid="verdict">
          {a.verdict === "pass"
            ? `✓ Pass — ${a.checks.length === 1 ? "the 1 check met its limit" : `all ${plural(a.checks.length, "check")} met their limits`}`
            : `✕ Fail — ${failed.length} of ${plural(a.checks.length, "check")} did not meet ${agree(failed.length, "its limit", "their limits")}`}
        </p>
        <p className="mt-1 text-sm text-ink">{a.summary}</p>
      </div>

      {!a.plateau && (
        <div className="rounded-md border border-caution-500/30 bg-caution-50 px-4 py-3 text-sm text-caution-700" data-testid="no-plateau">
          <p className="font-semibold">No plateau found</p>
          <p className="mt-1">
            The reference channel ({a.referenceChannel}) never reached the sterilization temperature of {ts} °C, so there was no plateau to time or to compare with saturated steam. Equilibration,
            holding, band, spread and saturation could not be measured.
          </p>
        </div>
      )}

      {a.plateausFound > 1 && a.plateauIndex !== null && (
        <div className="rounded-md border border-steam-500/30 bg-steam-50 px-4 py-3 text-sm text-steam-700" data-testid="several-plateaus">
          <p className="font-semibold">{a.plateausFound} plateaus in this record</p>
          <p className="mt-1">
            The reference channel reached {ts} °C {a.plateausFound} separate times. The {a.plateauIndex === 0 ? "first" : ordinal(a.plateauIndex + 1)} plateau
            {a.plateau ? ` (from ${at(a.plateau.start)} to ${at(a.plateau.end)})` : ""} was analysed; the others are shown on the chart but not judged. If the record holds more than one cycle, split
            the file and register each cycle on its own.
          </p>
        </div>
      )}

      {a.diagnoses.length > 0 && (
        <div>
          <h3 className="text-sm font-semibold">Why it failed</h3>
          <ul className="mt-1 space-y-1.5 text-sm">
            {a.diagnoses.map((d, i) => (
              <li key={`${d.checkId}-${i}`} className="flex gap-2">
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

      {a.saturation.flags.length > 0 && (
        <div>
          <h3 className="text-sm font-semibold">Saturation flags ({a.saturation.flags.length})</h3>
          <ul className="mt-1 space-y-2 text-sm" data-testid="flag-list">
            {a.saturation.flags.map((f, i) => (
              <li key={i} className={`rounded-md border-l-4 px-3 py-2 ${f.kind === "below" ? "border-steam-600 bg-steam-50" : "border-caution-500 bg-caution-50"}`}>
                <p className="font-medium">
                  {f.kind === "below" ? "Colder than saturated steam: air or non-condensable gas" : "Hotter than saturated steam: superheat"}
                  <span className="font-normal text-ink-muted">
                    {" "}
                    · {at(f.start)}–{at(f.end)} ({formatDuration(f.durationS)}) · worst {f.worst > 0 ? "+" : "−"}
                    {formatNumber(Math.abs(f.worst), 2)} K
                  </span>
                </p>
                {!said.has(f.diagnosis.trim()) && <p className="mt-0.5 text-ink-soft">{f.diagnosis}</p>}
              </li>
            ))}
          </ul>
        </div>
      )}
    </div>
  );
}

function ordinal(n: number): string {
  const words = ["first", "second", "third", "fourth", "fifth", "sixth", "seventh", "eighth", "ninth", "tenth"];
  return words[n - 1] ?? `${n}th`;
}

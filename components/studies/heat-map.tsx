"use client";

import { useState, type CSSProperties } from "react";
import { DEFAULT_LIMITS } from "@/lib/analysis/types";
import { heatMapGrid, type HeatMapMetric } from "@/lib/analysis/study-heat-map";
import type { StudyCriteria, StudySummary } from "@/lib/analysis/study-types";
import { HEAT_HATCH, HEAT_MARKER_SYMBOLS, NO_READING_BAND, f0Band, f0Bands, hatchStroke, heatValueText, temperatureBand, temperatureBands, type HeatBand } from "@/lib/charts/heat-map";
import { TableFrame } from "@/components/ui/table-frame";

const METRICS: Array<{ id: HeatMapMetric; label: string; caption: string }> = [
  { id: "f0", label: "F0", caption: "F0 at each position in each run, minutes" },
  { id: "minTemp", label: "Minimum temperature", caption: "Lowest temperature during holding at each position in each run, °C" },
];
const COLD_SPOT_SYMBOL = "◆";
const JUDGEMENT_WORDS = { pass: "passed", fail: "failed", pending: "pending" } as const;

function cellStyle(band: HeatBand): CSSProperties {
  const style: CSSProperties = { backgroundColor: band.fill, color: band.text };
  if (band.marker) {
    const stripe = hatchStroke(band) === "#000000" ? `rgba(0, 0, 0, ${HEAT_HATCH.opacity})` : `rgba(255, 255, 255, ${HEAT_HATCH.opacity})`;
    const half = HEAT_HATCH.spacingPx / 2;
    style.backgroundImage = `repeating-linear-gradient(${HEAT_HATCH.angleDeg}deg, ${stripe} 0 ${half}px, transparent ${half}px ${HEAT_HATCH.spacingPx}px)`;
  }
  return style;
}

function Swatch({ band }: { band: HeatBand }) {
  return (
    <span aria-hidden="true" className="inline-flex h-5 w-7 shrink-0 items-center justify-center rounded-sm border border-ink-line text-xs" style={cellStyle(band)}>
      {band.marker ? HEAT_MARKER_SYMBOLS[band.marker] : ""}
    </span>
  );
}

/**
 * Positions × runs of a qualification study, coloured by F0 or by the minimum temperature during holding. The grid is a
 * real table: every value is printed, the markers have words for a screen reader, so the colours only add emphasis.
 */
export function StudyHeatMap({
  summary,
  criteria,
  bandK = DEFAULT_LIMITS.bandK,
  initialMetric = "f0",
}: {
  summary: StudySummary;
  criteria: StudyCriteria;
  /** the band above Ts, K, for the temperature scale (EN 285: 3 K) */
  bandK?: number;
  initialMetric?: HeatMapMetric;
}) {
  const [metric, setMetric] = useState<HeatMapMetric>(initialMetric);
  const grid = heatMapGrid(summary, metric);
  const scale = { sterilizationTempC: criteria.sterilizationTempC, bandK };
  const bandOf = (value: number | null) => (metric === "f0" ? f0Band(value, criteria.minF0Min) : temperatureBand(value, scale));
  const legend = [...(metric === "f0" ? f0Bands(criteria.minF0Min) : temperatureBands(scale)), NO_READING_BAND];
  const { caption } = METRICS.find((m) => m.id === metric)!;
  const cold = summary.coldSpot;

  if (grid.runs.length === 0) return <p className="text-sm text-ink-muted">No runs are attached yet: the heat map fills in as runs are attached.</p>;

  return (
    <figure className="m-0 space-y-3" data-testid="study-heat-map">
      <div className="flex flex-wrap items-center gap-2 text-sm" role="group" aria-label="Heat map figure">
        {METRICS.map((m) => (
          <button key={m.id} type="button" aria-pressed={metric === m.id} onClick={() => setMetric(m.id)} className={metric === m.id ? "btn-primary px-2.5 py-1" : "btn-secondary px-2.5 py-1"}>
            {m.label}
          </button>
        ))}
      </div>
      {cold && (
        <p className="text-sm">
          Cold spot over all runs: <strong>{cold.position}</strong> ({cold.label}), lowest F0 {heatValueText(cold.minF0, "f0")} min; the cold spot in {cold.runsAsColdSpot} of {cold.runsCounted}{" "}
          {cold.runsCounted === 1 ? "run" : "runs"}.
        </p>
      )}
      <TableFrame label="Heat map of positions and runs">
        <table className="text-sm">
          <caption className="px-2 py-1 text-left font-medium">{caption}</caption>
          <thead>
            <tr>
              <th scope="col" className="px-2 py-1 text-left">
                Position
              </th>
              {grid.runs.map((r) => (
                <th key={r.runNumber} scope="col" className="px-2 py-1 text-right whitespace-nowrap">
                  Run {r.runNumber}
                  <span className="block text-xs font-normal text-ink-muted">
                    {r.cycleNumber} · {JUDGEMENT_WORDS[r.judgement]}
                  </span>
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {grid.rows.map((row) => (
              <tr key={row.position}>
                <th scope="row" className="sticky left-0 z-[1] bg-paper-raised px-2 py-1 text-left font-normal">
                  <span className="font-semibold">{row.position}</span> <span className="text-ink-muted">{row.label}</span>
                  {row.overallColdSpot && <span className="ml-1 text-xs font-semibold">(cold spot overall)</span>}
                </th>
                {row.cells.map((cell) => {
                  const band = bandOf(cell.value);
                  return (
                    <td key={cell.runNumber} className="border border-white px-2 py-1 text-right whitespace-nowrap tabular-nums" style={cellStyle(band)}>
                      {band.marker && <span aria-hidden="true">{HEAT_MARKER_SYMBOLS[band.marker]} </span>}
                      {heatValueText(cell.value, metric)}
                      {cell.coldSpot && <span aria-hidden="true"> {COLD_SPOT_SYMBOL}</span>}
                      {(band.marker || cell.coldSpot) && <span className="sr-only">{[band.marker ? `, ${band.label}` : "", cell.coldSpot ? ", cold spot of this run" : ""].join("")}</span>}
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </TableFrame>
      <figcaption>
        <ul className="flex flex-wrap gap-x-4 gap-y-1 text-xs" aria-label="Legend">
          {legend.map((band) => (
            <li key={band.id} className="flex items-center gap-1.5">
              <Swatch band={band} />
              {band.label}
            </li>
          ))}
          <li className="flex items-center gap-1.5">
            <span aria-hidden="true">{COLD_SPOT_SYMBOL}</span> cold spot of the run (lowest F0; a tie goes to the later arrival at Ts)
          </li>
        </ul>
        <p className="mt-1 text-xs text-ink-muted">
          {metric === "f0" ? "F0 as each signed cycle's analysis computed it, with the profile's reference temperature and z." : "Lowest reading of each position during the holding time."} A
          run&apos;s spread is an upper bound of the spread between its positions at any one instant during holding: the highest maximum minus the lowest minimum, or the cycle&apos;s own spread at its
          worst instant when that is smaller and covered every mapped probe.
        </p>
      </figcaption>
    </figure>
  );
}

/** Positions × runs drawn as a grid of F0 cells in the PDF, with the value written in each cell. */
import { Rect, Svg } from "@react-pdf/renderer";
import type { StudySummary } from "@/lib/analysis/study-types";
import { SvgLabel } from "../svg";
import { fixed } from "../text";
import { colour } from "../theme";

const ROW_H = 14;
const HEAD_H = 16;
const LABEL_W = 120;
const LEGEND_H = 22;

/** A cell's fill: below the criterion in the fail colour; at or above it, paler for the cooler (nearer the limit). */
function cellFill(f0: number | null, minF0: number, highest: number): { fill: string; ink: string } {
  if (f0 === null) return { fill: colour.paperSunk, ink: colour.inkMuted };
  if (f0 < minF0) return { fill: colour.fail500, ink: "#ffffff" };
  const share = highest > minF0 ? (f0 - minF0) / (highest - minF0) : 1;
  const tones = [colour.steam50, colour.steam100, "#8fcbd0", colour.steam500];
  const tone = tones[Math.min(tones.length - 1, Math.floor(share * tones.length))];
  return { fill: tone, ink: tone === colour.steam500 ? "#ffffff" : colour.ink };
}

export function StudyHeatMap({ summary, minF0, width, labels }: { summary: StudySummary; minF0: number; width: number; labels: Record<string, string> }) {
  const runNumbers = summary.runs.map((r) => r.runNumber);
  const rows = summary.positions;
  const cellW = runNumbers.length > 0 ? Math.min(70, (width - LABEL_W) / runNumbers.length) : 0;
  const values = rows.flatMap((p) => runNumbers.map((n) => p.f0ByRun[n] ?? null)).filter((v): v is number => v !== null);
  const highest = values.length > 0 ? Math.max(...values) : minF0;
  const coldPerRun = new Map(summary.runs.map((r) => [r.runNumber, r.coldSpot?.positionId ?? null]));
  const height = HEAD_H + rows.length * ROW_H + LEGEND_H;
  return (
    <Svg width={width} height={height}>
      <SvgLabel x={0} y={HEAD_H - 5} size={6.5} weight={600} fill={colour.inkSoft}>
        Position
      </SvgLabel>
      {runNumbers.map((n, j) => (
        <SvgLabel key={`h${n}`} x={LABEL_W + j * cellW + cellW / 2} y={HEAD_H - 5} anchor="middle" size={6.5} weight={600} fill={colour.inkSoft}>
          {`Run ${n}`}
        </SvgLabel>
      ))}
      {rows.map((p, i) => {
        const y = HEAD_H + i * ROW_H;
        return [
          <SvgLabel key={`l${p.position}`} x={0} y={y + ROW_H - 4} size={6.5} fill={colour.ink}>
            {labels[p.position] ?? p.position}
          </SvgLabel>,
          ...runNumbers.map((n, j) => {
            const f0 = p.f0ByRun[n] ?? null;
            const { fill, ink } = cellFill(f0, minF0, highest);
            const cold = coldPerRun.get(n) === p.position;
            return [
              <Rect
                key={`c${p.position}-${n}`}
                x={LABEL_W + j * cellW + 0.5}
                y={y + 0.5}
                width={cellW - 1}
                height={ROW_H - 1}
                fill={fill}
                stroke={cold ? colour.brass600 : undefined}
                strokeWidth={cold ? 1.2 : 0}
              />,
              <SvgLabel key={`v${p.position}-${n}`} x={LABEL_W + j * cellW + cellW / 2} y={y + ROW_H - 4} anchor="middle" size={6.5} mono fill={ink}>
                {f0 === null ? "no reading" : `${fixed(f0, 1)}${cold ? " *" : ""}`}
              </SvgLabel>,
            ];
          }),
        ];
      })}
      <Rect x={0} y={height - 12} width={10} height={8} fill={colour.fail500} />
      <SvgLabel x={13} y={height - 5.5} size={6.2}>
        {`below ${fixed(minF0, 1)} min`}
      </SvgLabel>
      {[colour.steam50, colour.steam100, "#8fcbd0", colour.steam500].map((tone, k) => (
        <Rect key={`t${k}`} x={90 + k * 10} y={height - 12} width={10} height={8} fill={tone} />
      ))}
      <SvgLabel x={133} y={height - 5.5} size={6.2}>
        {`${fixed(minF0, 1)} to ${fixed(highest, 1)} min, paler nearer the limit`}
      </SvgLabel>
      <Rect x={290} y={height - 12} width={10} height={8} fill={colour.paper} stroke={colour.brass600} strokeWidth={1.2} />
      <SvgLabel x={303} y={height - 5.5} size={6.2}>
        * cold spot of the run (lowest F0; ties: latest at Ts)
      </SvgLabel>
    </Svg>
  );
}

/**
 * Positions × runs drawn as a grid of F0 cells in the PDF, on the page's colour bands (lib/charts/heat-map.ts) with the
 * value written in each cell; a missed criterion also carries a triangle, so colour is never the only sign.
 */
import { Path, Rect, Svg } from "@react-pdf/renderer";
import { heatMapGrid } from "@/lib/analysis/study-heat-map";
import type { StudySummary } from "@/lib/analysis/study-types";
import { f0Band, f0Bands, heatValueText, NO_READING_BAND, type HeatBand } from "@/lib/charts/heat-map";
import { SvgLabel } from "../svg";
import { colour } from "../theme";

const ROW_H = 14;
const HEAD_H = 16;
const LABEL_W = 120;
const LEGEND_ROW_H = 11;

function Triangle({ x, y, fill, down }: { x: number; y: number; fill: string; down: boolean }) {
  return <Path d={down ? `M${x} ${y} L${x + 6} ${y} L${x + 3} ${y + 5} Z` : `M${x} ${y + 5} L${x + 6} ${y + 5} L${x + 3} ${y} Z`} fill={fill} />;
}

function Swatch({ x, y, band }: { x: number; y: number; band: HeatBand }) {
  return (
    <>
      <Rect x={x} y={y} width={14} height={8} fill={band.fill} stroke={colour.inkLine} strokeWidth={0.4} />
      {band.marker ? <Triangle x={x + 4} y={y + 1.5} fill={band.text} down={band.marker === "below"} /> : null}
      <SvgLabel x={x + 18} y={y + 6.5} size={6.2}>
        {band.label}
      </SvgLabel>
    </>
  );
}

export function StudyHeatMap({ summary, minF0, width, labels }: { summary: StudySummary; minF0: number; width: number; labels: Record<string, string> }) {
  const grid = heatMapGrid(summary, "f0");
  const runNumbers = grid.runs.map((r) => r.runNumber);
  const cellW = runNumbers.length > 0 ? Math.min(70, (width - LABEL_W) / runNumbers.length) : 0;
  const bands = [...f0Bands(minF0), NO_READING_BAND];
  const legendTop = HEAD_H + grid.rows.length * ROW_H + 8;
  const height = legendTop + Math.ceil((bands.length + 1) / 2) * LEGEND_ROW_H;
  return (
    <Svg width={width} height={height}>
      <SvgLabel x={0} y={HEAD_H - 5} size={6.5} weight={600} fill={colour.inkSoft}>
        Position
      </SvgLabel>
      {grid.runs.map((r, j) => (
        <SvgLabel key={`h${r.runNumber}`} x={LABEL_W + j * cellW + cellW / 2} y={HEAD_H - 5} anchor="middle" size={6.5} weight={600} fill={colour.inkSoft}>
          {`Run ${r.runNumber}`}
        </SvgLabel>
      ))}
      {grid.rows.map((row, i) => {
        const y = HEAD_H + i * ROW_H;
        return [
          <SvgLabel key={`l${row.position}`} x={0} y={y + ROW_H - 4} size={6.5} fill={colour.ink} weight={row.overallColdSpot ? 600 : 400}>
            {labels[row.position] ?? row.position}
          </SvgLabel>,
          ...row.cells.map((cell, j) => {
            const band = f0Band(cell.value, minF0);
            const x = LABEL_W + j * cellW;
            return [
              <Rect
                key={`c${row.position}-${cell.runNumber}`}
                x={x + 0.5}
                y={y + 0.5}
                width={cellW - 1}
                height={ROW_H - 1}
                fill={band.fill}
                stroke={cell.coldSpot ? colour.brass600 : undefined}
                strokeWidth={cell.coldSpot ? 1.4 : 0}
              />,
              band.marker ? <Triangle key={`m${row.position}-${cell.runNumber}`} x={x + 4} y={y + 4.5} fill={band.text} down={band.marker === "below"} /> : null,
              <SvgLabel key={`v${row.position}-${cell.runNumber}`} x={x + cellW / 2} y={y + ROW_H - 4} anchor="middle" size={6.5} mono fill={band.text}>
                {cell.value === null ? "no reading" : `${heatValueText(cell.value, "f0")}${cell.coldSpot ? " *" : ""}`}
              </SvgLabel>,
            ];
          }),
        ];
      })}
      {bands.map((band, k) => (
        <Swatch key={band.id} x={(k % 2) * (width / 2)} y={legendTop + Math.floor(k / 2) * LEGEND_ROW_H} band={band} />
      ))}
      <Rect x={(bands.length % 2) * (width / 2)} y={legendTop + Math.floor(bands.length / 2) * LEGEND_ROW_H} width={14} height={8} fill={colour.paper} stroke={colour.brass600} strokeWidth={1.4} />
      <SvgLabel x={(bands.length % 2) * (width / 2) + 18} y={legendTop + Math.floor(bands.length / 2) * LEGEND_ROW_H + 6.5} size={6.2}>
        {"* framed: the run's cold spot (lowest F0; ties: latest at Ts)"}
      </SvgLabel>
    </Svg>
  );
}

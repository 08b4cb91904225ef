import { G, Path, Svg } from "@react-pdf/renderer";
import { colour, A4 } from "./theme";

// "DRAFT" drawn as strokes rather than set as text: a watermark made of letters would land in the
// PDF's text layer and break up every line a reader copies or searches.
const LETTERS = [
  "M0 0 L28 0 Q60 0 60 32 L60 68 Q60 100 28 100 L0 100 Z",
  "M0 100 L0 0 L34 0 Q60 0 60 25 Q60 50 34 50 L0 50 M30 50 L60 100",
  "M0 100 L30 0 L60 100 M13 60 L47 60",
  "M60 0 L0 0 L0 100 M0 48 L46 48",
  "M0 0 L60 0 M30 0 L30 100",
];

export function DraftWatermark() {
  const advance = 84;
  const width = advance * LETTERS.length - (advance - 60);
  const scale = 1.15;
  const cx = A4.width / 2;
  const cy = A4.height / 2;
  return (
    <Svg width={A4.width} height={A4.height} style={{ position: "absolute", top: 0, left: 0 }} fixed>
      <G transform={`translate(${cx} ${cy}) rotate(-38) scale(${scale}) translate(${-width / 2} -50)`}>
        {LETTERS.map((d, i) => (
          <Path key={i} d={d} transform={`translate(${i * advance} 0)`} stroke={colour.caution500} strokeOpacity={0.09} strokeWidth={13} strokeLinejoin="round" fill="none" />
        ))}
      </G>
    </Svg>
  );
}

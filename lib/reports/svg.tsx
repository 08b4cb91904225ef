import type { ReactNode } from "react";
import { Text } from "@react-pdf/renderer";
import { FONT_MONO, FONT_SANS, colour } from "./theme";
import { pdfText } from "./text";

// react-pdf lays out <Text> inside <Svg> from its props but loads a font face only when it sees
// it in a style, so both are given (or a weight used only in charts falls back to Helvetica). Its
// type lists only the presentation attributes, hence the widened component.
const SvgText = Text as unknown as (props: Record<string, unknown> & { children?: ReactNode }) => ReactNode;

export function SvgLabel({
  x,
  y,
  children,
  size = 6.5,
  anchor = "start",
  fill = colour.inkMuted,
  weight = 400,
  mono = false,
  rotate,
}: {
  x: number;
  y: number;
  children: string;
  size?: number;
  anchor?: "start" | "middle" | "end";
  fill?: string;
  weight?: 400 | 500 | 600 | 700;
  mono?: boolean;
  rotate?: number;
}) {
  return (
    <SvgText
      style={{ fontFamily: mono ? FONT_MONO : FONT_SANS, fontWeight: mono ? Math.min(weight, 500) : weight, fontSize: size }}
      x={x}
      y={y}
      fontFamily={mono ? FONT_MONO : FONT_SANS}
      fontSize={size}
      fontWeight={mono ? Math.min(weight, 500) : weight}
      fill={fill}
      textAnchor={anchor}
      transform={rotate ? `rotate(${rotate} ${x} ${y})` : undefined}
    >
      {pdfText(children)}
    </SvgText>
  );
}

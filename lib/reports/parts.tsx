/** The report's building blocks: text with its glyph rules, headings, facts and table heads. */
import type { ReactNode } from "react";
import { Text, View } from "@react-pdf/renderer";
import { SAFETY_NOTES } from "@/lib/safety";
import { s } from "./styles";
import { pdfText } from "./text";

type Style = (typeof s)[keyof typeof s];
export type Styles = Style | Style[] | Record<string, string | number>;

/** Text with the report's glyph rules applied to every string child. */
export function T({ style, children, ...rest }: { style?: Styles | Styles[]; children?: ReactNode; fixed?: boolean; wrap?: boolean; minPresenceAhead?: number }) {
  const clean = (node: ReactNode): ReactNode => (typeof node === "string" || typeof node === "number" ? pdfText(node) : Array.isArray(node) ? node.map((n) => clean(n)) : node);
  return (
    <Text style={style as never} {...rest}>
      {clean(children)}
    </Text>
  );
}

export function Heading({ children }: { children: string }) {
  return (
    <T style={s.h2} minPresenceAhead={80}>
      {children}
    </T>
  );
}

export function Fact({ label, children, wide = false }: { label: string; children: ReactNode; wide?: boolean }) {
  return (
    <View style={wide ? [s.fact, s.factWide] : s.fact} wrap={false}>
      <T style={s.factLabel}>{label}</T>
      <View style={s.factValue}>{typeof children === "string" ? <T>{children}</T> : children}</View>
    </View>
  );
}

export type Column = { title: string; width: number; numeric?: boolean };

export function TableHead({ columns }: { columns: Column[] }) {
  return (
    <View style={s.thead} fixed>
      {columns.map((c) => (
        <T key={c.title} style={[s.th, { width: `${c.width}%`, textAlign: c.numeric ? "right" : "left" }]}>
          {c.title}
        </T>
      ))}
    </View>
  );
}

/** The safety notes every report prints, kept together on one page. */
export function SafetyNotesSection() {
  return (
    <View wrap={false}>
      <Heading>Safety notes</Heading>
      <View style={s.safety}>
        {SAFETY_NOTES.map((note) => (
          <View key={note.title} style={s.safetyItem}>
            <T>
              <T style={s.safetyTitle}>{`${note.title}. `}</T>
              {note.text}
            </T>
          </View>
        ))}
      </View>
    </View>
  );
}

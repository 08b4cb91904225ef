/** A plain table for the study report: a repeated head and rows of text cells in percent widths. */
import type { ReactNode } from "react";
import { View } from "@react-pdf/renderer";
import { T, TableHead, type Column, type Styles } from "../parts";
import { s } from "../styles";

export type Cell = { text: string; style?: Styles };

export function Table({ columns, rows, empty }: { columns: Column[]; rows: Array<{ key: string; cells: Array<string | Cell> }>; empty?: string }) {
  if (rows.length === 0 && empty) return <T style={s.muted}>{empty}</T>;
  return (
    <View style={s.table}>
      <TableHead columns={columns} />
      {rows.map((row) => (
        <View key={row.key} style={s.tr} wrap={false}>
          {row.cells.map((cell, i) => {
            const c = typeof cell === "string" ? { text: cell } : cell;
            const column = columns[i];
            return (
              <T key={column.title} style={[column.numeric ? s.tdNum : s.td, { width: `${column.width}%` }, ...(c.style ? [c.style] : [])]}>
                {c.text}
              </T>
            );
          })}
        </View>
      ))}
    </View>
  );
}

export function Caption({ children }: { children: ReactNode }) {
  return <T style={s.caption}>{children}</T>;
}

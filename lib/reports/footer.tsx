/**
 * The footer on every page: report number, what the report is about, page of pages, each in a column of its own
 * width. A long report number or site name wraps (at most three lines) inside its column and can never run into the
 * next one; the page count keeps a fixed column at the right.
 */
import { StyleSheet, Text, View } from "@react-pdf/renderer";
import { A4, FONT_MONO, PAGE_MARGIN, colour } from "./theme";
import { pdfText } from "./text";

const REPORT_NUMBER_WIDTH = 150;
const PAGE_COUNT_WIDTH = 64;
const GAP = 10;
const FONT_SIZE = 6.8;
// JetBrains Mono advances every glyph 600/1000 em, so a line of the column holds this many characters.
const NUMBER_CHARS_PER_LINE = Math.floor(REPORT_NUMBER_WIDTH / (0.6 * FONT_SIZE));

/**
 * A report number broken into lines that fit its column: after a hyphen where possible, else mid-run. The layout
 * engine does not break a word at a hyphen by itself, so a long number would run on into the next column.
 */
export function breakReportNumber(reportNumber: string, perLine = NUMBER_CHARS_PER_LINE): string {
  const pieces = reportNumber.match(/[^-]*-|[^-]+$/g) ?? [reportNumber];
  const lines: string[] = [];
  let line = "";
  for (let piece of pieces) {
    while (piece.length > perLine) {
      if (line) lines.push(line);
      lines.push(piece.slice(0, perLine));
      piece = piece.slice(perLine);
      line = "";
    }
    if ((line + piece).length > perLine) {
      lines.push(line);
      line = piece;
    } else line += piece;
  }
  if (line) lines.push(line);
  return lines.join("\n");
}

const f = StyleSheet.create({
  // Placed from the top: react-pdf 4.9 drops a page-number (render) text positioned with "bottom".
  footer: {
    position: "absolute",
    top: A4.height - 34,
    left: PAGE_MARGIN.side,
    right: PAGE_MARGIN.side,
    flexDirection: "row",
    alignItems: "flex-start",
    borderTopWidth: 0.5,
    borderTopColor: colour.inkLine,
    paddingTop: 4,
    fontSize: FONT_SIZE,
    lineHeight: 1.3,
    color: colour.inkMuted,
  },
  // Three lines at most: 4 pt padding + 3 × 8.84 pt stays inside the 34 pt above the page's edge.
  number: { width: REPORT_NUMBER_WIDTH, fontFamily: FONT_MONO, fontSize: FONT_SIZE, maxLines: 3 },
  about: { flexGrow: 1, flexShrink: 1, flexBasis: 0, marginHorizontal: GAP, maxLines: 3, textOverflow: "ellipsis" },
  pages: { width: PAGE_COUNT_WIDTH, textAlign: "right" },
});

export function ReportFooter({ reportNumber, about }: { reportNumber: string; about: string }) {
  return (
    <View style={f.footer} fixed>
      <Text style={f.number}>{breakReportNumber(pdfText(reportNumber))}</Text>
      <Text style={f.about}>{pdfText(about)}</Text>
      <Text style={f.pages} render={({ pageNumber, totalPages }) => `Page ${pageNumber} of ${totalPages}`} />
    </View>
  );
}

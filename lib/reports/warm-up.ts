import { createElement } from "react";
import * as pdf from "@react-pdf/renderer";
import { registerReportFonts } from "./fonts";
import { FONT_MONO, FONT_SANS } from "./theme";

/** Loads @react-pdf/renderer and the report fonts, and renders one page with each font so their files are parsed. */
export async function warmReportRenderer(): Promise<void> {
  registerReportFonts();
  const line = (fontFamily: string, fontWeight: number) => createElement(pdf.Text, { key: `${fontFamily}${fontWeight}`, style: { fontFamily, fontWeight } }, "Papin 134 °C");
  const lines = [...[400, 500, 600, 700].map((w) => line(FONT_SANS, w)), ...[400, 500].map((w) => line(FONT_MONO, w))];
  await pdf.renderToBuffer(createElement(pdf.Document, null, createElement(pdf.Page, { size: "A4" }, ...lines)));
}

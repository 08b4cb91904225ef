// Next.js calls this once when a server starts: mail left pending over a restart goes out, and the
// PDF renderer is loaded and warmed so the first report does not pay for it.
export async function register() {
  // Next.js replaces NEXT_RUNTIME at build time, so the edge build drops the Node-only import below.
  // eslint-disable-next-line no-restricted-properties
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { kickMailDelivery } = await import("@/lib/mail/delivery");
  kickMailDelivery();
  // Not awaited: the server answers at once; a warm-up that fails leaves the first report to show why.
  void warmReportRenderer().catch((error: unknown) => console.warn(`[papin] the PDF renderer could not be warmed at start: ${error instanceof Error ? error.message : String(error)}`));
}

/** Loads @react-pdf/renderer and the report fonts, and renders one page with each font so their files are parsed. */
async function warmReportRenderer() {
  const [{ createElement }, pdf, { registerReportFonts }, { FONT_MONO, FONT_SANS }] = await Promise.all([
    import("react"),
    import("@react-pdf/renderer"),
    import("@/lib/reports/fonts"),
    import("@/lib/reports/theme"),
  ]);
  registerReportFonts();
  const line = (fontFamily: string, fontWeight: number) => createElement(pdf.Text, { key: `${fontFamily}${fontWeight}`, style: { fontFamily, fontWeight } }, "Papin 134 °C");
  const lines = [...[400, 500, 600, 700].map((w) => line(FONT_SANS, w)), ...[400, 500].map((w) => line(FONT_MONO, w))];
  await pdf.renderToBuffer(createElement(pdf.Document, null, createElement(pdf.Page, { size: "A4" }, ...lines)));
}

// Next.js calls this once when a server starts: mail left pending over a restart goes out, and the
// PDF renderer is loaded and warmed so the first report does not pay for it.
export async function register() {
  // Next.js replaces NEXT_RUNTIME at build time, so the edge build drops the Node-only imports below
  // (they must stay inside this branch: a helper outside it would be traced into the edge bundle).
  // eslint-disable-next-line no-restricted-properties
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const [{ kickMailDelivery }, { warmReportRenderer }] = await Promise.all([import("@/lib/mail/delivery"), import("@/lib/reports/warm-up")]);
  kickMailDelivery();
  // Not awaited: the server answers at once; a warm-up that fails leaves the first report to show why.
  void warmReportRenderer().catch((error: unknown) => console.warn(`[papin] the PDF renderer could not be warmed at start: ${error instanceof Error ? error.message : String(error)}`));
}

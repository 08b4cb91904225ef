// Next.js calls this once when a server starts: mail left pending over a restart goes out.
export async function register() {
  // Next.js replaces NEXT_RUNTIME at build time, so the edge build drops the Node-only import below.
  // eslint-disable-next-line no-restricted-properties
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { kickMailDelivery } = await import("@/lib/mail/delivery");
  kickMailDelivery();
}

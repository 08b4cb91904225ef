// Next.js calls this once when a server starts: mail left pending over a restart goes out.
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { kickMailDelivery } = await import("@/lib/mail/delivery");
  kickMailDelivery();
}

import { env } from "@/lib/env";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

export const FOREIGN_ORIGIN_REFUSAL = "Refused: this request came from another site. Papin accepts changes only from its own pages.";

/**
 * Cross-site request forgery guard for every request that can change something (route handlers through `route()`,
 * server actions and page posts through proxy.ts). Browsers name the sending page's origin in `Origin`; it must be
 * the public URL's (NEXTAUTH_URL), or this server's own host when none is configured. Without `Origin` (scripts,
 * machine clients), a browser's `Sec-Fetch-Site` saying another site is refused too. Returns the sentence to answer
 * with 403, or null when the request may go on.
 */
export function foreignOriginRefusal(request: Request): string | null {
  if (SAFE_METHODS.has(request.method.toUpperCase())) return null;
  const origin = request.headers.get("origin");
  if (origin === null) {
    const site = request.headers.get("sec-fetch-site");
    return site === "cross-site" || site === "same-site" ? FOREIGN_ORIGIN_REFUSAL : null;
  }
  return isOwnOrigin(origin, request) ? null : FOREIGN_ORIGIN_REFUSAL;
}

function isOwnOrigin(origin: string, request: Request): boolean {
  let sender: URL;
  try {
    sender = new URL(origin);
  } catch {
    return false; // "null" (sandboxed frames, files) and anything unreadable
  }
  const publicUrl = env().NEXTAUTH_URL;
  if (publicUrl) return sender.origin === new URL(publicUrl).origin;
  const host = request.headers.get("host") ?? new URL(request.url).host;
  return sender.host === host;
}

import { env } from "@/lib/env";

/** The portal's public origin for links in e-mails: NEXTAUTH_URL when set, else the request's own. */
export function originOf(request: Request): string {
  const pinned = env().NEXTAUTH_URL;
  if (pinned) return pinned.replace(/\/$/, "");
  const url = new URL(request.url);
  const host = request.headers.get("x-forwarded-host") ?? request.headers.get("host") ?? url.host;
  const proto = request.headers.get("x-forwarded-proto") ?? url.protocol.replace(":", "");
  return `${proto}://${host}`;
}

import { API_TOKEN_ROUTES_ONLY, isApiTokenRoute, routeKeyOf } from "@/lib/domain";

/** The token of an `Authorization: Bearer …` header; null when the request carries none. */
export function bearerTokenOf(request: Request): string | null {
  const header = request.headers.get("authorization");
  const match = header ? /^Bearer\s+(.*)$/i.exec(header.trim()) : null;
  return match ? match[1].trim() : null;
}

/** `METHOD /path` of a request, as API_TOKEN_ROUTES names routes. */
export const routeKeyOfRequest = (request: Request) => routeKeyOf(request.method, new URL(request.url).pathname);

/**
 * For `route()`: a bearer token on any route but the few that accept one is refused with 401 and the list, so a
 * gateway misconfigured to call another route learns why instead of meeting "please sign in".
 */
export function bearerRefusal(request: Request): string | null {
  if (bearerTokenOf(request) === null) return null;
  return isApiTokenRoute(routeKeyOfRequest(request)) ? null : API_TOKEN_ROUTES_ONLY;
}

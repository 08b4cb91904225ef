import type { Actor } from "./roles";

/**
 * Logger-gateway API tokens: the only routes a token opens, its lifetime limits and how a token actor is told apart.
 * A token acts for its site with a technician's rights on these routes alone, limited to its sterilizers.
 */
export const API_TOKEN_ROUTES = ["POST /api/cycles", "GET /api/sterilizers", "GET /api/profiles"] as const;
export type ApiTokenRoute = (typeof API_TOKEN_ROUTES)[number];

export const API_TOKEN_SCOPES = ["gateway"] as const;
export type ApiTokenScope = (typeof API_TOKEN_SCOPES)[number];
export const API_TOKEN_SCOPE_LABELS: Record<ApiTokenScope, string> = { gateway: "Logger gateway" };

/** The role whose rights a gateway token borrows on its routes. */
export const API_TOKEN_ROLE = "technician" as const;

/** What a token looks like: this marker, then 32 random bytes in base64url (43 characters). */
export const API_TOKEN_MARKER = "papin_gw_";
export const API_TOKEN_PATTERN = /^papin_gw_[A-Za-z0-9_-]{43}$/;
/** How much of a token is kept in clear to recognise it in the list: the marker and 6 characters. */
export const API_TOKEN_SHOWN_CHARS = API_TOKEN_MARKER.length + 6;

export const API_TOKEN_DEFAULT_DAYS = 90;
export const API_TOKEN_MAX_DAYS = 365;

export const API_TOKEN_ROUTES_ONLY = `API tokens are accepted only on ${API_TOKEN_ROUTES.join(", ")}; sign in to use this route.`;

/** The token behind a gateway actor: which one, and the sterilizers it may upload for (null: all of its site). */
export type ApiTokenGrant = { id: string; name: string; prefix: string; sterilizerIds: string[] | null };
export type GatewayActor = Actor & { apiToken: ApiTokenGrant };

/** The token an actor acts through, or null for a signed-in person. */
export function apiTokenOf(actor: Actor): ApiTokenGrant | null {
  return (actor as Partial<GatewayActor>).apiToken ?? null;
}

/** `METHOD /path` of a request, the way API_TOKEN_ROUTES names routes. */
export function routeKeyOf(method: string, pathname: string): string {
  return `${method.toUpperCase()} ${pathname.replace(/\/+$/, "") || "/"}`;
}

export function isApiTokenRoute(key: string): key is ApiTokenRoute {
  return (API_TOKEN_ROUTES as readonly string[]).includes(key);
}

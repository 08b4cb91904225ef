import "server-only";
import { getServerSession } from "next-auth";
import { authOptions } from "./options";
import { can, type Permission } from "./permissions";
import { getUserById } from "@/db/queries/users";
import { API_TOKEN_ROUTES_ONLY, type Actor, type ApiTokenRoute } from "@/lib/domain";
import { AppError } from "@/lib/errors";
import { actorForApiToken } from "@/lib/services/api-tokens";
import { bearerTokenOf, routeKeyOfRequest } from "./bearer";

/**
 * The signed-in user, re-read from the database on every call so that a disabled account or a
 * changed role takes effect at once, whatever the session cookie still says.
 */
export async function currentUser(): Promise<Actor | null> {
  const session = await getServerSession(authOptions());
  const id = session?.user?.id;
  if (!id) return null;
  const user = await getUserById({ id });
  if (!user || user.disabled) return null;
  return { id: user.id, email: user.email, name: user.name, role: user.role, siteId: user.siteId };
}

export async function requireUser(): Promise<Actor> {
  const user = await currentUser();
  if (!user) throw new AppError(401, "Please sign in first.");
  return user;
}

export async function requireRole(permission: Permission, what?: string): Promise<Actor> {
  const user = await requireUser();
  if (!can(user.role, permission)) {
    throw new AppError(403, `Your role does not allow you to ${what ?? describe(permission)}.`);
  }
  return user;
}

function describe(permission: Permission): string {
  const [noun, verb] = permission.split(":");
  return `${verb.replace(/-/g, " ")} ${noun.replace(/-/g, " ")}s`;
}

/**
 * For the few routes a logger gateway calls (API_TOKEN_ROUTES): an `Authorization: Bearer` token acts as its site's
 * gateway (lib/services/api-tokens.ts); without one, the signed-in user with the permission, as `requireRole`.
 */
export async function requireActorOrToken(request: Request, permission: Permission, { tokenRoute, what }: { tokenRoute: ApiTokenRoute; what?: string }): Promise<Actor> {
  const token = bearerTokenOf(request);
  if (token === null) return requireRole(permission, what);
  if (routeKeyOfRequest(request) !== tokenRoute) throw new AppError(401, API_TOKEN_ROUTES_ONLY);
  return actorForApiToken({ token, route: tokenRoute, permission, what: what ?? describe(permission) });
}

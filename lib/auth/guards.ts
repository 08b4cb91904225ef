import "server-only";
import { getServerSession } from "next-auth";
import { authOptions } from "./options";
import { sessionFromCookie } from "./session-cookie";
import { can, type Permission } from "./permissions";
import { CHOOSE_OWN_PASSWORD_FIRST } from "./messages";
import { getUserById } from "@/db/queries/users";
import { API_TOKEN_ROUTES_ONLY, type Actor, type ApiTokenRoute } from "@/lib/domain";
import { AppError } from "@/lib/errors";
import { actorForApiToken } from "@/lib/services/api-tokens";
import { bearerTokenOf, routeKeyOfRequest } from "./bearer";

/** The signed-in account, and whether it still has to replace an administrator's one-time password. */
export type Account = { actor: Actor; mustChangePassword: boolean };

/**
 * The signed-in account, re-read from the database on every call so that a disabled account, a changed role or an
 * ended session (its session version bumped by sign-out, a password change or an administrator) takes effect at
 * once, whatever the session cookie still says.
 */
export async function currentAccount(): Promise<Account | null> {
  const session = (await sessionFromCookie()) ?? (await getServerSession(authOptions()))?.user;
  const id = session?.id;
  if (!id) return null;
  const user = await getUserById({ id });
  if (!user || user.disabled) return null;
  // The session callback always copies the token's version; a session built without one counts as the first.
  if ((session.sessionVersion ?? 0) !== user.sessionVersion) return null;
  return { actor: { id: user.id, email: user.email, name: user.name, role: user.role, siteId: user.siteId }, mustChangePassword: user.mustChangePassword };
}

export async function currentUser(): Promise<Actor | null> {
  return (await currentAccount())?.actor ?? null;
}

/** Permissions an account on a one-time password still holds: choosing its own password. */
const BEFORE_OWN_PASSWORD: readonly Permission[] = ["account:own-password"];

export async function requireUser(permission?: Permission): Promise<Actor> {
  const account = await currentAccount();
  if (!account) throw new AppError(401, "Please sign in first.");
  if (account.mustChangePassword && !(permission && BEFORE_OWN_PASSWORD.includes(permission))) throw new AppError(403, CHOOSE_OWN_PASSWORD_FIRST);
  return account.actor;
}

export async function requireRole(permission: Permission, what?: string): Promise<Actor> {
  const user = await requireUser(permission);
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

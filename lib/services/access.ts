import "server-only";
import { can, type Permission } from "@/lib/auth/permissions";
import { AppError } from "@/lib/errors";
import type { Actor } from "@/db/queries/users";

export type { Actor };

/**
 * The services' own permission check (the table in lib/auth/permissions.ts decides), so that a
 * workflow refuses a role whoever calls it: a route, an action, a script.
 */
export function assertAllowed(actor: Actor, permission: Permission, what: string): void {
  if (!can(actor.role, permission)) throw new AppError(403, `Your role does not allow you to ${what}.`);
}

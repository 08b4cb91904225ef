import "server-only";
import { forbidden, notFound, redirect } from "next/navigation";
import { currentUser } from "./guards";
import { can, type Permission } from "./permissions";
import { AppError } from "@/lib/errors";
import type { Actor } from "@/lib/domain";

/**
 * The one guard of every server page: the signed-in actor holding the permission, else the
 * sign-in page (no session) or a real HTTP 403 (`forbidden()`), never a 200 with an error body.
 * Call it before anything streams (no `loading.tsx` above the call), or the status is already 200.
 */
export async function requirePageActor(permission?: Permission): Promise<Actor> {
  const actor = await currentUser();
  if (!actor) redirect("/sign-in");
  if (permission && !can(actor.role, permission)) forbidden();
  return actor;
}

/**
 * For a page's record: a missing record (null/undefined, or an AppError 404) becomes the real
 * not-found page with HTTP 404, an AppError 403 the real forbidden page; anything else propagates.
 */
export async function orNotFound<T>(load: Promise<T | null | undefined>): Promise<T> {
  let value: T | null | undefined;
  try {
    value = await load;
  } catch (error) {
    if (error instanceof AppError && error.status === 404) notFound();
    if (error instanceof AppError && (error.status === 401 || error.status === 403)) forbidden();
    throw error;
  }
  if (value === null || value === undefined) notFound();
  return value;
}

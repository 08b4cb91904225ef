import "server-only";
import { forbidden, notFound, redirect } from "next/navigation";
import { currentUser } from "@/lib/auth/guards";
import { can, type Permission } from "@/lib/auth/permissions";
import { AppError } from "@/lib/errors";
import type { Actor } from "@/db/queries/users";

/** For server pages: the signed-in actor with the permission, or the sign-in page / a real 403. */
export async function pageActor(permission: Permission): Promise<Actor> {
  const actor = await currentUser();
  if (!actor) redirect("/sign-in");
  if (!can(actor.role, permission)) forbidden();
  return actor;
}

/** Turns a query's 404 into the not-found page; anything else propagates. */
export async function orNotFound<T>(load: Promise<T>): Promise<T> {
  try {
    return await load;
  } catch (error) {
    if (error instanceof AppError && error.status === 404) notFound();
    if (error instanceof AppError && error.status === 403) forbidden();
    throw error;
  }
}

import "server-only";
import { forbidden, notFound, redirect } from "next/navigation";
import { currentAccount, type Account } from "./guards";
import { can, type Permission } from "./permissions";
import { AppError } from "@/lib/errors";
import type { Actor } from "@/lib/domain";

export const OWN_PASSWORD_PAGE = "/account/password";

/**
 * The one guard of every server page: the signed-in actor holding the permission, else the
 * sign-in page (no session) or a real HTTP 403 (`forbidden()`), never a 200 with an error body.
 * An account still on an administrator's one-time password is sent to choose its own first.
 * Call it before anything streams (no `loading.tsx` above the call), or the status is already 200.
 */
export async function requirePageActor(permission?: Permission): Promise<Actor> {
  return (await requirePageAccount(permission)).actor;
}

/** requirePageActor, with whether the account is still on a one-time password (for the page that replaces it). */
export async function requirePageAccount(permission?: Permission): Promise<Account> {
  const account = await currentAccount();
  if (!account) redirect("/sign-in");
  if (account.mustChangePassword && permission !== "account:own-password") redirect(OWN_PASSWORD_PAGE);
  if (permission && !can(account.actor.role, permission)) forbidden();
  return account;
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

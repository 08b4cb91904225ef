import "server-only";
import type { Role, User } from "@/db/schema";
import { getUserByEmail, getUserOnSite, insertUser, listUsersOfSite, updateUserOnSite, type Actor } from "@/db/queries/users";
import { hashPassword } from "@/lib/auth/password";
import { AppError } from "@/lib/errors";
import { auditActor, siteIdOf } from "./site";

const NO_SITE = "users to manage";

/** The accounts of the administrator's own site. */
export async function listUsers({ actor }: { actor: Actor }) {
  return listUsersOfSite({ siteId: siteIdOf(actor, NO_SITE) });
}

/** A new account always joins the administrator's own site. */
export async function createUser({ actor, input }: { actor: Actor; input: { email: string; name: string; role: Role; password: string } }) {
  const siteId = siteIdOf(actor, NO_SITE);
  const { email, name, role, password } = input;
  // Addresses are unique across every site: an account elsewhere also blocks the address.
  if (await getUserByEmail({ email })) throw new AppError(409, `A user with the e-mail ${email} already exists.`, "email");
  const passwordHash = await hashPassword(password);
  return insertUser({
    values: { email: email.trim().toLowerCase(), name, role, passwordHash, siteId },
    audit: { ...auditActor(actor), siteId, action: "user.create", newValue: { email, name, role, siteId } },
  });
}

type UserChanges = { role?: Role; disabled?: boolean; name?: string; password?: string };

/** Changes an account of the administrator's own site; any other account is "not found". */
export async function updateUser({ actor, id, changes, reason }: { actor: Actor; id: string; changes: UserChanges; reason?: string }) {
  const siteId = siteIdOf(actor, NO_SITE);
  const before = await getUserOnSite({ siteId, id });
  if (!before) throw new AppError(404, "That user was not found.");
  if (before.id === actor.id && (changes.disabled === true || (changes.role && changes.role !== "admin"))) {
    throw new AppError(409, "You cannot disable yourself or remove your own administrator role.");
  }
  const values: Partial<User> = { updatedAt: new Date().toISOString() };
  if (changes.role) values.role = changes.role;
  if (changes.disabled !== undefined) values.disabled = changes.disabled;
  if (changes.name) values.name = changes.name;
  if (changes.password) {
    values.passwordHash = await hashPassword(changes.password);
    values.failedSigningAttempts = 0;
    values.signingLockedUntil = null;
  }
  const oldValue: Record<string, unknown> = {};
  const newValue: Record<string, unknown> = {};
  for (const key of ["role", "disabled", "name"] as const) {
    if (changes[key] !== undefined && changes[key] !== before[key]) {
      oldValue[key] = before[key];
      newValue[key] = changes[key];
    }
  }
  if (changes.password) newValue.password = "reset";
  const action = changes.password ? "user.password-reset" : "user.update";
  const updated = await updateUserOnSite({ siteId, id, values, audit: { ...auditActor(actor), siteId: before.siteId, action, oldValue, newValue, reason: reason ?? null } });
  if (!updated) throw new AppError(404, "That user was not found.");
}

import "server-only";
import type { Role, User } from "@/db/schema";
import { endSessionsAtSignOut, getUserByEmail, getUserById, getUserOnSite, insertUser, listUsersOfSite, unlockUserOnSite, updateUserOnSite, type Actor } from "@/db/queries/users";
import { hashPassword, oneTimePassword } from "@/lib/auth/password";
import { accountKey } from "@/lib/auth/sign-in-throttle";
import { AppError } from "@/lib/errors";
import { auditActor, getSiteContext, siteIdOf } from "./site";

const NO_SITE = "users to manage";

/** The accounts of the administrator's own site, with their lock and one-time-password state. */
export async function listUsers({ actor, now = new Date() }: { actor: Actor; now?: Date }) {
  const rows = await listUsersOfSite({ siteId: siteIdOf(actor, NO_SITE) });
  const nowIso = now.toISOString();
  return rows.map(({ signInLockedUntil, signingLockedUntil, ...row }) => ({
    ...row,
    signInLockedUntil: signInLockedUntil && signInLockedUntil > nowIso ? signInLockedUntil : null,
    signingLockedUntil: signingLockedUntil && signingLockedUntil > nowIso ? signingLockedUntil : null,
  }));
}

/** The users page: the accounts and the site's time zone their times are shown in. */
export async function getUsersPage({ actor }: { actor: Actor }) {
  const [rows, { timeZone }] = await Promise.all([listUsers({ actor }), getSiteContext({ actor })]);
  return { rows, timeZone };
}

/**
 * A new account always joins the administrator's own site, with a one-time password made here and shown once:
 * the person must choose their own at first sign-in before anything else.
 */
export async function createUser({ actor, input }: { actor: Actor; input: { email: string; name: string; role: Role } }) {
  const siteId = siteIdOf(actor, NO_SITE);
  const { email, name, role } = input;
  // Addresses are unique across every site: an account elsewhere also blocks the address.
  if (await getUserByEmail({ email })) throw new AppError(409, `A user with the e-mail ${email} already exists.`, "email");
  const password = oneTimePassword();
  const passwordHash = await hashPassword(password);
  const created = await insertUser({
    values: { email: email.trim().toLowerCase(), name, role, passwordHash, siteId, mustChangePassword: true },
    audit: { ...auditActor(actor), siteId, action: "user.create", newValue: { email, name, role, siteId, password: "one-time" } },
  });
  return { id: created.id, oneTimePassword: password };
}

type UserChanges = { role?: Role; disabled?: boolean; name?: string };

async function userOfSite(actor: Actor, id: string) {
  const siteId = siteIdOf(actor, NO_SITE);
  const user = await getUserOnSite({ siteId, id });
  if (!user) throw new AppError(404, "That user was not found.");
  return { siteId, user };
}

/**
 * Changes an account of the administrator's own site; any other account is "not found". A new role or disabling
 * ends the account's sessions, so the change holds from the next request on.
 */
export async function updateUser({ actor, id, changes, reason }: { actor: Actor; id: string; changes: UserChanges; reason?: string }) {
  const { siteId, user: before } = await userOfSite(actor, id);
  if (before.id === actor.id && (changes.disabled === true || (changes.role && changes.role !== "admin"))) {
    throw new AppError(409, "You cannot disable yourself or remove your own administrator role.");
  }
  const values: Partial<User> = { updatedAt: new Date().toISOString() };
  const oldValue: Record<string, unknown> = {};
  const newValue: Record<string, unknown> = {};
  for (const key of ["role", "disabled", "name"] as const) {
    if (changes[key] !== undefined && changes[key] !== before[key]) {
      Object.assign(values, { [key]: changes[key] });
      oldValue[key] = before[key];
      newValue[key] = changes[key];
    }
  }
  const endSessions = "role" in newValue || newValue.disabled === true;
  if (endSessions) newValue.sessions = "ended";
  const updated = await updateUserOnSite({
    siteId,
    id,
    values,
    endSessions,
    audit: { ...auditActor(actor), siteId: before.siteId, action: "user.update", oldValue, newValue, reason: reason ?? null },
  });
  if (!updated) throw new AppError(404, "That user was not found.");
}

/**
 * An administrator's password reset: a new one-time password, shown once; the account's sessions end, its signing
 * lockout clears, and the person must choose their own password at the next sign-in.
 */
export async function resetPassword({ actor, id, reason }: { actor: Actor; id: string; reason?: string }) {
  const { siteId, user } = await userOfSite(actor, id);
  const password = oneTimePassword();
  const values: Partial<User> = { passwordHash: await hashPassword(password), mustChangePassword: true, failedSigningAttempts: 0, signingLockedUntil: null, updatedAt: new Date().toISOString() };
  const audit = { ...auditActor(actor), siteId: user.siteId, action: "user.password-reset", newValue: { password: "one-time", sessions: "ended" }, reason: reason ?? null };
  if (!(await updateUserOnSite({ siteId, id, values, endSessions: true, audit }))) throw new AppError(404, "That user was not found.");
  return { oneTimePassword: password };
}

/** Lifts an account's sign-in lock and signing lock, with the administrator's reason in the ledger. */
export async function unlockUser({ actor, id, reason, now = new Date() }: { actor: Actor; id: string; reason: string; now?: Date }) {
  const { siteId, user } = await userOfSite(actor, id);
  const [locked] = (await listUsers({ actor, now })).filter((u) => u.id === id);
  const oldValue = { signInLockedUntil: locked?.signInLockedUntil ?? null, signingLockedUntil: locked?.signingLockedUntil ?? null };
  const audit = { ...auditActor(actor), siteId: user.siteId, action: "account.unlocked", oldValue, newValue: { signInLockedUntil: null, signingLockedUntil: null }, reason };
  if (!(await unlockUserOnSite({ siteId, id, throttleKey: accountKey(user.email), audit }))) throw new AppError(404, "That user was not found.");
}

/** Sign-out: every session of the account issued under `sessionVersion` ends (the ledger records it once). */
export async function endSessions({ userId, sessionVersion }: { userId: string; sessionVersion: number }) {
  const user = await getUserById({ id: userId });
  if (!user) return;
  await endSessionsAtSignOut({ id: user.id, sessionVersion, audit: { actorId: user.id, actorEmail: user.email, siteId: user.siteId, action: "auth.sign-out", newValue: { sessions: "ended" } } });
}

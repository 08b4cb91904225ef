import "server-only";
import { getUserById, listRecentPasswordHashes, setOwnPassword, type Actor } from "@/db/queries/users";
import { hashPassword, verifyPassword } from "@/lib/auth/password";
import { PASSWORD_HISTORY_DEPTH, passwordRuleProblem } from "@/lib/auth/password-rules";
import { AppError } from "@/lib/errors";

/**
 * A person chooses their own password (after a one-time password, or at any time): the current one proves who
 * they are, the password rules apply, and every session ends, this one included, so they sign in again with it.
 */
export async function changeOwnPassword({ actor, currentPassword, newPassword }: { actor: Actor; currentPassword: string; newPassword: string }) {
  const user = await getUserById({ id: actor.id });
  if (!user || user.disabled) throw new AppError(401, "Please sign in again.");
  if (!(await verifyPassword(user.passwordHash, currentPassword))) throw new AppError(422, "The current password is not correct.", "currentPassword");
  // The current password (perhaps a one-time one, no choice either) and the recent ones; the history's newest is the current one when chosen.
  const earlierHashes = [...new Set([user.passwordHash, ...(await listRecentPasswordHashes({ userId: user.id, limit: PASSWORD_HISTORY_DEPTH }))])];
  const problem = await passwordRuleProblem({ password: newPassword, email: user.email, earlierHashes: earlierHashes.slice(0, PASSWORD_HISTORY_DEPTH) });
  if (problem) throw new AppError(422, problem, "newPassword");
  const changed = await setOwnPassword({
    id: user.id,
    previousHash: user.passwordHash,
    passwordHash: await hashPassword(newPassword),
    keep: PASSWORD_HISTORY_DEPTH,
    audit: {
      actorId: user.id,
      actorEmail: user.email,
      siteId: user.siteId,
      action: "user.password-change",
      oldValue: { oneTimePassword: user.mustChangePassword },
      newValue: { password: "changed", sessions: "ended" },
    },
  });
  if (!changed) throw new AppError(409, "Your password was changed meanwhile (another session or an administrator); sign in again.");
}

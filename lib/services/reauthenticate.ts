import "server-only";
import { recordSigningFailure } from "@/db/queries/reviews";
import { getUserById, type Actor } from "@/db/queries/users";
import type { User } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { verifyPassword } from "@/lib/auth/password";

/** After this many wrong passwords in a row signing is locked for SIGNING_LOCK_MINUTES. */
const MAX_SIGNING_FAILURES = 5;
const SIGNING_LOCK_MINUTES = 15;

/** What the signature is for: the ledger row of a wrong password names it. */
export type ReauthenticateInput = { actor: Actor; password: string; now: Date; entity: { type: string; id: string } };

/**
 * Re-authentication at the moment of signing, with the lockout: a wrong password is counted and
 * audited; MAX_SIGNING_FAILURES in a row lock signing for SIGNING_LOCK_MINUTES.
 */
export async function reauthenticate({ actor, password, now, entity }: ReauthenticateInput): Promise<User> {
  const signer = await getUserById({ id: actor.id });
  if (!signer || signer.disabled) throw new AppError(401, "Please sign in again.");
  if (signer.signingLockedUntil && new Date(signer.signingLockedUntil) > now) {
    throw new AppError(
      423,
      `Signing is locked after ${MAX_SIGNING_FAILURES} wrong passwords; try again after ${new Date(signer.signingLockedUntil).toISOString().slice(11, 16)} UTC or ask an administrator to reset your password.`,
    );
  }
  if (await verifyPassword(signer.passwordHash, password)) return signer;
  const failures = signer.failedSigningAttempts + 1;
  const lockUntil = failures >= MAX_SIGNING_FAILURES ? new Date(now.getTime() + SIGNING_LOCK_MINUTES * 60_000).toISOString() : null;
  await recordSigningFailure({
    userId: signer.id,
    failures: lockUntil ? 0 : failures,
    lockedUntil: lockUntil,
    audit: {
      actorId: actor.id,
      actorEmail: actor.email,
      siteId: actor.siteId,
      action: lockUntil ? "signature.locked" : "signature.failed",
      entityType: entity.type,
      entityId: entity.id,
      reason: lockUntil ? `wrong password ${MAX_SIGNING_FAILURES} times; signing locked for ${SIGNING_LOCK_MINUTES} min` : "wrong password",
    },
  });
  if (lockUntil) throw new AppError(423, `Wrong password. Signing is now locked for ${SIGNING_LOCK_MINUTES} minutes.`, "password");
  throw new AppError(401, `The password is not correct; the signature was not applied (${MAX_SIGNING_FAILURES - failures} attempts left).`, "password");
}

import "server-only";
import { claimSigningAttempt, clearSigningFailures, getUserById, recordSigningFailure, type Actor } from "@/db/queries/users";
import type { User } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { verifyPassword } from "@/lib/auth/password";
import { CHOOSE_OWN_PASSWORD_FIRST } from "@/lib/auth/messages";
import { plural } from "@/lib/domain";

/** After this many wrong passwords in a row signing is locked for SIGNING_LOCK_MINUTES. */
const MAX_SIGNING_FAILURES = 5;
const SIGNING_LOCK_MINUTES = 15;

/** What the signature is for: the ledger row of a wrong password names it. */
export type ReauthenticateInput = { actor: Actor; password: string; now: Date; entity: { type: string; id: string } };

const lockedSentence = (until: string | null) =>
  `Signing is locked after ${plural(MAX_SIGNING_FAILURES, "wrong password")}; try again after ${until ? `${new Date(until).toISOString().slice(11, 16)} UTC` : "a few minutes"} or ask an administrator to unlock your account.`;

/**
 * Re-authentication at the moment of signing, with the lockout. Each attempt is claimed (counted as a failure)
 * in one statement before its password is checked, and refused when signing is locked, so parallel wrong
 * passwords cannot outrun the count: MAX_SIGNING_FAILURES in a row lock signing for SIGNING_LOCK_MINUTES.
 */
export async function reauthenticate({ actor, password, now, entity }: ReauthenticateInput): Promise<User> {
  const signer = await getUserById({ id: actor.id });
  if (!signer || signer.disabled) throw new AppError(401, "Please sign in again.");
  if (signer.mustChangePassword) throw new AppError(403, CHOOSE_OWN_PASSWORD_FIRST);
  const lockUntilIso = new Date(now.getTime() + SIGNING_LOCK_MINUTES * 60_000).toISOString();
  const claim = await claimSigningAttempt({ id: signer.id, nowIso: now.toISOString(), maxFailures: MAX_SIGNING_FAILURES, lockUntilIso });
  if (!claim) throw new AppError(423, lockedSentence((await getUserById({ id: signer.id }))?.signingLockedUntil ?? null));
  const lockedNow = claim.failures >= MAX_SIGNING_FAILURES;
  if (await verifyPassword(signer.passwordHash, password)) {
    await clearSigningFailures({ id: signer.id, lockSetByThisAttempt: lockedNow ? lockUntilIso : undefined });
    return signer;
  }
  await recordSigningFailure({
    id: signer.id,
    locked: lockedNow,
    audit: {
      actorId: actor.id,
      actorEmail: actor.email,
      siteId: actor.siteId,
      action: lockedNow ? "signature.locked" : "signature.failed",
      entityType: entity.type,
      entityId: entity.id,
      reason: lockedNow ? `wrong password ${MAX_SIGNING_FAILURES} times; signing locked for ${SIGNING_LOCK_MINUTES} min` : "wrong password",
    },
  });
  if (lockedNow) throw new AppError(423, `Wrong password. Signing is now locked for ${plural(SIGNING_LOCK_MINUTES, "minute")}.`, "password");
  throw new AppError(401, `The password is not correct; the signature was not applied (${plural(MAX_SIGNING_FAILURES - claim.failures, "attempt")} left).`, "password");
}

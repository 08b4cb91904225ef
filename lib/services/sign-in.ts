import "server-only";
import { randomUUID } from "node:crypto";
import { getUserByEmail, markSignedIn } from "@/db/queries/users";
import { recordAuditEvent } from "@/db/queries/audit";
import { getSiteById } from "@/db/queries/sites";
import { claimSignInAttempt, clearSignInBucket, deleteExpiredThrottleRows, getThrottleRows, lockSignInBucket, releaseSignInAttempt } from "@/db/queries/sign-in-throttle";
import type { User } from "@/db/schema";
import { hashPassword, verifyPassword } from "@/lib/auth/password";
import { accountKey, addressKey, clientAddress, DELAY_TABLE_FAILURES, delayAfterFailuresS, DIRECT, MAX_DELAY_S, throttleSettings } from "@/lib/auth/sign-in-throttle";
import { delayCode, lockedCode } from "@/lib/auth/messages";

// Checking a password that belongs to no account still costs one hash, so timing tells nothing.
let dummyHash: Promise<string> | undefined;
const timingDecoy = () => (dummyHash ??= hashPassword(randomUUID()));

export type SignInResult = { ok: true; user: User } | { ok: false; code: string };
type Bucket = { key: string; max: number; kind: "AccountLocked" | "AddressLocked" };

/**
 * A sign-in with e-mail and password, throttled per account and per client address: each attempt is claimed in
 * its bucket before the password is checked (progressive delay, then a lock for the configured time), a lock
 * refuses even the right password, and a lock of an existing account writes one `account.locked` ledger event.
 * Failed attempts write nothing else: an unknown e-mail grows only its own short-lived throttle row.
 */
export async function signInWithPassword(input: { email: string; password: string; headers?: Record<string, string | string[] | undefined>; now?: Date }): Promise<SignInResult> {
  const { password, now = new Date() } = input;
  const email = input.email.trim().toLowerCase();
  const settings = throttleSettings();
  const address = clientAddress(input.headers);
  // Without a trusted client address every request is "direct": one shared bucket would let anyone lock everybody out.
  const buckets: Bucket[] = [
    ...(address === DIRECT ? [] : [{ key: addressKey(address), max: settings.addressMaxFailures, kind: "AddressLocked" as const }]),
    { key: accountKey(email), max: settings.maxFailures, kind: "AccountLocked" },
  ];
  await deleteExpiredThrottleRows({ nowIso: now.toISOString(), staleBeforeIso: new Date(now.getTime() - settings.lockMs).toISOString() });
  const user = await getUserByEmail({ email });
  const timeZone = user?.siteId ? ((await getSiteById({ id: user.siteId }))?.timeZone ?? null) : null;

  const claimed: Array<Bucket & { failures: number }> = [];
  for (const bucket of buckets) {
    const failures = await claim(bucket, now);
    if (failures === null) {
      await Promise.all(claimed.map((c) => releaseSignInAttempt({ key: c.key })));
      return { ok: false, code: await refusal(bucket, now, timeZone) };
    }
    claimed.push({ ...bucket, failures });
  }

  const ok = await verifyPassword(user?.passwordHash ?? (await timingDecoy()), password);
  if (user && ok) {
    for (const c of claimed) await (c.kind === "AccountLocked" ? clearSignInBucket({ key: c.key }) : releaseSignInAttempt({ key: c.key }));
    if (user.disabled) {
      await recordAuditEvent({ ...who(user), action: "auth.sign-in-refused", entityType: "user", entityId: user.id, reason: "account disabled" });
      return { ok: false, code: "AccountDisabled" };
    }
    await markSignedIn({ id: user.id });
    await recordAuditEvent({ ...who(user), action: "auth.sign-in", entityType: "user", entityId: user.id });
    return { ok: true, user };
  }

  let lockCode: string | null = null;
  for (const c of claimed.filter((c) => c.failures >= c.max)) {
    const lockedUntilIso = new Date(now.getTime() + settings.lockMs).toISOString();
    const audit =
      c.kind === "AccountLocked" && user
        ? {
            ...who(user),
            action: "account.locked",
            entityType: "user",
            entityId: user.id,
            reason: `${c.failures} failed sign-ins in a row; locked until ${lockedUntilIso}`,
            newValue: { lockedUntil: lockedUntilIso, address },
          }
        : undefined;
    await lockSignInBucket({ key: c.key, lockedUntilIso, audit });
    lockCode = lockedCode(c.kind, lockedUntilIso, timeZone);
  }
  return { ok: false, code: lockCode ?? "CredentialsSignin" };
}

const who = (user: User) => ({ actorId: user.id, actorEmail: user.email, siteId: user.siteId });

function claim(bucket: Bucket, now: Date) {
  const latest = (failures: number) => new Date(now.getTime() - delayAfterFailuresS(failures) * 1000).toISOString();
  return claimSignInAttempt({
    key: bucket.key,
    nowIso: now.toISOString(),
    maxFailures: bucket.max,
    notAfterIso: DELAY_TABLE_FAILURES.map(latest),
    otherwiseNotAfterIso: new Date(now.getTime() - MAX_DELAY_S * 1000).toISOString(),
  });
}

/** Why a bucket refused the attempt: its lock, or the wait its failures ask for. */
async function refusal(bucket: Bucket, now: Date, timeZone: string | null): Promise<string> {
  const [row] = await getThrottleRows({ keys: [bucket.key] });
  if (row?.lockedUntil) return lockedCode(bucket.kind, row.lockedUntil, timeZone);
  if (!row || row.failures >= bucket.max) return lockedCode(bucket.kind, new Date(now.getTime() + throttleSettings().lockMs).toISOString(), timeZone);
  const waitS = delayAfterFailuresS(row.failures) - (now.getTime() - new Date(row.lastFailureAt).getTime()) / 1000;
  return delayCode(Math.max(1, waitS));
}

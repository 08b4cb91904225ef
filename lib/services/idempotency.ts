import "server-only";
import { claimIdempotencyKey, recordIdempotentAnswer, releaseIdempotencyKey } from "@/db/queries/idempotency";
import { AppError } from "@/lib/errors";
import type { Actor } from "./access";

const KEEP_MS = 24 * 60 * 60 * 1000;
// The answer is stored in the same transaction as the record, so a key still unanswered this long after its
// request began belongs to a request that died before committing anything: a retry may run afresh.
const ABANDONED_AFTER_MS = 15 * 60 * 1000;

export type Answer = { status: number; body: unknown };
export type IdempotentAnswer = Answer & { replayed: boolean };
type Executor = Parameters<typeof recordIdempotentAnswer>[0];
/** Stores the answer inside the caller's transaction. */
export type RecordAnswer = (tx: Executor, answer: Answer) => Promise<void>;

/**
 * Runs `act` once per (user, Idempotency-Key): a repeat with the same request hash gets the first answer back and
 * runs nothing; the same key with another request is refused with 422; a repeat while the first still runs, 409.
 * Only an answer that made a record is kept: a refusal frees the key, so a corrected retry runs again.
 */
export async function answerOnce(
  { actor, key, requestHash }: { actor: Actor; key: string | null; requestHash: string },
  act: (recordAnswer: RecordAnswer | undefined) => Promise<Answer>,
): Promise<IdempotentAnswer> {
  if (key === null) return { ...(await act(undefined)), replayed: false };
  const now = Date.now();
  const existing = await claimIdempotencyKey({
    userId: actor.id,
    key,
    requestHash,
    now: new Date(now).toISOString(),
    expiresAt: new Date(now + KEEP_MS).toISOString(),
    abandonedBefore: new Date(now - ABANDONED_AFTER_MS).toISOString(),
  });
  if (existing) {
    if (existing.requestHash !== requestHash) {
      throw new AppError(422, "This Idempotency-Key was already used for a different upload; send a new key for a new cycle.");
    }
    if (existing.responseStatus === null || existing.responseBody === null) {
      throw new AppError(409, "The first request with this Idempotency-Key is still being processed; retry with the same key in a moment to get its answer.");
    }
    return { status: existing.responseStatus, body: JSON.parse(existing.responseBody), replayed: true };
  }
  const keyOf = { userId: actor.id, key };
  let recorded = false;
  let answer: Answer;
  try {
    answer = await act(async (tx, given) => {
      await recordIdempotentAnswer(tx, { ...keyOf, status: given.status, body: JSON.stringify(given.body) });
      recorded = true;
    });
  } catch (error) {
    // Should the release fail too, the key is freed as abandoned later; the caller hears the first error.
    await releaseIdempotencyKey(keyOf).catch(() => undefined);
    throw error;
  }
  if (!recorded) await recordIdempotentAnswer(undefined, { ...keyOf, status: answer.status, body: JSON.stringify(answer.body) });
  return { ...answer, replayed: false };
}

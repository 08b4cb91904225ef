import "server-only";
import { and, eq, isNull, lt } from "drizzle-orm";
import { getDb, type Executor } from "@/db";
import { idempotencyKeys, type IdempotencyKey } from "@/db/schema";

type KeyOf = { userId: string; key: string };

/**
 * Claims (user, key) for a first request, in one transaction: expired keys are dropped, a key whose first request
 * died before answering (still unanswered at `abandonedBefore`) is freed, then the key is inserted unless it exists.
 * Returns the row already there when the key was not claimed.
 */
export async function claimIdempotencyKey(input: KeyOf & { requestHash: string; now: string; expiresAt: string; abandonedBefore: string }): Promise<IdempotencyKey | null> {
  const { userId, key } = input;
  const thisKey = and(eq(idempotencyKeys.userId, userId), eq(idempotencyKeys.key, key));
  return getDb().transaction(async (tx) => {
    await tx.delete(idempotencyKeys).where(lt(idempotencyKeys.expiresAt, input.now));
    await tx.delete(idempotencyKeys).where(and(thisKey, isNull(idempotencyKeys.responseStatus), lt(idempotencyKeys.createdAt, input.abandonedBefore)));
    const inserted = await tx
      .insert(idempotencyKeys)
      .values({ userId, key, requestHash: input.requestHash, createdAt: input.now, expiresAt: input.expiresAt })
      .onConflictDoNothing()
      .returning({ key: idempotencyKeys.key });
    if (inserted.length > 0) return null;
    const [row] = await tx.select().from(idempotencyKeys).where(thisKey);
    return row ?? null;
  });
}

/** Stores the first request's answer; given the transaction that made the record, both land or neither. */
export async function recordIdempotentAnswer(executor: Executor | undefined, input: KeyOf & { status: number; body: string }): Promise<void> {
  await (executor ?? getDb())
    .update(idempotencyKeys)
    .set({ responseStatus: input.status, responseBody: input.body })
    .where(and(eq(idempotencyKeys.userId, input.userId), eq(idempotencyKeys.key, input.key)));
}

/** Frees a claimed key whose request ended without an answer to keep (it was refused or failed, nothing was made). */
export async function releaseIdempotencyKey({ userId, key }: KeyOf): Promise<void> {
  await getDb()
    .delete(idempotencyKeys)
    .where(and(eq(idempotencyKeys.userId, userId), eq(idempotencyKeys.key, key), isNull(idempotencyKeys.responseStatus)));
}

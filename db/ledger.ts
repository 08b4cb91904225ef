import { count, desc } from "drizzle-orm";
import type { Executor } from "./index";
import { auditEvents, type AuditEvent } from "./schema";
import { canonicalJson, GENESIS_HASH, sha256Hex } from "@/lib/integrity";
import type { LedgerHead } from "@/lib/integrity/anchors";

export type AuditInput = {
  actorId?: string | null;
  actorEmail?: string | null;
  siteId?: string | null;
  action: string;
  entityType: string;
  entityId?: string | null;
  oldValue?: unknown;
  newValue?: unknown;
  reason?: string | null;
};

type HashedFields = Omit<AuditEvent, "seq" | "hash">;

export function auditEventHash(fields: HashedFields): string {
  return sha256Hex(canonicalJson(fields));
}

const asText = (v: unknown) => (v === undefined || v === null ? null : typeof v === "string" ? v : canonicalJson(v));

/** Appends one event to the hash chain. Call inside the transaction that makes the change. */
export async function appendAuditEvent(tx: Executor, input: AuditInput): Promise<void> {
  const [last] = await tx.select({ hash: auditEvents.hash }).from(auditEvents).orderBy(desc(auditEvents.seq)).limit(1);
  const fields: HashedFields = {
    at: new Date().toISOString(),
    actorId: input.actorId ?? null,
    actorEmail: input.actorEmail ?? null,
    siteId: input.siteId ?? null,
    action: input.action,
    entityType: input.entityType,
    entityId: input.entityId ?? null,
    oldValue: asText(input.oldValue),
    newValue: asText(input.newValue),
    reason: input.reason ?? null,
    prevHash: last?.hash ?? GENESIS_HASH,
  };
  await tx.insert(auditEvents).values({ ...fields, hash: auditEventHash(fields) });
}

/**
 * The head of the chain: how many events, the newest one's seq and hash. Inside a transaction it
 * is the head that transaction sees (both reads in one snapshot).
 */
export async function readLedgerHead(tx: Executor): Promise<LedgerHead> {
  const [last] = await tx.select({ seq: auditEvents.seq, hash: auditEvents.hash }).from(auditEvents).orderBy(desc(auditEvents.seq)).limit(1);
  const [{ events }] = await tx.select({ events: count() }).from(auditEvents);
  return { events, lastSeq: last?.seq ?? 0, lastHash: last?.hash ?? GENESIS_HASH };
}

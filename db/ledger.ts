import { desc, sql } from "drizzle-orm";
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

/** The head of the chain: how many events, the newest one's seq and hash, in one statement (one snapshot). */
export async function readLedgerHead(tx: Executor): Promise<LedgerHead> {
  const [row] = await tx
    .select({
      events: sql<number>`(select count(*) from ${auditEvents})`,
      lastSeq: sql<number | null>`(select max(${auditEvents.seq}) from ${auditEvents})`,
      lastHash: sql<string | null>`(select ${auditEvents.hash} from ${auditEvents} order by ${auditEvents.seq} desc limit 1)`,
    })
    .from(sql`(select 1)`);
  return { events: Number(row.events), lastSeq: Number(row.lastSeq ?? 0), lastHash: row.lastHash ?? GENESIS_HASH };
}

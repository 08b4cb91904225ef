import "server-only";
import { and, desc, eq, gt, isNull } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { getDb } from "@/db";
import { apiTokens, users, type NewApiToken } from "@/db/schema";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";

type Audit = Omit<AuditInput, "entityType" | "entityId">;
const issuer = alias(users, "issuer");
const revoker = alias(users, "revoker");

/** A new token (its hash only) with its ledger event, in one transaction. */
export async function insertApiToken({ values, audit }: { values: NewApiToken; audit: (id: string) => Audit }) {
  return getDb().transaction(async (tx) => {
    const [created] = await tx.insert(apiTokens).values(values).returning({ id: apiTokens.id });
    await appendAuditEvent(tx, { ...audit(created.id), entityType: "api-token", entityId: created.id });
    return created;
  });
}

/** The site's tokens, newest first, with who issued and who revoked each; never the hash. */
export async function listApiTokensOfSite({ siteId }: { siteId: string }) {
  return getDb()
    .select({
      id: apiTokens.id,
      name: apiTokens.name,
      prefix: apiTokens.prefix,
      scope: apiTokens.scope,
      sterilizerIds: apiTokens.sterilizerIds,
      expiresAt: apiTokens.expiresAt,
      createdAt: apiTokens.createdAt,
      lastUsedAt: apiTokens.lastUsedAt,
      revokedAt: apiTokens.revokedAt,
      issuedBy: issuer.name,
      revokedBy: revoker.name,
    })
    .from(apiTokens)
    .innerJoin(issuer, eq(issuer.id, apiTokens.createdBy))
    .leftJoin(revoker, eq(revoker.id, apiTokens.revokedBy))
    .where(eq(apiTokens.siteId, siteId))
    .orderBy(desc(apiTokens.createdAt));
}

export async function getApiTokenOnSite({ siteId, id }: { siteId: string; id: string }) {
  const [row] = await getDb()
    .select()
    .from(apiTokens)
    .where(and(eq(apiTokens.id, id), eq(apiTokens.siteId, siteId)))
    .limit(1);
  return row;
}

/** A presented token by its hash, with the account that issued it (re-read, so a disabled issuer counts at once). */
export async function getApiTokenByHash({ tokenHash }: { tokenHash: string }) {
  const [row] = await getDb()
    .select({ token: apiTokens, issuer: { id: issuer.id, email: issuer.email, name: issuer.name, role: issuer.role, siteId: issuer.siteId, disabled: issuer.disabled } })
    .from(apiTokens)
    .innerJoin(issuer, eq(issuer.id, apiTokens.createdBy))
    .where(eq(apiTokens.tokenHash, tokenHash))
    .limit(1);
  return row;
}

/** Revokes a live token of the site; false when there is none (another site's, or revoked already). */
export async function revokeApiTokenOnSite({ siteId, id, revokedBy, audit }: { siteId: string; id: string; revokedBy: string; audit: Audit }) {
  return getDb().transaction(async (tx) => {
    const at = new Date().toISOString();
    const changed = await tx
      .update(apiTokens)
      .set({ revokedAt: at, revokedBy })
      .where(and(eq(apiTokens.id, id), eq(apiTokens.siteId, siteId), isNull(apiTokens.revokedAt)))
      .returning({ id: apiTokens.id });
    if (changed.length === 0) return false;
    await appendAuditEvent(tx, { ...audit, entityType: "api-token", entityId: id });
    return true;
  });
}

/**
 * One use of a token: its last use and a ledger event, only while it is still live at `at` (the WHERE re-checks
 * revocation and expiry, so a token revoked a moment ago is refused); false when it no longer is.
 */
export async function recordApiTokenUse({ id, at, audit }: { id: string; at: string; audit: Audit }) {
  return getDb().transaction(async (tx) => {
    const changed = await tx
      .update(apiTokens)
      .set({ lastUsedAt: at })
      .where(and(eq(apiTokens.id, id), isNull(apiTokens.revokedAt), gt(apiTokens.expiresAt, at)))
      .returning({ id: apiTokens.id });
    if (changed.length === 0) return false;
    await appendAuditEvent(tx, { ...audit, entityType: "api-token", entityId: id });
    return true;
  });
}

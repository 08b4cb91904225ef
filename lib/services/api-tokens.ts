import "server-only";
import { randomBytes } from "node:crypto";
import type { Actor } from "@/db/queries/users";
import { getApiTokenByHash, getApiTokenOnSite, insertApiToken, listApiTokensOfSite, recordApiTokenUse, revokeApiTokenOnSite } from "@/db/queries/api-tokens";
import { listSterilizersOfSite } from "@/db/queries/sterilizers";
import { can, type Permission } from "@/lib/auth/permissions";
import { API_TOKEN_MARKER, API_TOKEN_MAX_DAYS, API_TOKEN_PATTERN, API_TOKEN_ROLE, API_TOKEN_SHOWN_CHARS, apiTokenOf, type ApiTokenRoute, type GatewayActor } from "@/lib/domain";
import { AppError } from "@/lib/errors";
import { formatDateTime } from "@/lib/format";
import { sha256Hex } from "@/lib/integrity";
import { assertAllowed } from "./access";
import { auditActor, getSiteContext, siteIdOf } from "./site";

const DAY_MS = 86_400_000;
const NO_SITE = "API tokens to manage";
const ASK_AGAIN = "ask an engineer of your site for a new one.";

export type ApiTokenState = "active" | "expired" | "revoked";

/** The token page: the site's tokens (never their hashes) and the sterilizers a new one may be limited to. */
export async function listApiTokens({ actor, now = new Date() }: { actor: Actor; now?: Date }) {
  assertAllowed(actor, "api-token:manage", "manage API tokens");
  const siteId = siteIdOf(actor, NO_SITE);
  const [rows, sterilizerRows, { timeZone }] = await Promise.all([listApiTokensOfSite({ siteId }), listSterilizersOfSite({ siteId }), getSiteContext({ actor, now })]);
  const sterilizers = sterilizerRows.map(({ sterilizer: s }) => ({ id: s.id, name: s.name, serialNumber: s.serialNumber, active: s.active }));
  const nameOf = new Map(sterilizers.map((s) => [s.id, s.name]));
  const tokens = rows.map((row) => ({
    ...row,
    state: (row.revokedAt ? "revoked" : row.expiresAt <= now.toISOString() ? "expired" : "active") as ApiTokenState,
    sterilizerNames: row.sterilizerIds ? row.sterilizerIds.map((id) => nameOf.get(id) ?? "a removed sterilizer") : null,
  }));
  return { tokens, sterilizers, timeZone };
}

export type IssueApiTokenInput = { name: string; expiresInDays: number; sterilizerIds: string[] };

/** A new token for the actor's site. The token itself is returned this once; only its SHA-256 is stored. */
export async function issueApiToken({ actor, input, now = new Date() }: { actor: Actor; input: IssueApiTokenInput; now?: Date }) {
  assertAllowed(actor, "api-token:manage", "issue API tokens");
  const siteId = siteIdOf(actor, NO_SITE);
  if (!Number.isInteger(input.expiresInDays) || input.expiresInDays < 1 || input.expiresInDays > API_TOKEN_MAX_DAYS) {
    throw new AppError(422, `A token lives from 1 to ${API_TOKEN_MAX_DAYS} days (one year at most).`, "expiresInDays");
  }
  const siteSterilizers = new Map((await listSterilizersOfSite({ siteId })).map(({ sterilizer: s }) => [s.id, s.name]));
  const unknown = input.sterilizerIds.find((id) => !siteSterilizers.has(id));
  if (unknown) throw new AppError(404, "One of the chosen sterilizers was not found on your site.", "sterilizerIds");
  const sterilizerIds = input.sterilizerIds.length > 0 ? [...new Set(input.sterilizerIds)] : null;
  const token = API_TOKEN_MARKER + randomBytes(32).toString("base64url");
  const prefix = token.slice(0, API_TOKEN_SHOWN_CHARS);
  const expiresAt = new Date(now.getTime() + input.expiresInDays * DAY_MS).toISOString();
  const created = await insertApiToken({
    values: { siteId, name: input.name, prefix, tokenHash: sha256Hex(token), scope: "gateway", sterilizerIds, expiresAt, createdBy: actor.id },
    audit: () => ({
      ...auditActor(actor),
      siteId,
      action: "api-token.issue",
      newValue: { name: input.name, prefix, scope: "gateway", expiresAt, sterilizers: sterilizerIds?.map((id) => siteSterilizers.get(id)) ?? "all of the site" },
    }),
  });
  return { id: created.id, token, prefix, expiresAt };
}

/** Revokes a token of the actor's site at once; another site's token is "not found". */
export async function revokeApiToken({ actor, id, reason }: { actor: Actor; id: string; reason: string }) {
  assertAllowed(actor, "api-token:manage", "revoke API tokens");
  const siteId = siteIdOf(actor, NO_SITE);
  const before = await getApiTokenOnSite({ siteId, id });
  if (!before) throw new AppError(404, "That API token was not found on your site.");
  if (before.revokedAt) throw new AppError(409, `The API token "${before.name}" was already revoked on ${formatDateTime(before.revokedAt)}.`);
  const revoked = await revokeApiTokenOnSite({
    siteId,
    id,
    revokedBy: actor.id,
    audit: { ...auditActor(actor), siteId, action: "api-token.revoke", oldValue: { name: before.name, prefix: before.prefix, revokedAt: null }, newValue: { revoked: true }, reason },
  });
  if (!revoked) throw new AppError(409, `The API token "${before.name}" was revoked a moment ago by someone else.`);
}

/**
 * The gateway actor behind a presented token, for one of the token routes: its site, a technician's rights there, its
 * issuer as the accountable person, limited to its sterilizers. Each accepted use is written to the ledger with the
 * route. Unknown, revoked or expired tokens, and tokens whose issuer may no longer issue them, are refused with 401.
 */
export async function actorForApiToken({
  token,
  route,
  permission,
  what,
  now = new Date(),
}: {
  token: string;
  route: ApiTokenRoute;
  permission: Permission;
  what: string;
  now?: Date;
}): Promise<GatewayActor> {
  if (!API_TOKEN_PATTERN.test(token)) throw new AppError(401, `The Authorization header does not hold a Papin API token (Bearer ${API_TOKEN_MARKER}…).`);
  const found = await getApiTokenByHash({ tokenHash: sha256Hex(token) });
  if (!found) throw new AppError(401, `This API token is not known to Papin; check that it was copied whole, or ${ASK_AGAIN}`);
  const { token: row, issuer } = found;
  if (row.revokedAt) throw new AppError(401, `This API token ("${row.name}") was revoked on ${formatDateTime(row.revokedAt)} UTC; ${ASK_AGAIN}`);
  const at = now.toISOString();
  if (row.expiresAt <= at) throw new AppError(401, `This API token ("${row.name}") expired on ${formatDateTime(row.expiresAt)} UTC; ${ASK_AGAIN}`);
  if (issuer.disabled || issuer.siteId !== row.siteId || !can(issuer.role, "api-token:manage")) {
    throw new AppError(401, `The account that issued this API token ("${row.name}") may no longer issue tokens for its site, so the token no longer works; ${ASK_AGAIN}`);
  }
  const used = await recordApiTokenUse({
    id: row.id,
    at,
    audit: { actorId: issuer.id, actorEmail: issuer.email, siteId: row.siteId, action: "api-token.used", newValue: { route, name: row.name, prefix: row.prefix } },
  });
  if (!used) throw new AppError(401, `This API token ("${row.name}") was revoked or expired a moment ago; ${ASK_AGAIN}`);
  if (!can(API_TOKEN_ROLE, permission)) throw new AppError(403, `An API token does not allow you to ${what}.`);
  return {
    id: issuer.id,
    email: issuer.email,
    name: issuer.name,
    role: API_TOKEN_ROLE,
    siteId: row.siteId,
    apiToken: { id: row.id, name: row.name, prefix: row.prefix, sterilizerIds: row.sterilizerIds ?? null },
  };
}

/** A token limited to some sterilizers uploads only for them (403 for any other). */
export function assertTokenCoversSterilizer(actor: Actor, sterilizerId: string): void {
  const grant = apiTokenOf(actor);
  if (grant?.sterilizerIds && !grant.sterilizerIds.includes(sterilizerId)) {
    throw new AppError(403, `The API token "${grant.name}" may register cycles only for the sterilizers it was issued for; this sterilizer is not one of them.`, "sterilizerId");
  }
}

/** What a token limited to some sterilizers sees of a list: only those; a person sees all of it. */
export function onlyTokenSterilizers<T extends { id: string }>(actor: Actor, rows: T[]): T[] {
  const ids = apiTokenOf(actor)?.sterilizerIds;
  return ids ? rows.filter((row) => ids.includes(row.id)) : rows;
}

/** For the cycle's ledger event: the token it came through, if any. */
export function viaApiToken(actor: Actor): { apiToken?: { id: string; name: string; prefix: string } } {
  const grant = apiTokenOf(actor);
  return grant ? { apiToken: { id: grant.id, name: grant.name, prefix: grant.prefix } } : {};
}

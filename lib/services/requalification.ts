import "server-only";
import type { Actor } from "@/db/queries/users";
import { getPatternOnSite, listPatternRequalification, writePatternRequiredBeforeUse } from "@/db/queries/requalification";
import { can } from "@/lib/auth/permissions";
import { blockedPatternNotice, isPatternBlocked, requalificationStateOf, type RequalificationState } from "@/lib/domain/requalification";
import { AppError } from "@/lib/errors";
import { assertAllowed } from "./access";
import { auditActor, getSiteContext, siteIdOf } from "./site";

export type PatternRequalification = {
  id: string;
  name: string;
  loadType: string | null;
  sterilizerId: string;
  sterilizerName: string;
  dueOn: string | null;
  state: RequalificationState;
  requiredBeforeUse: boolean;
  /** the sentence the status board shows when this pattern's load may not be run; null when it may */
  blockedNotice: string | null;
  study: { id: string; studyNumber: string } | null;
};

const STATE_ORDER: Record<RequalificationState, number> = { overdue: 0, never: 1, "due-soon": 2, ok: 3 };

/**
 * The loading patterns of the actor's site (or of one sterilizer) with their requalification state on the site's
 * calendar today: overdue first. Roles without study:read (admin) get none.
 */
export async function getRequalificationOverview({ actor, sterilizerId, now = new Date() }: { actor: Actor; sterilizerId?: string; now?: Date }) {
  const { timeZone, today } = await getSiteContext({ actor, now });
  if (!actor.siteId || !can(actor.role, "study:read")) return { timeZone, today, patterns: [] as PatternRequalification[] };
  const rows = await listPatternRequalification({ siteId: actor.siteId, sterilizerId });
  const patterns = rows.map((r): PatternRequalification => {
    const state = requalificationStateOf(r.dueOn, today);
    return {
      id: r.id,
      name: r.name,
      loadType: r.loadType,
      sterilizerId: r.sterilizerId,
      sterilizerName: r.sterilizerName,
      dueOn: r.dueOn,
      state,
      requiredBeforeUse: r.requiredBeforeUse,
      blockedNotice: isPatternBlocked(state, r.requiredBeforeUse) ? blockedPatternNotice(r.loadType, r.name, state) : null,
      study: r.studyId && r.studyNumber ? { id: r.studyId, studyNumber: r.studyNumber } : null,
    };
  });
  patterns.sort((a, b) => STATE_ORDER[a.state] - STATE_ORDER[b.state] || (a.dueOn ?? "").localeCompare(b.dueOn ?? "") || a.name.localeCompare(b.name));
  return { timeZone, today, patterns };
}

/**
 * An engineer's decision that a pattern's load must not be run while its requalification is overdue (or before it was
 * ever qualified). A reason is required; the ledger keeps old → new.
 */
export async function setPatternRequiredBeforeUse({
  actor,
  patternId,
  requiredBeforeUse,
  reason,
  now = new Date(),
}: {
  actor: Actor;
  patternId: string;
  requiredBeforeUse: boolean;
  reason: string;
  now?: Date;
}) {
  const siteId = siteIdOf(actor, "loading patterns");
  const pattern = await getPatternOnSite({ siteId, id: patternId });
  if (!pattern) throw new AppError(404, "That loading pattern was not found on your site.");
  assertAllowed(actor, "study:plan", "decide whether a loading pattern must be requalified before use");
  const trimmed = reason.trim();
  if (trimmed.length < 3) throw new AppError(422, "Give the reason for this decision; it goes into the audit ledger.", "reason");
  if (pattern.requiredBeforeUse === requiredBeforeUse) return { changed: false, name: pattern.name };
  await writePatternRequiredBeforeUse({
    siteId,
    id: pattern.id,
    requiredBeforeUse,
    at: now.toISOString(),
    audit: {
      ...auditActor(actor),
      action: "loading-pattern.required-before-use",
      oldValue: { requiredBeforeUse: pattern.requiredBeforeUse },
      newValue: { requiredBeforeUse },
      reason: trimmed,
    },
  });
  return { changed: true, name: pattern.name };
}

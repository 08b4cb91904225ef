import "server-only";
import type { Actor } from "@/db/queries/users";
import { listInstrumentsForSite, listProfilesForSite, listSterilizersForSite } from "@/db/queries/catalog";
import { currentSterilizerStatuses, type SterilizerStatusView } from "./sterilizer-status";
import { onlyTokenSterilizers } from "./api-tokens";

// What a cycle can be registered against: the in-use sterilizers, profiles and instruments of
// the actor's own site (an account without a site gets none).

/** The site's active sterilizers, each with its status as of now (`status`, `statusReason`, `statusSince`). */
export async function listSterilizerCatalog({ actor }: { actor: Actor }) {
  const [rows, statuses] = await Promise.all([
    listSterilizersForSite({ actor }),
    actor.siteId ? currentSterilizerStatuses({ siteId: actor.siteId }) : Promise.resolve(new Map<string, SterilizerStatusView>()),
  ]);
  return onlyTokenSterilizers(actor, rows).map((row) => {
    // A sterilizer added between the two reads has not been judged yet: not shown as usable (fail closed).
    const s: Omit<SterilizerStatusView, "id" | "name"> = statuses.get(row.id) ?? {
      status: "out-of-use",
      statusReason: "Its status has not been worked out yet; reload the page.",
      statusSince: new Date().toISOString(),
    };
    return { ...row, status: s.status, statusReason: s.statusReason, statusSince: s.statusSince };
  });
}
export const listProfileCatalog = ({ actor }: { actor: Actor }) => listProfilesForSite({ actor });
export const listInstrumentCatalog = ({ actor }: { actor: Actor }) => listInstrumentsForSite({ actor });

import "server-only";
import type { Actor } from "@/db/queries/users";
import { listInstrumentsForSite, listProfilesForSite, listSterilizersForSite } from "@/db/queries/catalog";
import { onlyTokenSterilizers } from "./api-tokens";

// What a cycle can be registered against: the in-use sterilizers, profiles and instruments of
// the actor's own site (an account without a site gets none).

export const listSterilizerCatalog = async ({ actor }: { actor: Actor }) => onlyTokenSterilizers(actor, await listSterilizersForSite({ actor }));
export const listProfileCatalog = ({ actor }: { actor: Actor }) => listProfilesForSite({ actor });
export const listInstrumentCatalog = ({ actor }: { actor: Actor }) => listInstrumentsForSite({ actor });

import "server-only";
import { cache } from "react";
import { orNotFound, requirePageActor } from "@/lib/auth/page-guard";
import { findCycle } from "@/lib/services/cycles";

/**
 * The record's guard, once per request. The segment's layout awaits it before the loading
 * skeleton can stream, so a refused role, an unknown id or another site's cycle answers a real
 * 403/404; the page reuses the result and loads the (slower) record behind the skeleton.
 */
export const guardCycleRecord = cache(async (id: string) => {
  const actor = await requirePageActor("cycle:read");
  await orNotFound(findCycle({ actor, id }));
  return actor;
});

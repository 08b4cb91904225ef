import "server-only";
import { cache } from "react";
import { orNotFound, requirePageActor } from "@/lib/auth/page-guard";
import { getCycleRecord } from "@/lib/services/cycles";

/**
 * The guard and the record, once per request: the segment's layout awaits it before the loading
 * skeleton can stream, so an unknown id, another site's cycle or a refused role answers a real
 * 404/403; the page then reads the same result without a second query.
 */
export const loadCycleRecord = cache(async (id: string) => {
  const actor = await requirePageActor("cycle:read");
  const record = await orNotFound(getCycleRecord({ actor, id }));
  return { actor, ...record };
});

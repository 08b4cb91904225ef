import "server-only";
import type { Actor } from "@/db/queries/users";
import { listArchivedReports } from "@/db/queries/reviews";
import { can } from "@/lib/auth/permissions";
import { getSiteContext } from "./site";

/**
 * The archive page: the site's signed reports when the actor may browse them (every role may
 * check a report file against the archive, which the page offers beside the list).
 */
export async function getArchivePage({ actor, q, from, to }: { actor: Actor; q?: string; from?: string; to?: string }) {
  const mayList = can(actor.role, "archive:read");
  const [rows, { timeZone }] = await Promise.all([mayList ? listArchivedReports({ actor, q, from, to }) : Promise.resolve([]), getSiteContext({ actor })]);
  return { rows, timeZone, mayList };
}

import "server-only";
import type { Actor } from "@/db/queries/users";
import { countArchivedReports, listArchivedReports } from "@/db/queries/reviews";
import { listStudyReports } from "@/db/queries/study-reports";
import { can } from "@/lib/auth/permissions";
import { cachedTotal } from "./list-totals";
import { getSiteContext } from "./site";

export const ARCHIVE_PAGE_SIZE = 50;

/**
 * The archive page: one page of the site's signed reports (newest first) and how many match, when the actor may
 * browse them (every role may check a report file against the archive, which the page offers beside the list).
 */
export async function getArchivePage({ actor, q, from, to, page = 1 }: { actor: Actor; q?: string; from?: string; to?: string; page?: number }) {
  const mayList = can(actor.role, "archive:read");
  const filter = { q: q?.trim() || undefined, from, to };
  const [rows, total, { timeZone }, studyReports] = await Promise.all([
    mayList ? listArchivedReports({ actor, ...filter, page, pageSize: ARCHIVE_PAGE_SIZE }) : Promise.resolve([]),
    mayList ? cachedTotal({ list: "archive", siteId: actor.siteId ?? "", filter, count: () => countArchivedReports({ actor, ...filter }) }) : Promise.resolve(0),
    getSiteContext({ actor }),
    // Qualification studies' reports, listed apart: a study has one, so the list stays short and is not filtered.
    mayList ? listStudyReports({ actor }) : Promise.resolve([]),
  ]);
  return { rows, total, page, pageSize: ARCHIVE_PAGE_SIZE, timeZone, mayList, studyReports };
}

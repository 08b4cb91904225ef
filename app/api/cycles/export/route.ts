import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { route, zodMessage } from "@/lib/http";
import { toCsv, type CsvCell } from "@/lib/csv-export";
import { cycleListQuerySchema, queryObject } from "@/lib/validations/cycles";
import { listCycles } from "@/db/queries/cycles";
import { recordAuditEvent } from "@/db/queries/audit";
import type { CycleListItem } from "@/lib/cycles/contracts";
import { testKindLabel } from "@/lib/domain";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

// Big enough for years of a unit's cycles; beyond it, narrow the filters.
const MAX_ROWS = 50_000;
const PAGE = 1000;

const HEADER = ["Cycle number", "Started (UTC)", "Registered (UTC)", "Sterilizer", "Acceptance profile", "Kind of test", "Load", "Status", "Verdict", "Registered by", "Record ID"];

function row(c: CycleListItem): CsvCell[] {
  return [
    c.cycleNumber,
    c.startedAt,
    c.createdAt,
    c.sterilizer.name,
    c.profile.name,
    testKindLabel(c.testKind),
    c.loadDescription,
    c.status,
    c.verdict ?? "not analysed",
    c.createdByName,
    c.id,
  ];
}

/** GET /api/cycles/export?<the list's filters>: the filtered cycles as CSV, safe to open in a spreadsheet. */
export const GET = route(async (request) => {
  const actor = await requireRole("cycle:read", "export cycles");
  const parsed = cycleListQuerySchema.safeParse(queryObject(request.url));
  if (!parsed.success) throw new AppError(400, zodMessage(parsed.error));
  const { page: _page, pageSize: _pageSize, ...filter } = parsed.data;

  const items: CycleListItem[] = [];
  let total = 0;
  for (let page = 1; ; page++) {
    const batch = await listCycles({ actor, filter: { ...filter, page, pageSize: PAGE } });
    total = batch.total;
    if (total > MAX_ROWS) {
      throw new AppError(413, `These filters match ${total.toLocaleString("en-GB")} cycles; an export holds at most ${MAX_ROWS.toLocaleString("en-GB")}. Narrow the dates or other filters.`);
    }
    items.push(...batch.items);
    if (batch.items.length < PAGE || items.length >= total) break;
  }

  await recordAuditEvent({
    actorId: actor.id,
    actorEmail: actor.email,
    siteId: actor.siteId,
    action: "cycles.export",
    entityType: "cycle",
    entityId: null,
    newValue: { filter, rows: items.length, format: "csv" },
  });

  const stamp = new Date().toISOString().slice(0, 10);
  return new Response(toCsv(HEADER, items.map(row)), {
    status: 200,
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="papin-cycles-${stamp}.csv"`,
      "cache-control": "no-store",
      "x-content-type-options": "nosniff",
    },
  });
});

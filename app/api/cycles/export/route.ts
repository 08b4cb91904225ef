import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { downloadDisposition, route, zodMessage } from "@/lib/http";
import { cycleListQuerySchema, queryObject } from "@/lib/validations/cycles";
import { exportCyclesCsv } from "@/lib/services/cycles";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** GET /api/cycles/export?<the list's filters>: the filtered cycles as CSV, safe to open in a spreadsheet. */
export const GET = route(async (request) => {
  const actor = await requireRole("cycle:read", "export cycles");
  const parsed = cycleListQuerySchema.safeParse(queryObject(request.url));
  if (!parsed.success) throw new AppError(400, zodMessage(parsed.error));
  const { csv, fileName } = await exportCyclesCsv({ actor, query: parsed.data });
  return new Response(csv, {
    status: 200,
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": downloadDisposition(fileName),
      "cache-control": "no-store",
      "x-content-type-options": "nosniff",
    },
  });
});

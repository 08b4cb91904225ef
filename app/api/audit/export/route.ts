import { downloadDisposition, route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { exportAuditCsv } from "@/lib/services/audit-export";
import { auditTrailQuerySchema } from "@/lib/services/audit-trail";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** The filtered audit trail of the actor's site as CSV, streamed. */
export const GET = route(async (request) => {
  const query = auditTrailQuerySchema.parse(Object.fromEntries(new URL(request.url).searchParams));
  const actor = await requireRole("audit:read", "export the audit trail");
  const csv = await exportAuditCsv({ actor, query });
  return new Response(csv.stream, {
    headers: { "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": downloadDisposition(csv.fileName), "Cache-Control": "private, no-store", "X-Papin-Events": String(csv.events) },
  });
});

import { pdfResponse, route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { exportAuditPdf } from "@/lib/services/audit-export";
import { auditTrailQuerySchema } from "@/lib/services/audit-trail";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** The filtered audit trail of the actor's site as a PDF extract whose SHA-256 is written to the ledger. */
export const GET = route(async (request) => {
  const query = auditTrailQuerySchema.parse(Object.fromEntries(new URL(request.url).searchParams));
  const actor = await requireRole("audit:read", "export the audit trail");
  const pdf = await exportAuditPdf({ actor, query });
  return pdfResponse(pdf.bytes, pdf.fileName, { headers: { "X-Papin-Sha256": pdf.sha256 } });
});

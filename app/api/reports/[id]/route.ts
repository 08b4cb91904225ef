import { pdfResponse, route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { downloadArchivedReport } from "@/lib/services/reports";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Context = { params: Promise<{ id: string }> };

export const GET = route<Context>(async (_request, { params }) => {
  const actor = await requireRole("archive:read", "download archived reports");
  const { id } = await params;
  const report = await downloadArchivedReport({ actor, id });
  return pdfResponse(report.bytes, report.fileName);
});

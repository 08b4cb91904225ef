import { pdfResponse, route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { getCycleReport } from "@/lib/services/reports";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Context = { params: Promise<{ id: string }> };

export const GET = route<Context>(async (_request, { params }) => {
  const actor = await requireRole("report:read", "open reports");
  const { id } = await params;
  const report = await getCycleReport({ actor, id });
  return pdfResponse(report.bytes, report.fileName, { inline: true, headers: { "X-Papin-Report": report.archived ? "archived" : "draft" } });
});

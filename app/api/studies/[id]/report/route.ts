import { pdfResponse, route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { getStudyReport } from "@/lib/services/study-report";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Context = { params: Promise<{ id: string }> };

/** The study's report: the copy archived at QA approval, or a draft marked NOT APPROVED (X-Papin-Report says which). */
export const GET = route<Context>(async (_request, { params }) => {
  const actor = await requireRole("study:read", "open qualification study reports");
  const { id } = await params;
  const report = await getStudyReport({ actor, id });
  return pdfResponse(report.bytes, report.fileName, { inline: true, headers: { "X-Papin-Report": report.archived ? "archived" : "draft" } });
});

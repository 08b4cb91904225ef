import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { notFound } from "@/lib/errors";
import { getArchivedReport } from "@/db/queries/reviews";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Context = { params: Promise<{ id: string }> };

export const GET = route<Context>(async (_request, { params }) => {
  const actor = await requireRole("archive:read", "download archived reports");
  const { id } = await params;
  const report = await getArchivedReport({ actor, id });
  if (!report) throw notFound("That archived report");
  return new Response(new Uint8Array(report.bytes) as BodyInit, {
    headers: { "Content-Type": "application/pdf", "Content-Disposition": `attachment; filename="${report.reportNumber}.pdf"`, "Cache-Control": "private, no-store" },
  });
});

import { downloadDisposition, route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { getAttachmentForViewing } from "@/lib/services/bowie-dick";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Context = { params: Promise<{ id: string }> };

/** A stored photo (JPEG or PNG, checked by its content on upload), shown inline on the record it belongs to; never sniffed as anything else. */
export const GET = route<Context>(async (_request, { params }) => {
  // cycle and equipment records are read by the same roles; the service checks the owner's own permission again.
  const actor = await requireRole("equipment:read", "see records' attachments");
  const { id } = await params;
  const photo = await getAttachmentForViewing({ actor, id });
  return new Response(photo.bytes as BodyInit, {
    headers: {
      "Content-Type": photo.contentType,
      "Content-Disposition": downloadDisposition(photo.name, "inline"),
      "X-Content-Type-Options": "nosniff",
      "Content-Security-Policy": "default-src 'none'; sandbox",
      "Cache-Control": "private, max-age=3600, immutable",
      ETag: `"${photo.sha256}"`,
    },
  });
});

import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { filesOf, readMultipart } from "@/lib/uploads";
import { verifyReportBytes } from "@/lib/services/reports";

export const runtime = "nodejs";

export const POST = route(async (request) => {
  const actor = await requireRole("report:verify", "check reports");
  const form = await readMultipart(request, { fileFields: ["file"], maxFiles: 1 });
  const [file] = await filesOf(form, "file");
  if (!file) throw new AppError(400, "Attach the PDF in the field named file.", "file");
  return NextResponse.json(await verifyReportBytes({ actor, bytes: file.bytes }));
});

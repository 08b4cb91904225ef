import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { filesOf, readMultipart } from "@/lib/uploads";
import { inspectLoggerUpload } from "@/lib/services/intake";

export const runtime = "nodejs";

export const POST = route(async (request) => {
  const actor = await requireRole("cycle:create", "upload logger files");
  const form = await readMultipart(request, { fileFields: ["file"], maxFiles: 1 });
  const [file] = await filesOf(form, "file");
  if (!file) throw new AppError(400, "Attach the logger file in the field named file.", "file");
  const instrumentId = String(form.get("instrumentId") ?? "") || undefined;
  return NextResponse.json(await inspectLoggerUpload({ actor, file, instrumentId }));
});

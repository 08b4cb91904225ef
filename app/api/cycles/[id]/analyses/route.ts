import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { filesOf, mappingFromForm, readMultipart } from "@/lib/uploads";
import { parseLeakMarks } from "@/lib/validations/intake";
import { reanalyseCycle } from "@/lib/services/intake";

export const runtime = "nodejs";

type Context = { params: Promise<{ id: string }> };

/** A correction: a new logger file and/or mapping for a draft or returned cycle; earlier analyses are kept. */
export const POST = route<Context>(async (request, { params }) => {
  const actor = await requireRole("cycle:create", "correct cycles");
  const form = await readMultipart(request, { fileFields: ["file"], maxFiles: 1 });
  const [file] = await filesOf(form, "file");
  const mapping = mappingFromForm(form);
  const leak = parseLeakMarks(form.get("leakMarks"));
  if (leak.error) throw new AppError(400, leak.error, "leakMarks");
  if (!file && !mapping && !leak.marks) throw new AppError(400, "Attach a corrected logger file or send a corrected mapping.");
  const { id } = await params;
  return NextResponse.json(await reanalyseCycle({ actor, id, file, mapping, leakMarks: leak.marks }), { status: 201 });
});

import { NextResponse } from "next/server";
import { afterAnswer, route, zodMessage } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { filesOf, mappingFromForm, positionsFromForm, readMultipart } from "@/lib/uploads";
import { correctionFieldsSchema, parseLeakMarks } from "@/lib/validations/intake";
import { reanalyseCycle } from "@/lib/services/intake";
import { prepareDraftReportSoon } from "@/lib/services/reports";

export const runtime = "nodejs";

type Context = { params: Promise<{ id: string }> };

/** A correction: a new logger file, mapping and/or details for a draft or returned cycle, with its reason; earlier analyses are kept. */
export const POST = route<Context>(async (request, { params }) => {
  const actor = await requireRole("cycle:create", "correct cycles");
  const form = await readMultipart(request, { fileFields: ["file"], maxFiles: 1 });
  const [file] = await filesOf(form, "file");
  const mapping = mappingFromForm(form);
  const positions = positionsFromForm(form);
  const leak = parseLeakMarks(form.get("leakMarks"));
  if (leak.error) throw new AppError(400, leak.error, "leakMarks");
  const fields = correctionFieldsSchema.safeParse(Object.fromEntries([...form.entries()].filter(([key, v]) => typeof v === "string" && key !== "leakMarks" && key !== "positions")));
  if (!fields.success) {
    const issue = fields.error.issues[0];
    const field = issue?.path[0] ? String(issue.path[0]) : undefined;
    throw new AppError(field === "reason" ? 422 : 400, field === "reason" ? issue.message : zodMessage(fields.error), field);
  }
  const { reason, duplicateReason, ...details } = fields.data;
  const changesDetails = Object.values(details).some((v) => v !== undefined);
  if (!file && !mapping && !positions && !leak.marks && !changesDetails)
    throw new AppError(400, "Attach a corrected logger file, send a corrected mapping or sensor positions, or change the cycle's details.");
  const { id } = await params;
  const corrected = await reanalyseCycle({ actor, id, file, mapping, positions, leakMarks: leak.marks, reason, duplicateReason, details });
  afterAnswer(() => prepareDraftReportSoon({ actor, id }));
  return NextResponse.json(corrected, { status: 201 });
});

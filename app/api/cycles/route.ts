import { NextResponse } from "next/server";
import { afterAnswer, route, zodMessage } from "@/lib/http";
import { requireActorOrToken, requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { filesOf, mappingFromForm, readMultipart } from "@/lib/uploads";
import { cycleListQuerySchema, queryObject } from "@/lib/validations/cycles";
import { createCycleFieldsSchema, idempotencyKeySchema, parseLeakMarks } from "@/lib/validations/intake";
import { listCycles } from "@/lib/services/cycles";
import { registerUploadedCycle } from "@/lib/services/intake";
import { prepareDraftReportSoon } from "@/lib/services/reports";
import { kickMailDelivery } from "@/lib/mail/delivery";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

export const GET = route(async (request) => {
  const actor = await requireRole("cycle:read");
  const parsed = cycleListQuerySchema.safeParse(queryObject(request.url));
  if (!parsed.success) throw new AppError(400, zodMessage(parsed.error));
  return NextResponse.json(await listCycles({ actor, query: parsed.data }));
});

export const POST = route(async (request) => {
  const actor = await requireActorOrToken(request, "cycle:create", { tokenRoute: "POST /api/cycles", what: "register cycles" });
  const keyHeader = request.headers.get("idempotency-key");
  const idempotencyKey = keyHeader === null ? null : idempotencyKeySchema.safeParse(keyHeader);
  if (idempotencyKey && !idempotencyKey.success) throw new AppError(400, zodMessage(idempotencyKey.error), "Idempotency-Key");
  const form = await readMultipart(request, { fileFields: ["files", "file"] });
  const fields = createCycleFieldsSchema.safeParse(Object.fromEntries([...form.entries()].filter(([, v]) => typeof v === "string")));
  if (!fields.success) {
    const issue = fields.error.issues[0];
    throw new AppError(400, zodMessage(fields.error), issue?.path[0] ? String(issue.path[0]) : undefined);
  }
  const mapping = mappingFromForm(form);
  const leak = parseLeakMarks(form.get("leakMarks"));
  if (leak.error) throw new AppError(400, leak.error, "leakMarks");
  const files = await filesOf(form, "files");
  if (files.length === 0) {
    const single = await filesOf(form, "file");
    files.push(...single);
  }
  if (files.length === 0) throw new AppError(400, "Attach at least one logger file in the field named files.", "files");
  const { sterilizerId, profileId, instrumentId, cycleNumber, load, loadType, loadLot, testKind, startedAt, duplicateReason } = fields.data;
  const answer = await registerUploadedCycle(
    {
      actor,
      sterilizerId,
      profileId,
      instrumentId: instrumentId || null,
      cycleNumber,
      load,
      loadType,
      loadLot,
      testKind,
      startedAt,
      files,
      mapping,
      saveMapping: form.get("saveMapping") === "true",
      leakMarks: leak.marks,
      duplicateReason,
    },
    { key: idempotencyKey?.data ?? null, requestHash: idempotencyKey ? form.digest() : "" },
  );
  kickMailDelivery();
  // The draft report is made while nobody waits, so its first reader gets it at once.
  const createdId = answer.status === 201 ? (answer.body as { id?: unknown }).id : undefined;
  if (typeof createdId === "string") afterAnswer(() => prepareDraftReportSoon({ actor, id: createdId }));
  return NextResponse.json(answer.body, { status: answer.status, headers: answer.replayed ? { "Idempotent-Replayed": "true" } : undefined });
});

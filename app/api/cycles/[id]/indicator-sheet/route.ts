import { NextResponse } from "next/server";
import { route, zodMessage } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { readMultipart } from "@/lib/uploads";
import { cycleIndicatorSheetSchema } from "@/lib/validations/periodic-tests";
import { recordCycleIndicatorSheet } from "@/lib/services/bowie-dick";

export const runtime = "nodejs";

type Context = { params: Promise<{ id: string }> };

/** The indicator sheet of a Bowie-Dick cycle (multipart: `outcome` uniform | non-uniform, `indicatorLot`, `photo` JPEG/PNG ≤ 10 MB, `reason` for a second reading). */
export const POST = route<Context>(async (request, { params }) => {
  const actor = await requireRole("cycle:create", "record indicator sheets");
  const form = await readMultipart(request, { fileFields: ["photo"], maxFiles: 1 });
  const photo = form.files.find((f) => f.field === "photo");
  const asBlob = photo && { name: photo.name, size: photo.bytes.byteLength, arrayBuffer: async () => photo.bytes.slice().buffer };
  const parsed = cycleIndicatorSheetSchema.safeParse({ ...Object.fromEntries(form.entries()), photo: asBlob });
  if (!parsed.success) throw new AppError(400, zodMessage(parsed.error), String(parsed.error.issues[0]?.path[0] ?? ""));
  const { id } = await params;
  return NextResponse.json(await recordCycleIndicatorSheet({ actor, cycleId: id, input: parsed.data }), { status: 201 });
});

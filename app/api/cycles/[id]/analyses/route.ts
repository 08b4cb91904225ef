import { NextResponse } from "next/server";
import { route, zodMessage } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { filesOf, readMultipart } from "@/lib/uploads";
import { mappingOverridesSchema as mappingSchema } from "@/lib/validations/intake";
import { reanalyseCycle } from "@/db/queries/cycles";

export const runtime = "nodejs";

type Context = { params: Promise<{ id: string }> };

/** A correction: a new logger file and/or mapping for a draft or returned cycle; earlier analyses are kept. */
export const POST = route<Context>(async (request, { params }) => {
  const actor = await requireRole("cycle:create", "correct cycles");
  const form = await readMultipart(request);
  const [file] = await filesOf(form, "file");
  let mapping;
  const raw = form.get("mapping");
  if (typeof raw === "string" && raw.trim()) {
    let json: unknown;
    try {
      json = JSON.parse(raw);
    } catch {
      throw new AppError(400, "mapping is not valid JSON.", "mapping");
    }
    const parsed = mappingSchema.safeParse(json);
    if (!parsed.success) throw new AppError(400, `mapping: ${zodMessage(parsed.error)}`, "mapping");
    mapping = parsed.data;
  }
  if (!file && !mapping) throw new AppError(400, "Attach a corrected logger file or send a corrected mapping.");
  const { id } = await params;
  return NextResponse.json(await reanalyseCycle({ actor, id, file, mapping }), { status: 201 });
});

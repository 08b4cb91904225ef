import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { deviationPatchSchema } from "@/lib/validations/studies";
import { closeDeviation, updateDeviation } from "@/lib/services/studies";
import { jsonBody } from "../../../body";

export const runtime = "nodejs";

type Context = { params: Promise<{ id: string; deviationId: string }> };

/** An open deviation's { impact, rootCause, capaReference }, or { close: true, reason } (engineers). */
export const PATCH = route<Context>(async (request, { params }) => {
  const actor = await requireRole("study:run", "investigate deviations");
  const body = await jsonBody(request, deviationPatchSchema, "{ impact?, rootCause?, capaReference? } or { close: true, reason }");
  const { id, deviationId } = await params;
  if ("close" in body) return NextResponse.json(await closeDeviation({ actor, id, deviationId, reason: body.reason }));
  return NextResponse.json(await updateDeviation({ actor, id, deviationId, changes: body }));
});

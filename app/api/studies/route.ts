import { NextResponse } from "next/server";
import { route, zodMessage } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { queryObject } from "@/lib/validations/cycles";
import { studyInputSchema, studyListQuerySchema } from "@/lib/validations/studies";
import { createStudy, listStudies } from "@/lib/services/studies";
import { jsonBody } from "./body";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

export const GET = route(async (request) => {
  const actor = await requireRole("study:read", "see qualification studies");
  const parsed = studyListQuerySchema.safeParse(queryObject(request.url));
  if (!parsed.success) throw new AppError(400, zodMessage(parsed.error));
  return NextResponse.json(await listStudies({ actor, ...parsed.data }));
});

export const POST = route(async (request) => {
  const actor = await requireRole("study:plan", "plan qualification studies");
  const input = await jsonBody(request, studyInputSchema, "{ sterilizerId, kind, profileId, runsRequired, loadingPattern }");
  const created = await createStudy({ actor, input });
  return NextResponse.json(created, { status: 201 });
});

import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { attachRunSchema } from "@/lib/validations/studies";
import { attachRun, listStudyRuns } from "@/lib/services/studies";
import { jsonBody, type StudyContext } from "../../body";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** The study's runs and the signed cycles that could be attached next. */
export const GET = route<StudyContext>(async (_request, { params }) => {
  const actor = await requireRole("study:read", "see qualification studies");
  const { id } = await params;
  return NextResponse.json(await listStudyRuns({ actor, id }));
});

/** Attaches a signed cycle as the next run: { cycleId, sensorMap? } (without sensorMap, the proposal when it is complete). */
export const POST = route<StudyContext>(async (request, { params }) => {
  const actor = await requireRole("study:run", "attach runs to studies");
  const { cycleId, sensorMap } = await jsonBody(request, attachRunSchema, "{ cycleId, sensorMap? }");
  const { id } = await params;
  return NextResponse.json(await attachRun({ actor, id, cycleId, sensorMap }), { status: 201 });
});

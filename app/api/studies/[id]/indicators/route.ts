import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { indicatorInputSchema } from "@/lib/validations/studies";
import { getStudyDetail, recordIndicator } from "@/lib/services/studies";
import { jsonBody, type StudyContext } from "../../body";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

export const GET = route<StudyContext>(async (_request, { params }) => {
  const actor = await requireRole("study:read", "see qualification studies");
  const { id } = await params;
  return NextResponse.json({ indicators: (await getStudyDetail({ actor, id })).indicators });
});

/** One indicator reading: { runId, positionId, kind, result, organism?, lot, population?, incubation?, readBy, readAt, reason? }. */
export const POST = route<StudyContext>(async (request, { params }) => {
  const actor = await requireRole("study:run", "record indicator results");
  const { runId, ...input } = await jsonBody(request, indicatorInputSchema, "{ runId, positionId, kind, result, lot, readBy, readAt, … }");
  const { id } = await params;
  return NextResponse.json(await recordIndicator({ actor, id, runId, input }), { status: 201 });
});

import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { deviationInputSchema } from "@/lib/validations/studies";
import { getStudyDetail, raiseDeviation } from "@/lib/services/studies";
import { jsonBody, type StudyContext } from "../../body";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

export const GET = route<StudyContext>(async (_request, { params }) => {
  const actor = await requireRole("study:read", "see qualification studies");
  const { id } = await params;
  return NextResponse.json({ deviations: (await getStudyDetail({ actor, id })).deviations });
});

/** A deviation raised by a person: { what, runId?, impact?, rootCause?, capaReference? }. */
export const POST = route<StudyContext>(async (request, { params }) => {
  const actor = await requireRole("study:run", "raise deviations");
  const { source: _source, ...input } = await jsonBody(request, deviationInputSchema, "{ what, runId?, impact?, rootCause?, capaReference? }");
  void _source;
  const { id } = await params;
  return NextResponse.json(await raiseDeviation({ actor, id, input }), { status: 201 });
});

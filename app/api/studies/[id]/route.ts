import { NextResponse } from "next/server";
import { z } from "zod";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { studyDraftChangesSchema } from "@/lib/validations/studies";
import { getStudyDetail, updateStudyDraft } from "@/lib/services/studies";
import { jsonBody, type StudyContext } from "../body";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

export const GET = route<StudyContext>(async (_request, { params }) => {
  const actor = await requireRole("study:read", "see qualification studies");
  const { id } = await params;
  return NextResponse.json(await getStudyDetail({ actor, id }));
});

const patchSchema = z.object({ changes: studyDraftChangesSchema, reason: z.string().trim().max(1000).nullable().optional() });

/** A draft's protocol, criteria or loading pattern (engineers; frozen once the protocol is approved). */
export const PATCH = route<StudyContext>(async (request, { params }) => {
  const actor = await requireRole("study:plan", "plan qualification studies");
  const { changes, reason } = await jsonBody(request, patchSchema, "{ changes: { … }, reason }");
  const { id } = await params;
  return NextResponse.json(await updateStudyDraft({ actor, id, changes, reason }));
});

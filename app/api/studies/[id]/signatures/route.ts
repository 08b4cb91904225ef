import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { studySignatureSchema } from "@/lib/validations/studies";
import { signStudy } from "@/lib/services/studies";
import { jsonBody, type StudyContext } from "../../body";

export const runtime = "nodejs";

/** A study signature: { meaning, password, reason? } (engineers; the rules are in lib/studies/sign-rules.ts). */
export const POST = route<StudyContext>(async (request, { params }) => {
  const actor = await requireRole("study:sign", "sign qualification studies");
  const body = await jsonBody(request, studySignatureSchema, "{ meaning, password, reason? }");
  const { id } = await params;
  return NextResponse.json(await signStudy({ actor, id, ...body }), { status: 201 });
});

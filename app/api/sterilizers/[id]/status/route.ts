import { NextResponse } from "next/server";
import { route, zodMessage } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { sterilizerStatusSchema } from "@/lib/validations/equipment";
import { setSterilizerStatus } from "@/lib/services/sterilizer-status";

export const runtime = "nodejs";

type Context = { params: Promise<{ id: string }> };

/** An engineer takes a sterilizer out of use or releases it, signed with the password and a reason. */
export const POST = route<Context>(async (request, { params }) => {
  const actor = await requireRole("equipment:manage", "take a sterilizer out of use or release it");
  let body: unknown;
  try {
    body = await request.json();
  } catch {
    throw new AppError(400, 'Send the decision as JSON: { "status": "in-use" | "out-of-use", "reason", "password" }.');
  }
  const parsed = sterilizerStatusSchema.safeParse(body);
  if (!parsed.success) throw new AppError(422, zodMessage(parsed.error), String(parsed.error.issues[0]?.path[0] ?? ""));
  const { id } = await params;
  const after = await setSterilizerStatus({ actor, sterilizerId: id, ...parsed.data });
  return NextResponse.json(after);
});

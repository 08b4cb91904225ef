import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { parseSignatureBody } from "@/lib/validations/reviews";
import { signCycle } from "@/lib/services/sign-off";
import { kickMailDelivery } from "@/lib/mail/delivery";

export const runtime = "nodejs";

type Context = { params: Promise<{ id: string }> };

export const POST = route<Context>(async (request, { params }) => {
  const actor = await requireRole("cycle:sign", "sign cycles");
  let body: unknown;
  try {
    body = await request.json();
  } catch {
    throw new AppError(400, "Send the signature as JSON: { password, meaning, reason, acknowledgeReplacement }.");
  }
  const parsed = parseSignatureBody(body);
  if (!parsed.ok) throw new AppError(parsed.status, parsed.message, parsed.field);
  const { id } = await params;
  const signature = await signCycle({ actor, id, ...parsed.data });
  kickMailDelivery();
  return NextResponse.json(signature, { status: 201 });
});

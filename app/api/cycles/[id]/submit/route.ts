import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { submitCycle } from "@/lib/services/sign-off";
import { kickMailDelivery } from "@/lib/mail/delivery";

export const runtime = "nodejs";

type Context = { params: Promise<{ id: string }> };

export const POST = route<Context>(async (request, { params }) => {
  const actor = await requireRole("cycle:submit", "submit cycles");
  const { id } = await params;
  const result = await submitCycle({ actor, id });
  kickMailDelivery();
  return NextResponse.json(result);
});

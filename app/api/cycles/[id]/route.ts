import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { notFound } from "@/lib/errors";
import { getCycleDetail } from "@/lib/services/cycles";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Context = { params: Promise<{ id: string }> };

export const GET = route<Context>(async (_request, { params }) => {
  const actor = await requireRole("cycle:read");
  const { id } = await params;
  const detail = await getCycleDetail({ actor, id });
  if (!detail) throw notFound("That cycle");
  return NextResponse.json(detail);
});

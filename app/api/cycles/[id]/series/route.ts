import { NextResponse } from "next/server";
import { route, zodMessage } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { AppError, notFound } from "@/lib/errors";
import { queryObject, seriesQuerySchema } from "@/lib/validations/cycles";
import { getCycleSeries } from "@/lib/services/cycle-series";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Context = { params: Promise<{ id: string }> };

export const GET = route<Context>(async (request, { params }) => {
  const actor = await requireRole("cycle:read");
  const parsed = seriesQuerySchema.safeParse(queryObject(request.url));
  if (!parsed.success) throw new AppError(400, zodMessage(parsed.error));
  const { from, to, points } = parsed.data;
  if (from !== undefined && to !== undefined && to <= from) throw new AppError(400, "to must be later than from.");
  const { id } = await params;
  const series = await getCycleSeries({ actor, id, fromS: from, toS: to, points });
  if (!series) throw notFound("That cycle or its analysis");
  return NextResponse.json(series);
});

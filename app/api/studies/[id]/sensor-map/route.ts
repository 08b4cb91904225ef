import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { proposeSensorMap } from "@/lib/services/studies";
import type { StudyContext } from "../../body";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** The proposed sensor map of a cycle for this study: GET ?cycleId=… */
export const GET = route<StudyContext>(async (request, { params }) => {
  const actor = await requireRole("study:read", "see qualification studies");
  const cycleId = new URL(request.url).searchParams.get("cycleId")?.trim();
  if (!cycleId) throw new AppError(400, "Name the cycle: ?cycleId=…", "cycleId");
  const { id } = await params;
  return NextResponse.json(await proposeSensorMap({ actor, id, cycleId }));
});

import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { getPeriodicTestRecord } from "@/lib/services/periodic-test-review";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Context = { params: Promise<{ id: string }> };

/** One periodic-test record of the actor's site: status, measurements, photos (with SHA-256) and signatures. */
export const GET = route<Context>(async (_request, { params }) => {
  const actor = await requireRole("equipment:read", "see periodic tests");
  const { id } = await params;
  const record = await getPeriodicTestRecord({ actor, id });
  if (!record) throw new AppError(404, "That periodic-test record was not found.");
  const { maySign: _maySign, signBlocked: _signBlocked, timeZone: _timeZone, ...answer } = record;
  return NextResponse.json(answer);
});

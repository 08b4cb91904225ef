import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { verifyLedger } from "@/lib/services/audit";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

export const GET = route(async () => {
  await requireRole("audit:read", "verify the audit ledger");
  return NextResponse.json(await verifyLedger());
});

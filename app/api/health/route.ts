import { NextResponse } from "next/server";
import { checkHealth } from "@/lib/services/health";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

// Public on purpose: load balancers and the test runner ask it before anyone signs in.
export async function GET() {
  try {
    const database = await checkHealth();
    return NextResponse.json({ ok: true, database });
  } catch {
    return NextResponse.json({ ok: false, error: "The database does not answer." }, { status: 503 });
  }
}

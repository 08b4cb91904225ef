import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { listProfileCatalog } from "@/lib/services/catalog";

export const runtime = "nodejs";

export const GET = route(async () => {
  const actor = await requireRole("equipment:read");
  return NextResponse.json({ items: await listProfileCatalog({ actor }) });
});

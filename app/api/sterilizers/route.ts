import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireActorOrToken } from "@/lib/auth/guards";
import { listSterilizerCatalog } from "@/lib/services/catalog";

export const runtime = "nodejs";

export const GET = route(async (request) => {
  const actor = await requireActorOrToken(request, "equipment:read", { tokenRoute: "GET /api/sterilizers" });
  return NextResponse.json({ items: await listSterilizerCatalog({ actor }) });
});

import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { readDevelopmentMailbox } from "@/lib/services/mail";

export const dynamic = "force-dynamic";

/**
 * GET /api/dev/mailbox?limit=50 → `{ baseUrl, messages: [...], hasMore }`: what the local fake
 * mail service received, newest first. Administrators only; 404 unless RESEND_BASE_URL points at
 * the fake, so a real provider's mail is never read through here.
 */
export const GET = route(async (request) => {
  await requireRole("mail:read-outbox", "read the development mailbox");
  const raw = new URL(request.url).searchParams.get("limit");
  const limit = raw === null ? 50 : Number(raw);
  if (!Number.isInteger(limit) || limit < 1 || limit > 100) {
    throw new AppError(400, "limit: give a whole number of messages from 1 to 100.", "limit");
  }
  return NextResponse.json(await readDevelopmentMailbox({ limit }));
});

import { NextResponse } from "next/server";
import { route, zodMessage } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { periodicSignatureSchema } from "@/lib/validations/periodic-tests";
import { signPeriodicTest } from "@/lib/services/periodic-test-review";

export const runtime = "nodejs";

type Context = { params: Promise<{ id: string }> };

/** An engineer signs a periodic-test record: `{ password, meaning: "approved" | "failure-confirmed" | "returned", reason? }`. */
export const POST = route<Context>(async (request, { params }) => {
  const actor = await requireRole("periodic-test:sign", "sign periodic-test records");
  let body: unknown;
  try {
    body = await request.json();
  } catch {
    throw new AppError(400, "Send the signature as JSON: { password, meaning, reason }.");
  }
  const parsed = periodicSignatureSchema.safeParse(body);
  if (!parsed.success) throw new AppError(400, zodMessage(parsed.error), String(parsed.error.issues[0]?.path[0] ?? ""));
  const { id } = await params;
  return NextResponse.json(await signPeriodicTest({ actor, id, ...parsed.data }), { status: 201 });
});

import "server-only";
import { after, NextResponse } from "next/server";
import { create as contentDisposition } from "content-disposition";
import { ZodError } from "zod";
import { AppError, databaseBusy, plainIssueMessage } from "./errors";
import { foreignOriginRefusal } from "./request-origin";
import { bearerRefusal } from "./auth/bearer";

function jsonError(status: number, error: string, extra?: Record<string, unknown>) {
  return NextResponse.json({ error, ...extra }, { status });
}

/** The first problem of a schema as a plain sentence naming the field (lib/errors.ts), never the parameter's name. */
export function zodMessage(error: ZodError): string {
  const first = error.issues[0];
  if (!first) return "The request is not valid.";
  return plainIssueMessage(first);
}

/** Maps whatever a handler throws to a JSON error with a plain sentence; never a stack trace. */
function errorResponse(error: unknown) {
  if (error instanceof AppError) return jsonError(error.status, error.message, error.field ? { field: error.field } : undefined);
  if (error instanceof ZodError) return jsonError(400, zodMessage(error));
  const busy = databaseBusy(error);
  if (busy) return jsonError(busy.status, busy.message);
  console.error("[papin] unexpected error in a route handler", error);
  return jsonError(500, "Something went wrong on the server. Nothing was changed; please try again.");
}

type Handler<C> = (request: Request, context: C) => Promise<Response>;

/**
 * Wraps a route handler so that every failure becomes a JSON error, and a request that would change something but
 * comes from another site's page is refused (403) before the handler runs, as is an API token on a route that does not
 * accept one (401).
 */
export function route<C = unknown>(handler: Handler<C>): Handler<C> {
  return async (request, context) => {
    try {
      const refusal = foreignOriginRefusal(request);
      if (refusal) return jsonError(403, refusal);
      const bearer = bearerRefusal(request);
      if (bearer) return jsonError(401, bearer);
      return await handler(request, context);
    } catch (error) {
      return errorResponse(error);
    }
  };
}

/**
 * A download's `Content-Disposition` (RFC 6266): the name as a quoted ASCII fallback plus an RFC 5987 `filename*`
 * with the exact characters, so a cycle number with "–" or "№" downloads under its own name and a quote in it stays
 * inside the name.
 */
export function downloadDisposition(fileName: string, kind: "attachment" | "inline" = "attachment"): string {
  return contentDisposition(fileName, { type: kind });
}

/** A PDF answer: never cached, named for download (or shown in the browser with `inline`), with Papin's own headers added. */
export function pdfResponse(bytes: Uint8Array, fileName: string, { inline = false, headers = {} }: { inline?: boolean; headers?: Record<string, string> } = {}): Response {
  return new Response(bytes as BodyInit, {
    headers: { "Content-Type": "application/pdf", "Content-Disposition": downloadDisposition(fileName, inline ? "inline" : "attachment"), "Cache-Control": "private, no-store", ...headers },
  });
}

/**
 * Work to do once the answer has gone out (next/server `after`); a graceful stop of the server waits for it. Outside a
 * request (a script, or a test calling a handler directly) nothing is scheduled: such work only saves a later reader
 * time, and is done on demand then.
 */
export function afterAnswer(task: () => Promise<unknown>): void {
  try {
    after(task);
  } catch {
    // no request scope: see above
  }
}

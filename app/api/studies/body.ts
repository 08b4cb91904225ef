import type { z } from "zod";
import { zodMessage } from "@/lib/http";
import { AppError } from "@/lib/errors";

/** The request's JSON body read with the schema; a body that is not JSON or does not fit is a 400 naming the field. */
export async function jsonBody<S extends z.ZodType>(request: Request, schema: S, shape: string): Promise<z.infer<S>> {
  let body: unknown;
  try {
    body = await request.json();
  } catch {
    throw new AppError(400, `Send the request as JSON: ${shape}.`);
  }
  const parsed = schema.safeParse(body);
  if (!parsed.success) throw new AppError(400, zodMessage(parsed.error), parsed.error.issues[0]?.path.map(String).join(".") || undefined);
  return parsed.data;
}

export type StudyContext = { params: Promise<{ id: string }> };

import "server-only";
import { z, type ZodType } from "zod";
import { requireRole } from "./auth/guards";
import type { Permission } from "./auth/permissions";
import type { Actor } from "@/lib/domain";
import { AppError, databaseBusy, plainIssueMessage } from "./errors";

import type { FormState } from "./form-state";

/**
 * The one shape of a server action: guard (session and role) → parse the form with zod → act.
 * Failures come back as a state with a plain message and per-field errors, never as a throw.
 */
export function formAction<S extends ZodType>(permission: Permission, schema: S, act: (input: z.infer<S>, actor: Actor) => Promise<string | void | { message: string; href: string }>) {
  return async (_prev: FormState, formData: FormData): Promise<FormState> => {
    let actor: Actor;
    try {
      actor = await requireRole(permission);
    } catch (error) {
      return { status: "error", message: error instanceof AppError ? error.message : "Please sign in again." };
    }
    const parsed = schema.safeParse(Object.fromEntries(formData));
    if (!parsed.success) {
      const fieldErrors: Record<string, string> = {};
      for (const issue of parsed.error.issues) fieldErrors[String(issue.path[0] ?? "form")] ??= plainIssueMessage(issue);
      return { status: "error", message: "Please correct the fields marked below.", fieldErrors };
    }
    try {
      const done = await act(parsed.data, actor);
      if (typeof done === "object") return { status: "ok", message: done.message, href: done.href };
      return { status: "ok", message: done ?? "Saved." };
    } catch (error) {
      if (error instanceof AppError) {
        return { status: "error", message: error.message, fieldErrors: error.field ? { [error.field]: error.message } : undefined };
      }
      const busy = databaseBusy(error);
      if (busy) return { status: "error", message: busy.message };
      console.error("[papin] server action failed", error);
      return { status: "error", message: "Something went wrong on the server; nothing was changed." };
    }
  };
}

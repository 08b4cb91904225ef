"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { formAction } from "@/lib/actions";
import { setPatternRequiredBeforeUse } from "@/lib/services/requalification";

const requiredBeforeUseSchema = z.object({
  patternId: z.string().min(1, "Choose a loading pattern."),
  requiredBeforeUse: z.enum(["true", "false"]).transform((v) => v === "true"),
  reason: z.string().trim().min(3, "Give the reason for this decision; it goes into the audit ledger.").max(500, "Keep the reason under 500 characters."),
});

export const setPatternRequiredBeforeUseAction = formAction("study:plan", requiredBeforeUseSchema, async ({ patternId, requiredBeforeUse, reason }, actor) => {
  const { changed, name } = await setPatternRequiredBeforeUse({ actor, patternId, requiredBeforeUse, reason });
  revalidatePath("/sterilizers", "layout");
  revalidatePath("/");
  if (!changed) return "Nothing changed.";
  return requiredBeforeUse ? `${name} must now be requalified before use once it falls due.` : `${name} is no longer held when its requalification falls due.`;
});

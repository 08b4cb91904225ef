"use server";

import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/actions";
import { updateSiteSchema } from "@/lib/validations/site";
import { updateSiteSettings } from "@/lib/services/site";

const LABELS: Record<string, string> = { name: "name", timeZone: "time zone", atmosphereKpa: "atmospheric pressure", altitudeM: "altitude", address: "address" };

export const updateSiteAction = formAction("settings:manage", updateSiteSchema, async ({ reason, ...changes }, actor) => {
  const changed = await updateSiteSettings({ actor, changes, reason });
  revalidatePath("/admin/site");
  return `Saved: ${changed.map((k) => LABELS[k] ?? k).join(", ")}. New analyses will use these settings.`;
});

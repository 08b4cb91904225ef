import { z } from "zod";
import { optionalNumberField, reasonField } from "./equipment";

/** The canonical IANA name when the runtime knows the zone, otherwise null. */
function knownTimeZone(name: string): string | null {
  try {
    return new Intl.DateTimeFormat(undefined, { timeZone: name }).resolvedOptions().timeZone;
  } catch {
    return null;
  }
}

export const updateSiteSchema = z.object({
  name: z.string({ error: "Enter the site's name." }).trim().min(2, "Enter the site's name, at least 2 characters.").max(120, "Keep the site's name under 120 characters."),
  timeZone: z
    .string({ error: "Enter the site's time zone." })
    .trim()
    .min(1, "Enter the site's time zone, for example Europe/London.")
    .transform((name, ctx) => {
      const canonical = knownTimeZone(name);
      if (canonical) return canonical;
      ctx.addIssue({ code: "custom", message: `"${name}" is not a time zone Papin knows. Use an IANA name such as Europe/London or America/Denver.` });
      return z.NEVER;
    }),
  // 50–110 kPa covers every inhabited altitude and weather; −400 to 5000 m, the Dead Sea shore to the highest towns.
  atmosphereKpa: optionalNumberField("the atmospheric pressure", { min: 50, max: 110, unit: "kPa" }),
  altitudeM: optionalNumberField("the altitude", { min: -400, max: 5000, unit: "m" }),
  address: z
    .string()
    .trim()
    .max(500, "Keep the address under 500 characters.")
    .optional()
    .transform((s) => (s ? s : null)),
  reason: reasonField,
});

export type SiteSettingsInput = z.infer<typeof updateSiteSchema>;
export type SiteSettingsChanges = Omit<SiteSettingsInput, "reason">;

import { z } from "zod";
import { ATMOSPHERE_RANGE_KPA, atmosphereAtAltitudeKpa, atmosphereOutOfRange } from "@/lib/steam";
import { optionalNumberField, reasonField } from "./equipment";

/**
 * Null when the standard atmosphere at this altitude is a physical atmospheric pressure
 * (ATMOSPHERE_RANGE_KPA, issue 9 rule 11); else the sentence naming the range.
 */
export function altitudeAtmosphereProblem(altitudeM: number): string | null {
  let kpa: number;
  try {
    kpa = atmosphereAtAltitudeKpa(altitudeM);
  } catch (error) {
    return error instanceof Error ? `${error.message}.` : `The altitude of ${altitudeM} m cannot be converted to an atmospheric pressure.`;
  }
  const problem = atmosphereOutOfRange(kpa);
  return problem ? `At ${altitudeM} m the standard atmosphere gives ${kpa.toFixed(1)} kPa: ${problem.replace(/^an atmospheric pressure of [^ ]+ kPa is /, "")}.` : null;
}

/** Null when a site's measured pressure may make gauge readings absolute; else the sentence naming the range. */
export function siteAtmosphereProblem(atmosphereKpa: number): string | null {
  const problem = atmosphereOutOfRange(atmosphereKpa);
  return problem ? `${problem.charAt(0).toUpperCase()}${problem.slice(1)}.` : null;
}

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
  // ATMOSPHERE_RANGE_KPA (50–110 kPa) covers every inhabited altitude and weather; −400 to 5000 m, the Dead Sea shore to the highest towns.
  atmosphereKpa: optionalNumberField("the atmospheric pressure", { min: ATMOSPHERE_RANGE_KPA.min, max: ATMOSPHERE_RANGE_KPA.max, unit: "kPa" }),
  altitudeM: optionalNumberField("the altitude", { min: -400, max: 5000, unit: "m" }).superRefine((altitudeM, ctx) => {
    const problem = typeof altitudeM === "number" ? altitudeAtmosphereProblem(altitudeM) : null;
    if (problem) ctx.addIssue({ code: "custom", message: problem });
  }),
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

import { z } from "zod";
import { STUDY_KINDS, STUDY_SIGNATURE_MEANINGS, STUDY_STATUSES } from "@/lib/domain";
import { numberField, optionalNumberField } from "./equipment";
import { loadingPatternSchema } from "./studies";

/*
 * The study pages' forms (app/(portal)/studies). A form posts flat fields; the loading pattern's rows travel as one
 * JSON field, read here so a bad row is named ("Position 3: give it a label").
 */

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `Keep it under ${max} characters.`)
    .optional()
    .transform((s) => s || undefined);

/** A new loading pattern: the API's own rules (lib/validations/studies.ts). */
export type NewPatternInput = z.infer<typeof loadingPatternSchema>;

/** Reads a new pattern sent as JSON; every problem comes back on the one field, named ("Position 3: …"). */
function readPattern(value: unknown, ctx: z.RefinementCtx): NewPatternInput {
  const parsed = loadingPatternSchema.safeParse(value);
  if (parsed.success) return parsed.data;
  const issue = parsed.error.issues[0];
  const [list, index] = issue.path;
  const where = list === "positions" && typeof index === "number" ? `Position ${index + 1}: ` : list === "items" && typeof index === "number" ? `Item ${index + 1}: ` : "";
  ctx.addIssue({ code: "custom", message: `${where}${issue.message}` });
  return z.NEVER;
}

function readJson(raw: string, ctx: z.RefinementCtx): unknown {
  try {
    return JSON.parse(raw);
  } catch {
    ctx.addIssue({ code: "custom", message: "The loading pattern could not be read; reload the page and try again." });
    return z.NEVER;
  }
}

/** "pattern" of a new study: `{"existingId": "…"}` or a new pattern. */
const patternField = z.string({ error: "Choose a loading pattern or define one." }).transform((raw, ctx): string | NewPatternInput => {
  const value = readJson(raw, ctx);
  if (value && typeof value === "object" && "existingId" in value) {
    const id = (value as { existingId: unknown }).existingId;
    if (typeof id === "string" && id) return id;
    ctx.addIssue({ code: "custom", message: "Choose one of the sterilizer's loading patterns, or define a new one." });
    return z.NEVER;
  }
  return readPattern(value, ctx);
});

/** "pattern" of a draft being edited: the study's own pattern as changed, or absent (unchanged). */
const changedPatternField = z
  .string()
  .optional()
  .transform((raw, ctx): NewPatternInput | undefined => (raw ? readPattern(readJson(raw, ctx), ctx) : undefined));

const checkbox = z
  .string()
  .optional()
  .transform((v) => v === "on" || v === "true");

/** The criteria and texts a draft may change (and a new study starts with). */
const criteriaFields = {
  title: optionalText(160),
  runsRequired: numberField("the number of consecutive runs", { min: 1, max: 10, integer: true }),
  minF0Min: optionalNumberField("the minimum F0", { min: 0.01, max: 10_000, unit: "min" }),
  maxSpreadK: optionalNumberField("the maximum spread", { min: 0.01, max: 50, unit: "K" }),
  indicatorsRequired: checkbox,
  protocol: z.string().trim().max(20_000, "Keep the protocol under 20,000 characters.").optional().default(""),
  requalificationMonths: numberField("the requalification interval", { min: 1, max: 60, unit: "months", integer: true }),
};

export const createStudyFormSchema = z.object({
  sterilizerId: z.string({ error: "Choose the sterilizer." }).min(1, "Choose the sterilizer."),
  profileId: z.string({ error: "Choose the profile." }).min(1, "Choose the profile."),
  kind: z.enum(STUDY_KINDS, { error: "Choose the kind of study." }),
  pattern: patternField,
  ...criteriaFields,
});

export const updateDraftFormSchema = z.object({
  id: z.string().min(1),
  ...criteriaFields,
  pattern: changedPatternField,
  reason: optionalText(500),
});

/** A sensor map as the attach form sends it: channel header → pattern position id ("" leaves a channel out). */
const sensorMapField = z
  .string()
  .optional()
  .transform((raw, ctx): Record<string, string> | undefined => {
    if (raw === undefined || raw === "") return undefined;
    try {
      const value = JSON.parse(raw) as unknown;
      if (!value || typeof value !== "object" || Array.isArray(value)) throw new Error("not an object");
      return Object.fromEntries(Object.entries(value).filter(([, v]) => typeof v === "string" && v !== "")) as Record<string, string>;
    } catch {
      ctx.addIssue({ code: "custom", message: "The sensor map could not be read; reload the page and try again." });
      return z.NEVER;
    }
  });

export const attachRunFormSchema = z.object({
  id: z.string().min(1),
  cycleId: z.string({ error: "Choose the signed cycle to attach." }).min(1, "Choose the signed cycle to attach."),
  sensorMap: sensorMapField,
});

export const signStudyFormSchema = z.object({
  id: z.string().min(1),
  meaning: z.enum(STUDY_SIGNATURE_MEANINGS, { error: "Choose what your signature means." }),
  password: z.string({ error: "Enter your password to sign." }).min(1, "Enter your password to sign."),
  reason: optionalText(1000),
});

/** The list page's filter. */
export const studyListFilterSchema = z.object({
  status: z.enum(STUDY_STATUSES).optional().catch(undefined),
  page: z.coerce.number().int().min(1).optional().catch(undefined),
});

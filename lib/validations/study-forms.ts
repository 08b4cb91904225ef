import { z } from "zod";
import { LOAD_TYPES, PATTERN_ITEMS_MAX, PATTERN_POSITIONS_MAX, SENSOR_NOTE_MAX_CHARS, SENSOR_POSITIONS, STUDY_KINDS, STUDY_SIGNATURE_MEANINGS, STUDY_STATUSES } from "@/lib/domain";
import { numberField, optionalNumberField } from "./equipment";

/*
 * The study pages' forms (app/(portal)/studies). A form posts flat fields; the loading pattern's rows travel as one
 * JSON field, read here so a bad row is named ("Position 3: give it a label").
 */

const text = (what: string, max: number) => z.string({ error: `Enter ${what}.` }).trim().min(1, `Enter ${what}.`).max(max, `Keep ${what} under ${max} characters.`);
const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `Keep it under ${max} characters.`)
    .optional()
    .transform((s) => s || undefined);

const itemSchema = z.object({
  name: text("the item's name", 200),
  quantity: z.number({ error: "Give each item a quantity." }).int("A quantity is a whole number.").min(1, "A quantity is at least 1.").max(10_000, "A quantity is at most 10,000."),
  note: optionalText(200),
});

const positionSchema = z.object({
  id: z
    .string({ error: "Give each position a short id." })
    .trim()
    .regex(/^[A-Za-z0-9][A-Za-z0-9._-]{0,15}$/, "A position id is 1–16 letters, digits, dots, dashes or underscores (P1, T2-3)."),
  label: text("the position's label", 200),
  sensorPosition: z.enum(SENSOR_POSITIONS).optional(),
  note: optionalText(SENSOR_NOTE_MAX_CHARS),
});

/** A new loading pattern as the form builds it. */
export const newPatternSchema = z
  .object({
    name: text("the pattern's name", 200),
    description: optionalText(2000),
    loadType: z.enum(LOAD_TYPES).optional(),
    items: z.array(itemSchema).max(PATTERN_ITEMS_MAX, `A pattern lists at most ${PATTERN_ITEMS_MAX} items.`),
    positions: z.array(positionSchema).min(1, "Add at least one load position: the study measures lethality there.").max(PATTERN_POSITIONS_MAX, `A pattern has at most ${PATTERN_POSITIONS_MAX} positions.`),
  })
  .superRefine((p, ctx) => {
    const seen = new Set<string>();
    p.positions.forEach((pos, i) => {
      const key = pos.id.toLowerCase();
      if (seen.has(key)) ctx.addIssue({ code: "custom", path: ["positions", i, "id"], message: `Position ${i + 1}: the id ${pos.id} is used twice; each position needs its own.` });
      seen.add(key);
    });
  });
export type NewPatternInput = z.infer<typeof newPatternSchema>;

/** Reads a new pattern sent as JSON; every problem comes back on the one field, named ("Position 3: …"). */
function readPattern(value: unknown, ctx: z.RefinementCtx): NewPatternInput {
  const parsed = newPatternSchema.safeParse(value);
  if (parsed.success) return parsed.data;
  const issue = parsed.error.issues[0];
  const [list, index] = issue.path;
  const where = list === "positions" && typeof index === "number" ? `Position ${index + 1}: ` : list === "items" && typeof index === "number" ? `Item ${index + 1}: ` : "";
  ctx.addIssue({ code: "custom", message: issue.message.startsWith("Position") ? issue.message : `${where}${issue.message}` });
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
  title: optionalText(200),
  runsRequired: numberField("the number of consecutive runs", { min: 1, max: 20, integer: true }),
  minF0Min: optionalNumberField("the minimum F0", { min: 0, max: 10_000, unit: "min" }),
  maxSpreadK: optionalNumberField("the maximum spread", { min: 0, max: 50, unit: "K" }),
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

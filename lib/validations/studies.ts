import { z } from "zod";
import {
  DEVIATION_SOURCES,
  INDICATOR_KINDS,
  INDICATOR_RESULTS,
  LOAD_TYPES,
  PATTERN_ITEMS_MAX,
  PATTERN_POSITIONS_MAX,
  RESULTS_OF_KIND,
  SENSOR_POSITIONS,
  STUDY_KINDS,
  STUDY_SIGNATURE_MEANINGS,
  STUDY_STATUSES,
} from "@/lib/domain";

/** The qualification-study API's bodies (issue 14): each problem a sentence naming the field. */

const text = (max: number, what: string) => z.string().trim().max(max, `${what} has at most ${max} characters.`);
const required = (max: number, what: string) => text(max, what).min(1, `Enter ${what.toLowerCase()}.`);

const positionSchema = z.object({
  id: z
    .string()
    .trim()
    .min(1, "Give every position a short id (P1, P2 …).")
    .max(12, "A position id has at most 12 characters.")
    .regex(/^[\p{L}\p{N}][\p{L}\p{N}._-]*$/u, "A position id is letters and digits (P1, T2-3), no spaces."),
  label: required(120, "The position's label"),
  sensorPosition: z.enum(SENSOR_POSITIONS, { message: "sensorPosition must be one of the chamber positions." }).optional(),
  note: text(200, "A position's note").optional(),
});

export const loadingPatternSchema = z
  .object({
    name: required(120, "The loading pattern's name"),
    description: text(2000, "The description").optional(),
    loadType: z.enum(LOAD_TYPES, { message: "loadType must be one of the load types." }).nullable().optional(),
    items: z
      .array(
        z.object({
          name: required(120, "An item's name"),
          quantity: z.number().int("An item's quantity is a whole number.").min(1, "An item's quantity is at least 1.").max(10_000),
          note: text(200, "An item's note").optional(),
        }),
      )
      .max(PATTERN_ITEMS_MAX, `A loading pattern lists at most ${PATTERN_ITEMS_MAX} items.`),
    positions: z.array(positionSchema).min(1, "A loading pattern needs at least one probe position.").max(PATTERN_POSITIONS_MAX, `A loading pattern has at most ${PATTERN_POSITIONS_MAX} positions.`),
  })
  .refine((p) => new Set(p.positions.map((x) => x.id.toLowerCase())).size === p.positions.length, { message: "Two positions have the same id; give each its own.", path: ["positions"] });

const criteriaFields = {
  runsRequired: z.number().int("runsRequired is a whole number.").min(1, "A study needs at least 1 run.").max(10, "A study requires at most 10 consecutive runs.").optional(),
  title: text(160, "The title").optional(),
  minF0Min: z.number().positive("The minimum F0 is above 0 minutes.").max(10_000, "The minimum F0 is at most 10000 minutes.").nullable().optional(),
  maxSpreadK: z.number().positive("The largest spread is above 0 K.").max(50, "The largest spread is at most 50 K.").nullable().optional(),
  indicatorsRequired: z.boolean({ message: "indicatorsRequired is true or false." }).optional(),
  protocol: text(20_000, "The protocol").optional(),
  requalificationMonths: z
    .number()
    .int("requalificationMonths is a whole number.")
    .min(1, "Requalification is at least 1 month after approval.")
    .max(60, "Requalification is at most 60 months after approval.")
    .optional(),
  kind: z.enum(STUDY_KINDS, { message: `kind must be one of ${STUDY_KINDS.join(", ")}.` }),
};

export const studyInputSchema = z.object({
  sterilizerId: z.string({ message: "Choose the sterilizer." }).min(1, "Choose the sterilizer."),
  profileId: z.string({ message: "Choose the profile." }).min(1, "Choose the profile."),
  loadingPattern: z.union([z.string().min(1, "Choose the loading pattern."), loadingPatternSchema], { message: "loadingPattern is an existing pattern's id or { name, items, positions }." }),
  ...criteriaFields,
});

export const studyDraftChangesSchema = z.object({ ...criteriaFields, kind: criteriaFields.kind.optional(), profileId: z.string().min(1).optional(), loadingPattern: loadingPatternSchema.optional() });

export const studyListQuerySchema = z.object({
  status: z.enum(STUDY_STATUSES, { message: `status must be one of ${STUDY_STATUSES.join(", ")}.` }).optional(),
  page: z.coerce.number().int().min(1, "page starts at 1.").max(100_000).optional(),
});

export const attachRunSchema = z.object({
  cycleId: z.string({ message: "Name the cycle (cycleId)." }).min(1, "Name the cycle (cycleId)."),
  sensorMap: z.record(z.string(), z.string().min(1), { message: "sensorMap maps each channel header to a position id." }).optional(),
});

const isoDateTime = z.string().refine((s) => !Number.isNaN(Date.parse(s)) && /^\d{4}-\d{2}-\d{2}/.test(s), "readAt is a date and time (2026-05-04T09:30).");

export const indicatorInputSchema = z
  .object({
    runId: z.string().min(1, "Name the run (runId)."),
    positionId: z.string().trim().min(1, "Name the position (positionId)."),
    kind: z.enum(INDICATOR_KINDS, { message: "kind is biological or chemical." }),
    result: z.enum(INDICATOR_RESULTS, { message: `result is one of ${INDICATOR_RESULTS.join(", ")}.` }),
    organism: text(120, "The organism").nullable().optional(),
    lot: required(60, "The indicator's lot"),
    population: z.number().positive("The population is above 0.").max(1e12).nullable().optional(),
    incubation: text(200, "The incubation").nullable().optional(),
    readBy: required(120, "Who read the indicator (readBy)"),
    readAt: isoDateTime,
    reason: text(1000, "The reason").nullable().optional(),
  })
  .refine((v) => (RESULTS_OF_KIND[v.kind] as readonly string[]).includes(v.result), { message: "A biological indicator reads growth or no-growth; a chemical one pass or fail.", path: ["result"] })
  .refine((v) => v.kind !== "biological" || (v.organism && v.organism.length > 0), { message: "Name the biological indicator's organism.", path: ["organism"] });

export const deviationInputSchema = z.object({
  what: required(2000, "What happened"),
  runId: z.string().min(1).nullable().optional(),
  impact: text(4000, "The impact assessment").optional(),
  rootCause: text(4000, "The root cause").optional(),
  capaReference: text(200, "The CAPA reference").optional(),
  source: z.literal("raised", { message: `Deviations opened by hand have source "raised"; the others (${DEVIATION_SOURCES.join(", ")}) open by themselves.` }).optional(),
});

/** PATCH /api/studies/{id}/deviations/{deviationId}: the open deviation's fields, or { close: true, reason }. */
export const deviationPatchSchema = z.union([
  z.object({ close: z.literal(true), reason: required(1000, "The reason for closing") }),
  z.object({ impact: text(4000, "The impact assessment").optional(), rootCause: text(4000, "The root cause").optional(), capaReference: text(200, "The CAPA reference").optional() }).strict(),
]);

export const studySignatureSchema = z.object({
  password: z.string({ message: "Enter your password to sign." }).min(1, "Enter your password to sign."),
  meaning: z.enum(STUDY_SIGNATURE_MEANINGS, { message: `meaning must be one of ${STUDY_SIGNATURE_MEANINGS.join(", ")}.` }),
  reason: text(1000, "The reason").optional().nullable(),
});

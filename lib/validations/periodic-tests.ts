import { z } from "zod";
import { INDICATOR_SHEET_RESULTS, INDICATOR_TEST_KINDS, PERIODIC_RECORD_STATUSES, PERIODIC_SIGNATURE_MEANINGS, PRESSURE_UNITS, VERDICTS } from "@/lib/domain";
import { numberField, optionalNumberField } from "./equipment";

const common = {
  sterilizerId: z.string({ error: "Choose the sterilizer." }).min(1, "Choose the sterilizer."),
  performedAt: z
    .string({ error: "Enter when the test was done." })
    .trim()
    .min(1, "Enter when the test was done.")
    .refine((s) => !Number.isNaN(Date.parse(s)), "Enter when the test was done as a date and time.")
    // A few minutes' slack for clocks that disagree; a test cannot be recorded before it happens.
    .refine((s) => Date.parse(s) <= Date.now() + 10 * 60_000, "The test time is in the future.")
    .transform((s) => new Date(s).toISOString()),
  notes: z
    .string()
    .trim()
    .max(1000, "Keep the notes under 1000 characters.")
    .optional()
    .transform((s) => (s ? s : null)),
};

const pressureUnit = z.enum(PRESSURE_UNITS, { error: "Choose the pressure unit." });

export const airLeakageSchema = z.object({
  ...common,
  unit: pressureUnit,
  // Absolute pressures in a vacuum test are small; 0–120 kPa whatever the unit is checked after conversion.
  p1: numberField("p1", { min: 0, max: 1e6 }),
  p2: numberField("p2", { min: 0, max: 1e6 }),
  p3: numberField("p3", { min: 0, max: 1e6 }),
});

/** A file field of a form: a browser sends an empty, nameless file when none was chosen. */
export type UploadedBlob = { name: string; size: number; arrayBuffer(): Promise<ArrayBuffer> };
const isChosenFile = (v: unknown): v is UploadedBlob => typeof v === "object" && v !== null && "arrayBuffer" in v && "size" in v && ((v as UploadedBlob).size > 0 || !!(v as UploadedBlob).name);

/** The indicator sheet of a Bowie-Dick test: its reading, its lot and a photo of it (checked for type and size by the service). */
export const indicatorSheetFields = {
  outcome: z.enum(INDICATOR_SHEET_RESULTS, { error: "Say whether the indicator sheet changed colour uniformly." }),
  indicatorLot: z.string({ error: "Enter the indicator's lot number." }).trim().min(1, "Enter the indicator's lot number.").max(80, "Keep the lot number under 80 characters."),
  photo: z.custom<UploadedBlob>(isChosenFile, "Attach a photo of the indicator sheet (JPEG or PNG, up to 10 MB)."),
};

export const bowieDickSchema = z.object({
  ...common,
  ...indicatorSheetFields,
  // The same indicator record serves the hollow load (helix) test of a type B small sterilizer.
  kind: z.enum(INDICATOR_TEST_KINDS, { error: "Choose the Bowie-Dick or the hollow load test." }).default("bowie-dick"),
});

/** The sheet of a Bowie-Dick cycle; a second reading replaces the first only with a reason. */
export const cycleIndicatorSheetSchema = z.object({
  ...indicatorSheetFields,
  reason: z
    .string()
    .trim()
    .max(500, "Keep the reason under 500 characters.")
    .optional()
    .transform((s) => (s ? s : null)),
});

export const periodicSignatureSchema = z.object({
  password: z.string({ error: "Enter your password to sign." }).min(1, "Enter your password to sign."),
  meaning: z.enum(PERIODIC_SIGNATURE_MEANINGS, { error: "Choose what your signature means: approved, failure confirmed or returned." }),
  reason: z
    .string()
    .trim()
    .max(1000, "Keep the reason under 1000 characters.")
    .optional()
    .nullable()
    .transform((s) => (s ? s : null)),
});

export const nonCondensableGasSchema = z.object({
  ...common,
  gasVolumeMl: numberField("the gas volume V_g", { min: 0, max: 1000, unit: "ml" }),
  condensateVolumeMl: numberField("the condensate volume V_c", { min: 0.1, max: 5000, unit: "ml" }),
});

export const superheatSchema = z
  .object({
    ...common,
    expansionTempC: numberField("the expansion temperature", { min: 50, max: 250, unit: "°C" }),
    atmosphereSource: z.enum(["pressure", "altitude"], { error: "Choose how the local atmospheric pressure is known." }),
    atmosphereKpa: optionalNumberField("the atmospheric pressure", { min: 30, max: 110, unit: "kPa" }),
    altitudeM: optionalNumberField("the altitude", { min: -500, max: 9000, unit: "m" }),
  })
  .superRefine((v, ctx) => {
    if (v.atmosphereSource === "pressure" && v.atmosphereKpa === null) ctx.addIssue({ code: "custom", path: ["atmosphereKpa"], message: "Enter the local barometric pressure." });
    if (v.atmosphereSource === "altitude" && v.altitudeM === null) ctx.addIssue({ code: "custom", path: ["altitudeM"], message: "Enter the site's altitude." });
  });

export const drynessSchema = z.object({
  ...common,
  initialWaterTempC: numberField("T0", { min: 0, max: 100, unit: "°C" }),
  finalWaterTempC: numberField("T1", { min: 0, max: 100, unit: "°C" }),
  waterMassKg: numberField("the water mass m_w", { min: 0.01, max: 5, unit: "kg" }),
  condensateMassKg: numberField("the condensate mass m_c", { min: 0.001, max: 2, unit: "kg" }),
  steamTempC: numberField("the steam temperature T_s", { min: 100, max: 200, unit: "°C" }),
  load: z.enum(["metal", "other"], { error: "Choose the kind of load." }),
});

export const periodicTestFiltersSchema = z.object({
  sterilizer: z.string().optional().catch(undefined),
  kind: z.string().optional().catch(undefined),
  result: z.enum(VERDICTS).optional().catch(undefined),
  status: z.enum(PERIODIC_RECORD_STATUSES).optional().catch(undefined),
  from: z
    .string()
    .regex(/^\d{4}-\d{2}-\d{2}$/)
    .optional()
    .catch(undefined),
  to: z
    .string()
    .regex(/^\d{4}-\d{2}-\d{2}$/)
    .optional()
    .catch(undefined),
  page: z.coerce.number().int().min(1).optional().catch(undefined),
});

import { z } from "zod";
import { PRESSURE_UNITS, VERDICTS } from "@/lib/domain";
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

export const bowieDickSchema = z.object({
  ...common,
  outcome: z.enum(["uniform", "non-uniform"], { error: "Say whether the indicator changed uniformly." }),
  indicatorLot: z
    .string()
    .trim()
    .max(80)
    .optional()
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

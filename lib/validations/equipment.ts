import { z } from "zod";
import { DEFAULT_FREE_SPACE } from "@/lib/analysis/types";
import { AIR_LEAKAGE_TEST, basisShortfalls, PERIODIC_TEST_KINDS, PROFILE_BASES, type ProfileLimitsInput } from "@/lib/domain";

/** A number typed into a form: decimal comma accepted, an empty field is "missing", not 0. */
export function numberField(what: string, { min, max, unit = "", integer = false }: { min: number; max: number; unit?: string; integer?: boolean }) {
  const range = `between ${min} and ${max}${unit ? ` ${unit}` : ""}`;
  return z
    .string({ error: `Enter ${what}.` })
    .trim()
    .min(1, `Enter ${what}.`)
    .transform((s) => Number(s.replace(/\s/g, "").replace(",", ".")))
    .pipe(
      z
        .number({ error: `${capitalise(what)} must be a number.` })
        .refine((n) => Number.isFinite(n), `${capitalise(what)} must be a number.`)
        .refine((n) => !integer || Number.isInteger(n), `${capitalise(what)} must be a whole number.`)
        .refine((n) => n >= min && n <= max, `${capitalise(what)} must be ${range}.`),
    );
}

/** The same, but an empty field means "not given". */
export function optionalNumberField(what: string, limits: { min: number; max: number; unit?: string; integer?: boolean }) {
  const required = numberField(what, limits);
  return z
    .string()
    .optional()
    .transform((s, ctx): number | null => {
      if (s === undefined || s.trim() === "") return null;
      const parsed = required.safeParse(s);
      if (parsed.success) return parsed.data;
      ctx.addIssue({ code: "custom", message: parsed.error.issues[0]?.message ?? `Check ${what}.` });
      return z.NEVER;
    });
}

/** A field older clients do not send at all takes the standard's figure; one sent empty is still "missing". */
function withDefault(value: number, field: ReturnType<typeof numberField>) {
  return z.preprocess((v) => (v === undefined ? String(value) : v), field);
}

const capitalise = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `Keep this under ${max} characters.`)
    .optional()
    .transform((s) => (s ? s : null));

// An unticked checkbox sends nothing at all.
const checkbox = z
  .string()
  .optional()
  .transform((v) => v === "on" || v === "true");

/** Taking a sterilizer out of use or releasing it: a signed decision with its reason. */
export const sterilizerStatusSchema = z.object({
  status: z.enum(["in-use", "out-of-use"], { error: "Choose whether the sterilizer is to be in use or out of use." }),
  reason: z.string({ error: "Give the reason for this decision." }).trim().min(3, "Give the reason for this decision; it is signed and goes into the audit ledger.").max(500),
  password: z.string({ error: "Enter your password to sign." }).min(1, "Enter your password to sign."),
});

export const reasonField = z.string({ error: "Give a reason for the change; it goes into the audit ledger." }).trim().min(3, "Give a reason for the change; it goes into the audit ledger.").max(500);

const sterilizerFields = {
  name: z.string({ error: "Enter a name." }).trim().min(2, "Enter a name of at least 2 characters.").max(120),
  serialNumber: z.string({ error: "Enter the serial number." }).trim().min(1, "Enter the serial number from the rating plate.").max(80),
  model: optionalText(200),
  location: optionalText(200),
  chamberVolumeL: numberField("the chamber volume", { min: 1, max: 20000, unit: "l" }),
  airDetectorFitted: checkbox,
  defaultProfileId: z
    .string()
    .optional()
    .transform((s) => (s ? s : null)),
};

// Ticked by default on the form: a vacuum sterilizer starts with its daily and weekly tests required before use.
export const createSterilizerSchema = z.object({ ...sterilizerFields, vacuumAirRemoval: checkbox });
export const updateSterilizerSchema = z.object({
  ...sterilizerFields,
  id: z.string().min(1),
  active: checkbox,
  reason: reasonField,
});
export type SterilizerInput = Omit<z.infer<typeof createSterilizerSchema>, "vacuumAirRemoval">;

export const saveScheduleSchema = z.object({
  sterilizerId: z.string().min(1),
  kind: z.enum(PERIODIC_TEST_KINDS, { error: "Choose a test." }),
  intervalDays: numberField("the interval", { min: 1, max: 1100, unit: "days", integer: true }),
  requiredBeforeUse: checkbox,
  reason: z
    .string()
    .trim()
    .max(500)
    .optional()
    .transform((s) => (s ? s : null)),
});
export const removeScheduleSchema = z.object({
  sterilizerId: z.string().min(1),
  kind: z.enum(PERIODIC_TEST_KINDS),
  reason: reasonField,
});

const profileFields = {
  name: z.string({ error: "Enter a name." }).trim().min(3, "Enter a name of at least 3 characters, e.g. “134 °C / 3 min porous load”.").max(120),
  sterilizationTempC: numberField("the sterilization temperature", { min: 100, max: 140, unit: "°C" }),
  bandK: numberField("the band width", { min: 0.5, max: 10, unit: "K" }),
  holdingTimeS: numberField("the holding time", { min: 1, max: 36000, unit: "s" }),
  maxEquilibrationS: numberField("the equilibration limit", { min: 1, max: 600, unit: "s" }),
  maxSpreadK: numberField("the spread limit", { min: 0.1, max: 10, unit: "K" }),
  saturationLimitK: numberField("the saturation limit", { min: 0.1, max: 10, unit: "K" }),
  f0ReferenceC: numberField("the F0 reference temperature", { min: 100, max: 140, unit: "°C" }),
  f0ZK: numberField("the z-value", { min: 1, max: 50, unit: "K" }),
  // Empty: the analysis takes 3× the record's median sampling interval as the longest allowed.
  maxSampleIntervalS: optionalNumberField("the longest sampling interval", { min: 0.1, max: 600, unit: "s" }),
  freeSpaceEarlyK: withDefault(DEFAULT_FREE_SPACE.freeSpaceEarlyK, numberField("the free-space allowance at the plateau start", { min: 0.1, max: 20, unit: "K" })),
  freeSpaceEarlyS: withDefault(DEFAULT_FREE_SPACE.freeSpaceEarlyS, numberField("how long that allowance lasts", { min: 0, max: 600, unit: "s" })),
  freeSpaceK: withDefault(DEFAULT_FREE_SPACE.freeSpaceK, numberField("the free-space allowance after that", { min: 0.1, max: 20, unit: "K" })),
  leakRateLimitKpaPerMin: withDefault(AIR_LEAKAGE_TEST.maxLeakRateKpaPerMin, numberField("the air leakage limit", { min: 0.01, max: 5, unit: "kPa/min" })),
  leakVacuumSetPointKpaAbs: withDefault(AIR_LEAKAGE_TEST.vacuumSetPointKpaAbs, numberField("the air leakage vacuum set point", { min: 0.1, max: 50, unit: "kPa abs" })),
  basis: z.enum(PROFILE_BASES, { error: "Choose the basis of these limits: a standard, or local practice with its reason." }),
  basisReason: z
    .string()
    .trim()
    .max(500, "The reason can have at most 500 characters.")
    .optional()
    .transform((s) => (s ? s : null)),
};

/** A profile weaker than the standard it names is refused, each shortfall beside its field with the standard's minimum. */
function meetsItsBasis(p: ProfileLimitsInput, ctx: z.RefinementCtx) {
  for (const s of basisShortfalls(p)) ctx.addIssue({ code: "custom", path: [s.field], message: s.message });
}

export const createProfileSchema = z.object(profileFields).superRefine(meetsItsBasis);
export const updateProfileSchema = z.object({ ...profileFields, id: z.string().min(1), reason: reasonField }).superRefine(meetsItsBasis);
export type ProfileInput = z.infer<typeof createProfileSchema>;

export const INSTRUMENT_KINDS = ["logger", "pressure-sensor", "temperature-probe", "reference-thermometer"] as const;

export const createInstrumentSchema = z.object({
  name: z.string({ error: "Enter a name." }).trim().min(2, "Enter a name of at least 2 characters.").max(120),
  serialNumber: z.string({ error: "Enter the serial number." }).trim().min(1, "Enter the serial number.").max(80),
  kind: z.enum(INSTRUMENT_KINDS, { error: "Choose what kind of instrument this is." }),
  channelCount: optionalNumberField("the number of channels", { min: 1, max: 256, integer: true }),
});

const isoDate = (what: string) =>
  z
    .string({ error: `Enter ${what}.` })
    .trim()
    .regex(/^\d{4}-\d{2}-\d{2}$/, `Enter ${what} as a date.`)
    .refine((s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)) && new Date(`${s}T00:00:00Z`).toISOString().startsWith(s), `${capitalise(what)} is not a real date.`);

export const addCertificateSchema = z
  .object({
    instrumentId: z.string().min(1),
    certificateNumber: z.string({ error: "Enter the certificate number." }).trim().min(1, "Enter the certificate number.").max(80),
    issuedBy: z.string({ error: "Enter who issued the certificate." }).trim().min(2, "Enter the calibration laboratory that issued it.").max(160),
    calibratedOn: isoDate("the calibration date"),
    dueOn: isoDate("the due date"),
    uncertaintyK: optionalNumberField("the uncertainty", { min: 0, max: 10, unit: "K" }),
    notes: optionalText(500),
  })
  .superRefine((v, ctx) => {
    if (v.dueOn <= v.calibratedOn) ctx.addIssue({ code: "custom", path: ["dueOn"], message: "The due date must come after the calibration date." });
  });

export const clearMappingSchema = z.object({ instrumentId: z.string().min(1), reason: reasonField });

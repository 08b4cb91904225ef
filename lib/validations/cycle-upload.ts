import { z } from "zod";
import { TEST_KINDS } from "@/db/schema";

const PRESSURE_UNITS = ["Pa", "kPa", "MPa", "bar", "mbar", "psi", "mmHg", "inHg"] as const;

export const mappingSchema = z
  .object({
    timeColumn: z.string().optional(),
    pressureColumn: z.string().optional(),
    pressureUnit: z.enum(PRESSURE_UNITS).optional(),
    pressureGauge: z.boolean().optional(),
    temperatureUnit: z.enum(["C", "F", "K"]).optional(),
    referenceColumn: z.string().optional(),
    columns: z
      .record(z.string(), z.object({ role: z.enum(["time", "temperature", "pressure", "ignored"]), unit: z.string().optional(), gauge: z.boolean().optional() }))
      .optional(),
    atmosphereKpa: z.number().positive().max(200).optional(),
  })
  .strict();

/** The text fields of POST /api/cycles (the intake form validates the same on the client). */
export const createCycleFieldsSchema = z.object({
  sterilizerId: z.string({ message: "Choose the sterilizer." }).uuid("Choose the sterilizer."),
  profileId: z.string({ message: "Choose the acceptance profile." }).uuid("Choose the acceptance profile."),
  instrumentId: z.union([z.literal(""), z.string().uuid("Choose a listed instrument.")]).optional(),
  cycleNumber: z.string().trim().max(60, "The cycle number has at most 60 characters.").optional(),
  load: z.string().trim().max(500, "The load description has at most 500 characters.").optional(),
  testKind: z.enum(TEST_KINDS, { message: "Choose the kind of test." }).optional(),
});

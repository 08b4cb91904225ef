import { z } from "zod";
import { LOAD_LOT_MAX_CHARS, LOAD_TYPES, PRESSURE_UNITS, SENSOR_NOTE_MAX_CHARS, SENSOR_POSITIONS, TEMPERATURE_UNITS, TEST_KINDS } from "@/lib/domain";

/** File names the intake accepts: the text exports that loggers write. */
export const LOGGER_FILE_EXTENSIONS = [".csv", ".txt", ".tsv", ".dat", ".log"] as const;

const emptyToUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);

/**
 * The cycle's own fields on POST /api/cycles (multipart form values are strings). Shared by the
 * intake form, which shows each message beside its field, and the route handler.
 */
export const createCycleFieldsSchema = z.object({
  sterilizerId: z.uuid({ message: "Choose the sterilizer that ran this cycle." }),
  profileId: z.uuid({ message: "Choose the acceptance profile to judge the cycle against." }),
  instrumentId: z.preprocess(emptyToUndefined, z.uuid({ message: "Choose an instrument from the list, or none." }).optional()),
  cycleNumber: z.preprocess(emptyToUndefined, z.string().trim().max(60, "The cycle number can have at most 60 characters.").optional()),
  load: z.preprocess(emptyToUndefined, z.string().trim().max(500, "The load description can have at most 500 characters.").optional()),
  testKind: z.preprocess(emptyToUndefined, z.enum(TEST_KINDS, { message: "Choose the kind of test this cycle was." }).default("thermometric-small-load")),
  loadType: z.preprocess(emptyToUndefined, z.enum(LOAD_TYPES, { message: "Choose the test pack or load from the list." }).optional()),
  loadLot: z.preprocess(emptyToUndefined, z.string().trim().max(LOAD_LOT_MAX_CHARS, `The lot or batch can have at most ${LOAD_LOT_MAX_CHARS} characters.`).optional()),
  // Only when a file's SHA-256 already belongs to another cycle of the site: why (one file holding several cycles).
  duplicateReason: z.preprocess(emptyToUndefined, z.string().trim().max(500, "The reason for the shared file can have at most 500 characters.").optional()),
  // Needed only when the file holds elapsed times without a date; a time without a zone is the site's.
  startedAt: z.preprocess(
    emptyToUndefined,
    z
      .string()
      .trim()
      .regex(/^\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(:\d{2}([.,]\d+)?)?([zZ]|[+-]\d{2}:?\d{2})?$/, "Give the cycle's start as an ISO 8601 date and time, e.g. 2025-03-03T07:30.")
      .optional(),
  ),
});

export type CreateCycleFields = z.infer<typeof createCycleFieldsSchema>;

/** The optional `Idempotency-Key` header of POST /api/cycles: 1–200 printable ASCII characters. */
export const idempotencyKeySchema = z.string().regex(/^[\x20-\x7e]{1,200}$/, "The Idempotency-Key header must be 1 to 200 printable ASCII characters.");
export type CreateCycleField = keyof CreateCycleFields;

/**
 * The fields of POST /api/cycles/{id}/analyses beside the file and mapping: why the cycle is analysed again (required:
 * a correction leaves a trace), a shared file's reason, and the details that change with this analysis.
 */
export const correctionFieldsSchema = z.object({
  reason: z
    .string({ message: "Say why the cycle is analysed again (a new file, a new mapping or changed details): the reason is kept with the analysis." })
    .trim()
    .min(1, "Say why the cycle is analysed again (a new file, a new mapping or changed details): the reason is kept with the analysis.")
    .max(1000, "The reason can have at most 1000 characters."),
  duplicateReason: createCycleFieldsSchema.shape.duplicateReason,
  profileId: z.preprocess(emptyToUndefined, z.uuid({ message: "Choose the acceptance profile from the list." }).optional()),
  instrumentId: createCycleFieldsSchema.shape.instrumentId,
  load: createCycleFieldsSchema.shape.load,
  loadType: createCycleFieldsSchema.shape.loadType,
  loadLot: createCycleFieldsSchema.shape.loadLot,
});

export type CorrectionFields = z.infer<typeof correctionFieldsSchema>;

const columnRole = z.enum(["time", "temperature", "pressure", "ignored"]);

/** One channel's position in the chamber and its note, as the mapping carries it (lib/domain/sensor-positions). */
export const channelPlacementSchema = z
  .object({
    position: z.enum(SENSOR_POSITIONS, { message: `position must be one of ${SENSOR_POSITIONS.join(", ")}.` }),
    note: z.preprocess(emptyToUndefined, z.string().trim().max(SENSOR_NOTE_MAX_CHARS, `A position note can have at most ${SENSOR_NOTE_MAX_CHARS} characters.`).optional()),
  })
  .strict();

/** Placements by channel header. */
export const channelPlacementsSchema = z.record(z.string().min(1, "A position needs the channel's header."), channelPlacementSchema);

/** The `mapping` JSON of POST /api/cycles: the user's corrections to the guessed mapping (MappingOverrides). */
export const mappingOverridesSchema = z.object({
  timeColumn: z.string().min(1).optional(),
  pressureColumn: z.string().min(1).optional(),
  pressureUnit: z.enum(PRESSURE_UNITS).optional(),
  pressureGauge: z.boolean().optional(),
  temperatureUnit: z.enum(TEMPERATURE_UNITS).optional(),
  referenceColumn: z.string().min(1).optional(),
  columns: z.record(z.string(), z.object({ role: columnRole, unit: z.string().optional(), gauge: z.boolean().optional() })).optional(),
  atmosphereKpa: z.number().positive().max(200).optional(),
  // "" says there is no free-space sensor, even when a header reads "free space".
  freeSpaceColumn: z.string().optional(),
  // An air leakage test's file may hold only time and chamber pressure.
  temperaturesOptional: z.boolean().optional(),
  // Where each temperature channel's probe sat, by header (not used to read the file; kept with it).
  positions: channelPlacementsSchema.optional(),
});

/** The `leakMarks` JSON of an air leakage upload: times the user marked, s since the first sample (t2, t3 optional). */
export const leakMarksSchema = z
  .object({
    t1S: z.number({ error: "leakMarks.t1S must be the time the valves closed, in seconds since the first sample." }).finite().min(0, "leakMarks.t1S cannot be negative."),
    t2S: z.number().finite().min(0).optional(),
    t3S: z.number().finite().min(0).optional(),
  })
  .strict();

/** Reads the optional `leakMarks` field: undefined when absent, an error sentence when it is not valid. */
export function parseLeakMarks(raw: unknown): { marks?: z.infer<typeof leakMarksSchema>; error?: string } {
  if (typeof raw !== "string" || !raw.trim()) return {};
  let json: unknown;
  try {
    json = JSON.parse(raw);
  } catch {
    return { error: 'leakMarks is not valid JSON; send it as {"t1S": seconds since the first sample}.' };
  }
  const parsed = leakMarksSchema.safeParse(json);
  return parsed.success ? { marks: parsed.data } : { error: `leakMarks: ${parsed.error.issues[0]?.message ?? "not valid"}` };
}

/** A marked time typed in the form: "m:ss", "h:mm:ss" or seconds; null when empty, NaN when it cannot be read. */
export function parseElapsedInput(text: string): number | null {
  const t = text.trim().replace(",", ".");
  if (!t) return null;
  if (/^\d+(\.\d+)?$/.test(t)) return Number(t);
  const parts = t.split(":");
  if (parts.length < 2 || parts.length > 3 || !parts.every((p) => /^\d+(\.\d+)?$/.test(p))) return NaN;
  return parts.map(Number).reduce((total, part) => total * 60 + part, 0);
}

/** A column as the intake form edits it. */
export type EditableColumn = {
  index: number;
  header: string;
  role: "time" | "temperature" | "pressure" | "ignored";
  unit: string | null;
  /** pressure only: null until the header, a saved mapping or the user says absolute or gauge */
  gauge: boolean | null;
};

/**
 * Checks a mapping the user edited before it goes to the server: one time column, one pressure
 * column, at least one temperature column, and a reference channel among the temperatures.
 * Returns plain sentences; empty when the mapping can be analysed.
 */
export function mappingProblems(columns: readonly EditableColumn[], referenceColumn: string | null, options: { pressureOnly?: boolean } = {}): string[] {
  const problems: string[] = [];
  const times = columns.filter((c) => c.role === "time");
  const pressures = columns.filter((c) => c.role === "pressure");
  const temperatures = columns.filter((c) => c.role === "temperature");
  if (times.length === 0) problems.push("Mark one column as the time column.");
  if (times.length > 1) problems.push(`Only one column can be the time column; ${times.map((c) => `"${c.header}"`).join(" and ")} are both marked as time.`);
  if (pressures.length === 0) problems.push("Mark the chamber pressure column: the saturation check needs it.");
  if (pressures.length > 1) problems.push(`Only one column can be the chamber pressure; ${pressures.map((c) => `"${c.header}"`).join(" and ")} are both marked as pressure.`);
  // An air leakage test is judged on the chamber pressure alone (DOMAIN.md §2.5).
  if (temperatures.length === 0 && !options.pressureOnly) problems.push("Mark at least one temperature column.");
  for (const c of temperatures) {
    if (!c.unit || !(TEMPERATURE_UNITS as readonly string[]).includes(c.unit)) problems.push(`Choose the temperature unit of "${c.header}".`);
  }
  for (const c of pressures) {
    if (!c.unit || !(PRESSURE_UNITS as readonly string[]).includes(c.unit)) problems.push(`Choose the pressure unit of "${c.header}".`);
  }
  if (temperatures.length > 0 && (!referenceColumn || !temperatures.some((c) => c.header === referenceColumn))) {
    problems.push("Choose the reference channel (the chamber drain) among the temperature columns.");
  }
  return problems;
}

/** The sentence shown at the pressure column while nobody has said whether it reads absolute or gauge; null once settled. */
export function pressureReferenceProblem(columns: readonly EditableColumn[]): string | null {
  const pressure = columns.find((c) => c.role === "pressure");
  if (!pressure || pressure.gauge !== null) return null;
  return `Choose whether "${pressure.header}" reads absolute or gauge pressure: the file does not say, and the saturation check depends on it.`;
}

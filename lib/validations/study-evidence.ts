import { z } from "zod";
import { INDICATOR_KINDS, INDICATOR_RESULTS, RESULTS_OF_KIND } from "@/lib/domain";
import { parsePopulation } from "@/lib/domain/study-evidence";

/**
 * The forms of a study's evidence panels (indicators, deviations): FormData in, the services' inputs out. Limits as in
 * lib/validations/studies.ts (the API's), so what a form lets through the service accepts.
 */

const text = (what: string, max: number) =>
  z
    .string({ error: `Enter ${what}.` })
    .trim()
    .min(1, `Enter ${what}.`)
    .max(max, `Keep ${what} under ${max} characters.`);

const optionalText = (what: string, max: number) =>
  z
    .string()
    .trim()
    .max(max, `Keep ${what} under ${max} characters.`)
    .optional()
    .transform((s) => (s ? s : null));

/** A field the form always sends, possibly empty: an empty one clears it (the service audits old → new). */
const clearableText = (what: string, max: number) =>
  z
    .string()
    .trim()
    .max(max, `Keep ${what} under ${max} characters.`)
    .optional()
    .transform((s) => s ?? undefined);

const id = (what: string) =>
  z
    .string({ error: `Choose ${what}.` })
    .trim()
    .min(1, `Choose ${what}.`);

const readAt = z
  .string({ error: "Enter when the indicator was read." })
  .trim()
  .min(1, "Enter when the indicator was read.")
  .refine((s) => !Number.isNaN(Date.parse(s)), "Enter when the indicator was read as a date and time.")
  // A few minutes' slack for clocks that disagree; nobody reads an indicator in the future.
  .refine((s) => Date.parse(s) <= Date.now() + 10 * 60_000, "The reading time is in the future.")
  .transform((s) => new Date(s).toISOString());

export const indicatorFormSchema = z
  .object({
    studyId: id("the study"),
    runId: id("the run"),
    positionId: id("the position"),
    kind: z.enum(INDICATOR_KINDS, { error: "Choose biological or chemical indicator." }),
    result: z.enum(INDICATOR_RESULTS, { error: "Choose the result." }),
    organism: optionalText("the organism", 120),
    lot: text("the indicator's lot", 60),
    population: z
      .string()
      .trim()
      .optional()
      .transform((s, ctx): number | null => {
        if (!s) return null;
        const count = parsePopulation(s);
        if (count !== null && count <= 1e12) return count;
        ctx.addIssue({ code: "custom", message: "Enter the population per carrier as a number, e.g. 1.5e6 or 1.5 × 10^6." });
        return z.NEVER;
      }),
    incubation: optionalText("the incubation", 200),
    readBy: text("who read the indicator", 120),
    readAt,
    reason: optionalText("the reason", 1000),
  })
  .superRefine((input, ctx) => {
    if (!RESULTS_OF_KIND[input.kind].includes(input.result)) ctx.addIssue({ code: "custom", path: ["result"], message: "Choose a result that fits the kind of indicator." });
    if (input.kind !== "biological") return;
    // A biological reading without its organism, population or incubation cannot be judged against the protocol.
    if (!input.organism) ctx.addIssue({ code: "custom", path: ["organism"], message: "Enter the test organism of the biological indicator." });
    if (input.population === null) ctx.addIssue({ code: "custom", path: ["population"], message: "Enter the population per carrier, e.g. 1.5e6 or 1.5 × 10^6." });
    if (!input.incubation) ctx.addIssue({ code: "custom", path: ["incubation"], message: "Enter the incubation, e.g. 55–60 °C, 7 days." });
  })
  .transform(({ organism, population, incubation, ...input }) =>
    input.kind === "biological" ? { ...input, organism, population, incubation } : { ...input, organism: null, population: null, incubation: null },
  );

export const raiseDeviationSchema = z.object({
  studyId: id("the study"),
  runId: z
    .string()
    .trim()
    .optional()
    .transform((s) => (s ? s : null)),
  what: text("what happened", 2000),
  impact: clearableText("the impact assessment", 4000).transform((s) => s || undefined),
});

export const updateDeviationSchema = z.object({
  studyId: id("the study"),
  deviationId: id("the deviation"),
  impact: clearableText("the impact assessment", 4000),
  rootCause: clearableText("the root cause", 4000),
  capaReference: clearableText("the CAPA reference", 200),
});

export const closeDeviationSchema = z.object({
  studyId: id("the study"),
  deviationId: id("the deviation"),
  reason: text("why the deviation is closed", 2000),
});

export type IndicatorFormInput = z.infer<typeof indicatorFormSchema>;

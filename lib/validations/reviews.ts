import { z } from "zod";
import { SIGNATURE_MEANINGS, SIGNING_MEANINGS, type SigningMeaning } from "@/lib/domain";

const meaningWords = SIGNING_MEANINGS.join(", ");

export const signatureSchema = z
  .object({
    password: z.string({ message: "Enter your password to sign." }).min(1, "Enter your password to sign."),
    meaning: z.enum(SIGNATURE_MEANINGS, { message: `meaning must be one of ${meaningWords}.` }),
    reason: z.string().trim().max(1000, "The reason has at most 1000 characters.").optional().nullable(),
    /** the reviewer has seen that the current logger file differs from the first one (start time, channels) */
    acknowledgeReplacement: z.boolean({ message: "acknowledgeReplacement must be true or false." }).optional(),
  })
  .refine((v) => v.meaning !== "returned" || (v.reason && v.reason.length > 0), { message: "Give the reason for returning the cycle.", path: ["reason"] });

export type SignatureBody = Omit<z.infer<typeof signatureSchema>, "meaning"> & { meaning: SigningMeaning };

export type SignatureParse = { ok: true; data: SignatureBody } | { ok: false; status: 400 | 422; message: string; field?: string };

/**
 * The signature body of POST /api/cycles/{id}/signatures. The legacy meaning `rejected` is refused with 422: a
 * failing test is either confirmed as failed or returned for correction, never left in between.
 */
export function parseSignatureBody(body: unknown): SignatureParse {
  const parsed = signatureSchema.safeParse(body);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    return { ok: false, status: 400, message: issue?.message ?? "The signature could not be read.", field: issue?.path[0] ? String(issue.path[0]) : undefined };
  }
  const { meaning, ...rest } = parsed.data;
  if (meaning === "rejected") {
    return {
      ok: false,
      status: 422,
      message: "The meaning rejected is no longer used: use returned (back to the technician, with a reason) or failure-confirmed (the test failed and closes as a signed failure).",
      field: "meaning",
    };
  }
  return { ok: true, data: { ...rest, meaning } };
}

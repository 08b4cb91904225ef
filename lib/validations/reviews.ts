import { z } from "zod";
import { SIGNATURE_MEANINGS } from "@/lib/domain";

export const signatureSchema = z
  .object({
    password: z.string({ message: "Enter your password to sign." }).min(1, "Enter your password to sign."),
    meaning: z.enum(SIGNATURE_MEANINGS, { message: "meaning must be reviewed, approved or rejected." }),
    reason: z.string().trim().max(1000, "The reason has at most 1000 characters.").optional().nullable(),
  })
  .refine((v) => v.meaning !== "rejected" || (v.reason && v.reason.length > 0), { message: "Give the reason for rejecting.", path: ["reason"] });

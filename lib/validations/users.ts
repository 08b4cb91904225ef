import { z } from "zod";
import { ROLES } from "@/lib/domain";

const password = z.string().min(10, "The password must have at least 10 characters.").max(200);

export const createUserSchema = z.object({
  email: z.string().trim().toLowerCase().email("Enter a valid e-mail address."),
  name: z.string().trim().min(2, "Enter the person's full name, as it should appear on signatures.").max(120),
  role: z.enum(ROLES, { message: "Choose a role." }),
  password,
});

export const updateUserSchema = z.object({
  id: z.string().uuid(),
  role: z.enum(ROLES).optional(),
  disabled: z
    .enum(["true", "false"])
    .transform((v) => v === "true")
    .optional(),
  reason: z.string().trim().max(500).optional(),
});

export const resetPasswordSchema = z.object({
  id: z.string().uuid(),
  password,
});

import { z } from "zod";
import { ROLES } from "@/lib/domain";

export const createUserSchema = z.object({
  email: z.string().trim().toLowerCase().email("Enter a valid e-mail address."),
  name: z.string().trim().min(2, "Enter the person's full name, as it should appear on signatures.").max(120),
  role: z.enum(ROLES, { message: "Choose a role." }),
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
});

export const unlockUserSchema = z.object({
  id: z.string().uuid(),
  reason: z.string().trim().min(3, "Say why the account is unlocked (it goes into the audit ledger).").max(500),
});

/** The rules themselves (length, common passwords, history) are checked by the service with lib/auth/password-rules. */
export const ownPasswordSchema = z
  .object({
    currentPassword: z.string().min(1, "Enter your current password.").max(200),
    newPassword: z.string().min(1, "Enter the new password.").max(200, "The password must have at most 200 characters."),
    confirmPassword: z.string(),
  })
  .refine((v) => v.newPassword === v.confirmPassword, { message: "The two new passwords differ.", path: ["confirmPassword"] });

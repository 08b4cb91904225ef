import { z } from "zod";
import { API_TOKEN_DEFAULT_DAYS, API_TOKEN_MAX_DAYS } from "@/lib/domain";
import { reasonField } from "./equipment";

export const issueApiTokenSchema = z.object({
  name: z.string().trim().min(2, "Name the token after the gateway or logger that will use it.").max(80, "Keep the name under 80 characters."),
  expiresInDays: z.coerce
    .number({ error: "Give the token's lifetime in whole days." })
    .int("Give the token's lifetime in whole days.")
    .min(1, "A token lives at least 1 day.")
    .max(API_TOKEN_MAX_DAYS, `A token lives at most ${API_TOKEN_MAX_DAYS} days (one year); issue a new one before it expires.`)
    .default(API_TOKEN_DEFAULT_DAYS),
  // The form sends the chosen sterilizers as one comma-separated field; none chosen: every sterilizer of the site.
  sterilizerIds: z
    .string()
    .optional()
    .transform((text) =>
      (text ?? "")
        .split(",")
        .map((id) => id.trim())
        .filter(Boolean),
    )
    .pipe(z.array(z.string().uuid("Choose the sterilizers from the list.")).max(100)),
});

export const revokeApiTokenSchema = z.object({
  id: z.string().uuid("Choose the token to revoke."),
  reason: reasonField,
});

"use server";

import { formAction } from "@/lib/actions";
import { ownPasswordSchema } from "@/lib/validations/users";
import { changeOwnPassword } from "@/lib/services/account";

export const changeOwnPasswordAction = formAction("account:own-password", ownPasswordSchema, async ({ currentPassword, newPassword }, actor) => {
  await changeOwnPassword({ actor, currentPassword, newPassword });
  return "Your password is changed and every session of your account has ended, this one included. Sign in again with the new password.";
});

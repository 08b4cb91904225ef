"use server";

import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/actions";
import { createUserSchema, resetPasswordSchema, unlockUserSchema, updateUserSchema } from "@/lib/validations/users";
import { createUser, resetPassword, unlockUser, updateUser } from "@/lib/services/users";

export const createUserAction = formAction("users:manage", createUserSchema, async (input, actor) => {
  const { oneTimePassword } = await createUser({ actor, input });
  revalidatePath("/admin/users");
  return `${input.name} can sign in as ${input.email} with the one-time password ${oneTimePassword} and will then choose their own. It is shown only now: hand it over through a separate channel.`;
});

export const updateUserAction = formAction("users:manage", updateUserSchema, async ({ id, role, disabled, reason }, actor) => {
  await updateUser({ actor, id, changes: { role, disabled }, reason });
  revalidatePath("/admin/users");
  return "The account was updated.";
});

export const resetPasswordAction = formAction("users:manage", resetPasswordSchema, async ({ id }, actor) => {
  const { oneTimePassword } = await resetPassword({ actor, id });
  revalidatePath("/admin/users");
  return `New one-time password: ${oneTimePassword}. It is shown only now: hand it over through a separate channel. The person's sessions have ended.`;
});

export const unlockUserAction = formAction("users:manage", unlockUserSchema, async ({ id, reason }, actor) => {
  await unlockUser({ actor, id, reason });
  revalidatePath("/admin/users");
  return "The account is unlocked.";
});

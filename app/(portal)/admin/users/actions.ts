"use server";

import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/actions";
import { createUserSchema, resetPasswordSchema, updateUserSchema } from "@/lib/validations/users";
import { createUser, updateUser } from "@/lib/services/users";

export const createUserAction = formAction("users:manage", createUserSchema, async (input, actor) => {
  await createUser({ actor, input });
  revalidatePath("/admin/users");
  return `${input.name} can now sign in as ${input.email}.`;
});

export const updateUserAction = formAction("users:manage", updateUserSchema, async ({ id, role, disabled, reason }, actor) => {
  await updateUser({ actor, id, changes: { role, disabled }, reason });
  revalidatePath("/admin/users");
  return "The account was updated.";
});

export const resetPasswordAction = formAction("users:manage", resetPasswordSchema, async ({ id, password }, actor) => {
  await updateUser({ actor, id, changes: { password } });
  revalidatePath("/admin/users");
  return "The password was reset. Tell the person through a separate channel.";
});

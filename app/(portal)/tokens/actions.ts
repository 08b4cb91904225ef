"use server";

import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/actions";
import type { FormState } from "@/lib/form-state";
import { issueApiTokenSchema, revokeApiTokenSchema } from "@/lib/validations/api-tokens";
import { issueApiToken, revokeApiToken } from "@/lib/services/api-tokens";

export type IssueTokenState = FormState & { token?: string };

/** Issues a token and hands it back this once, beside the usual form state; Papin keeps only its hash. */
export async function issueApiTokenAction(previous: IssueTokenState, formData: FormData): Promise<IssueTokenState> {
  let token: string | undefined;
  const issue = formAction("api-token:manage", issueApiTokenSchema, async (input, actor) => {
    const issued = await issueApiToken({ actor, input });
    token = issued.token;
    revalidatePath("/tokens");
    return `The token "${input.name}" was issued. Copy it now: Papin keeps only its fingerprint and cannot show it again.`;
  });
  const state = await issue(previous, formData);
  return { ...state, token: state.status === "ok" ? token : undefined };
}

export const revokeApiTokenAction = formAction("api-token:manage", revokeApiTokenSchema, async ({ id, reason }, actor) => {
  await revokeApiToken({ actor, id, reason });
  revalidatePath("/tokens");
  return "The token was revoked; the gateway using it is refused from now on.";
});

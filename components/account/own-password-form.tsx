"use client";

import { useActionState } from "react";
import { signOut } from "next-auth/react";
import { changeOwnPasswordAction } from "@/app/account/password/actions";
import { ActionMessage } from "@/components/ui/action-message";
import { IDLE_FORM_STATE } from "@/lib/form-state";

const FIELDS = [
  { name: "currentPassword", label: "Current password (the one-time password, if you were given one)", autoComplete: "current-password" },
  { name: "newPassword", label: "New password", autoComplete: "new-password" },
  { name: "confirmPassword", label: "New password again", autoComplete: "new-password" },
] as const;

export function OwnPasswordForm({ email }: { email: string }) {
  const [state, action, pending] = useActionState(changeOwnPasswordAction, IDLE_FORM_STATE);
  const err = state.fieldErrors ?? {};
  if (state.status === "ok") {
    return (
      <div className="mt-4 space-y-3">
        <ActionMessage state={state} />
        <button type="button" className="btn-primary w-full" onClick={() => signOut({ callbackUrl: "/sign-in" })}>
          Sign in again
        </button>
      </div>
    );
  }
  return (
    <form action={action} className="mt-4 space-y-3" noValidate>
      {/* lets a password manager file the new password under the right account */}
      <input type="email" name="username" autoComplete="username" value={email} readOnly hidden />
      {FIELDS.map((f) => (
        <div key={f.name}>
          <label className="field-label" htmlFor={f.name}>
            {f.label}
          </label>
          <input id={f.name} name={f.name} type="password" autoComplete={f.autoComplete} className="field-input" aria-invalid={!!err[f.name]} />
          {err[f.name] && <p className="field-error">{err[f.name]}</p>}
        </div>
      ))}
      <ActionMessage state={state} />
      <button className="btn-primary w-full" disabled={pending}>
        {pending ? "Saving…" : "Save the new password"}
      </button>
    </form>
  );
}

"use client";

import { useActionState, useState } from "react";
import { createUserAction, resetPasswordAction, unlockUserAction, updateUserAction } from "@/app/(portal)/admin/users/actions";
import { ActionMessage } from "@/components/ui/action-message";
import { IDLE_FORM_STATE } from "@/lib/form-state";
import { ROLE_LABELS, ROLES, type Role } from "@/lib/domain";

export function CreateUserForm() {
  const [state, action, pending] = useActionState(createUserAction, IDLE_FORM_STATE);
  const err = state.fieldErrors ?? {};
  return (
    <form action={action} className="space-y-3" noValidate>
      <div>
        <label className="field-label" htmlFor="new-name">
          Full name (printed on signatures)
        </label>
        <input id="new-name" name="name" className="field-input" aria-invalid={!!err.name} />
        {err.name && <p className="field-error">{err.name}</p>}
      </div>
      <div>
        <label className="field-label" htmlFor="new-email">
          E-mail
        </label>
        <input id="new-email" name="email" type="email" className="field-input" aria-invalid={!!err.email} />
        {err.email && <p className="field-error">{err.email}</p>}
      </div>
      <div>
        <label className="field-label" htmlFor="new-role">
          Role
        </label>
        <select id="new-role" name="role" className="field-input" defaultValue="technician">
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {ROLE_LABELS[r]}
            </option>
          ))}
        </select>
        {err.role && <p className="field-error">{err.role}</p>}
      </div>
      <p className="text-xs text-ink-muted">Papin makes a one-time password and shows it once; the person chooses their own at first sign-in.</p>
      <ActionMessage state={state} />
      <button className="btn-primary w-full" disabled={pending}>
        {pending ? "Adding…" : "Add user"}
      </button>
    </form>
  );
}

type RowUser = { id: string; name: string; role: Role; disabled: boolean; locked: boolean };

export function UserRowActions({ user, self }: { user: RowUser; self: boolean }) {
  const [state, action, pending] = useActionState(updateUserAction, IDLE_FORM_STATE);
  const [pwState, pwAction, pwPending] = useActionState(resetPasswordAction, IDLE_FORM_STATE);
  const [unlockState, unlockAction, unlockPending] = useActionState(unlockUserAction, IDLE_FORM_STATE);
  const [showReset, setShowReset] = useState(false);
  return (
    <div className="flex min-w-[16rem] flex-col gap-1.5">
      <form action={action} className="flex items-center gap-1.5">
        <input type="hidden" name="id" value={user.id} />
        <label className="sr-only" htmlFor={`role-${user.id}`}>
          Role of {user.name}
        </label>
        <select id={`role-${user.id}`} name="role" defaultValue={user.role} disabled={self} className="field-input py-1 text-xs">
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {ROLE_LABELS[r]}
            </option>
          ))}
        </select>
        <button className="btn-secondary px-2 py-1 text-xs" disabled={pending || self}>
          Save role
        </button>
      </form>
      <div className="flex gap-1.5">
        {!self && (
          <form action={action}>
            <input type="hidden" name="id" value={user.id} />
            <input type="hidden" name="disabled" value={user.disabled ? "false" : "true"} />
            <button className={`${user.disabled ? "btn-secondary" : "btn-danger"} px-2 py-1 text-xs`} disabled={pending}>
              {user.disabled ? "Enable" : "Disable"}
            </button>
          </form>
        )}
        <button type="button" className="btn-secondary px-2 py-1 text-xs" onClick={() => setShowReset((v) => !v)} aria-expanded={showReset}>
          Reset password
        </button>
      </div>
      {showReset && (
        <form action={pwAction} className="flex items-center gap-1.5">
          <input type="hidden" name="id" value={user.id} />
          <span className="text-xs text-ink-muted">A one-time password replaces {user.name}&rsquo;s and ends their sessions.</span>
          <button className="btn-primary px-2 py-1 text-xs" disabled={pwPending}>
            Make one
          </button>
        </form>
      )}
      {user.locked && (
        <form action={unlockAction} className="flex gap-1.5">
          <input type="hidden" name="id" value={user.id} />
          <label className="sr-only" htmlFor={`unlock-${user.id}`}>
            Why unlock {user.name}
          </label>
          <input id={`unlock-${user.id}`} name="reason" placeholder="Why unlock (for the ledger)" className="field-input py-1 text-xs" aria-invalid={!!unlockState.fieldErrors?.reason} />
          <button className="btn-secondary px-2 py-1 text-xs" disabled={unlockPending}>
            Unlock
          </button>
        </form>
      )}
      <ActionMessage state={state} />
      <ActionMessage state={pwState} />
      <ActionMessage state={unlockState} />
    </div>
  );
}

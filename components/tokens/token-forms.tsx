"use client";

import { useActionState, useState } from "react";
import { issueApiTokenAction, revokeApiTokenAction, type IssueTokenState } from "@/app/(portal)/tokens/actions";
import { ActionMessage } from "@/components/ui/action-message";
import { TextInput, useFormAction } from "@/components/equipment/form-bits";
import { API_TOKEN_DEFAULT_DAYS, API_TOKEN_MAX_DAYS } from "@/lib/domain";

type SterilizerChoice = { id: string; name: string; serialNumber: string; active: boolean };

const IDLE: IssueTokenState = { status: "idle" };

export function IssueTokenForm({ sterilizers }: { sterilizers: SterilizerChoice[] }) {
  const [state, action, pending] = useActionState(issueApiTokenAction, IDLE);
  const [chosen, setChosen] = useState<ReadonlySet<string>>(new Set());
  const errors = state.fieldErrors ?? {};
  const toggle = (id: string) => setChosen((previous) => (previous.has(id) ? new Set([...previous].filter((x) => x !== id)) : new Set(previous).add(id)));
  return (
    <form action={action} className="space-y-3" noValidate>
      <TextInput id="token-name" name="name" label="Name" hint="The gateway or logger that will use it, e.g. “Gateway, sterile services room 2”." error={errors.name} />
      <TextInput
        id="token-days"
        name="expiresInDays"
        type="number"
        inputMode="numeric"
        label="Expires after"
        suffix="days"
        defaultValue={API_TOKEN_DEFAULT_DAYS}
        hint={`At most ${API_TOKEN_MAX_DAYS} days. Issue a new token before this one expires.`}
        error={errors.expiresInDays}
      />
      <input type="hidden" name="sterilizerIds" value={[...chosen].join(",")} />
      <fieldset className="space-y-1">
        <legend className="field-label">Sterilizers</legend>
        {sterilizers.map((s) => (
          <label key={s.id} className="flex items-center gap-2 text-sm">
            <input type="checkbox" checked={chosen.has(s.id)} onChange={() => toggle(s.id)} />
            <span>{s.name}</span>
            <span className="mono text-ink-muted">{s.serialNumber}</span>
            {!s.active && <span className="text-xs text-ink-muted">(retired)</span>}
          </label>
        ))}
        {errors.sterilizerIds ? <p className="field-error">{errors.sterilizerIds}</p> : <p className="text-xs text-ink-muted">None ticked: every sterilizer of the site.</p>}
      </fieldset>
      <ActionMessage state={state} />
      {state.token && <IssuedToken token={state.token} />}
      <button className="btn-primary w-full" disabled={pending}>
        {pending ? "Issuing…" : "Issue token"}
      </button>
    </form>
  );
}

/** The new token, shown this once with a copy button; it is gone when the page is left. */
function IssuedToken({ token }: { token: string }) {
  const [copied, setCopied] = useState(false);
  const copy = async () => {
    await navigator.clipboard.writeText(token);
    setCopied(true);
  };
  return (
    <div className="space-y-2 rounded-md border border-brass-500/40 bg-brass-50 p-3" data-testid="issued-token">
      <label className="field-label" htmlFor="issued-token">
        The new token (shown once)
      </label>
      <input id="issued-token" readOnly value={token} className="field-input mono text-xs" onFocus={(e) => e.currentTarget.select()} />
      <p className="text-xs text-ink-soft">Send it as the header Authorization: Bearer … from the gateway. Keep it like a password.</p>
      <button type="button" className="btn-secondary px-2 py-1 text-xs" onClick={copy}>
        {copied ? "Copied" : "Copy token"}
      </button>
    </div>
  );
}

export function RevokeTokenForm({ id, name }: { id: string; name: string }) {
  const { state, pending, onSubmit, onChange, errors, formRef } = useFormAction(revokeApiTokenAction);
  const [open, setOpen] = useState(false);
  if (!open) {
    return (
      <button type="button" className="btn-danger px-2 py-1 text-xs" onClick={() => setOpen(true)}>
        Revoke
      </button>
    );
  }
  return (
    <form ref={formRef} onSubmit={onSubmit} onChange={onChange} className="flex min-w-[14rem] flex-col gap-1.5" noValidate>
      <input type="hidden" name="id" value={id} />
      <label className="sr-only" htmlFor={`revoke-${id}`}>
        Why is {name} revoked?
      </label>
      <input id={`revoke-${id}`} name="reason" placeholder="Reason (for the audit ledger)" className="field-input py-1 text-xs" aria-invalid={!!errors.reason} />
      {errors.reason && <p className="field-error">{errors.reason}</p>}
      <div className="flex gap-1.5">
        <button className="btn-danger px-2 py-1 text-xs" disabled={pending}>
          {pending ? "Revoking…" : "Revoke now"}
        </button>
        <button type="button" className="btn-secondary px-2 py-1 text-xs" onClick={() => setOpen(false)}>
          Cancel
        </button>
      </div>
      <ActionMessage state={state} compact />
    </form>
  );
}

"use client";

import { useActionState } from "react";
import { IDLE_FORM_STATE } from "@/lib/form-state";
import { ActionMessage } from "@/components/ui/action-message";
import { retryMailAction, sendDueMailAction } from "./actions";

/**
 * Rendered on every row, so that the outcome of a retry stays on screen after the row turns
 * "sent" and the button goes away.
 */
export function RetryMailButton({ id, subject, canRetry }: { id: string; subject: string; canRetry: boolean }) {
  const [state, action, pending] = useActionState(retryMailAction, IDLE_FORM_STATE);
  if (!canRetry) return <ActionMessage state={state} compact className="mt-1 max-w-xs" />;
  return (
    <form action={action}>
      <input type="hidden" name="id" value={id} />
      <button className="btn-secondary whitespace-nowrap px-2 py-1 text-xs" disabled={pending} aria-label={`Retry now: ${subject}`}>
        {pending ? "Sending…" : "Retry now"}
      </button>
      <ActionMessage state={state} compact className="mt-1 max-w-xs" />
    </form>
  );
}

export function SendDueMailButton({ disabled }: { disabled?: boolean }) {
  const [state, action, pending] = useActionState(sendDueMailAction, IDLE_FORM_STATE);
  return (
    <form action={action} className="flex flex-col items-end">
      <button className="btn-primary" disabled={pending || disabled}>
        {pending ? "Sending…" : "Send due mail now"}
      </button>
      <ActionMessage state={state} compact className="mt-1 max-w-xs" />
    </form>
  );
}

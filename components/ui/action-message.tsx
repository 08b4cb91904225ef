import type { FormState } from "./form-state";

/** The outcome of a server action next to the control that ran it: an alert or a polite status. */
export function ActionMessage({ state, className = "" }: { state: FormState; className?: string }) {
  if (state.status === "idle" || !state.message) return null;
  return (
    <p
      role={state.status === "error" ? "alert" : "status"}
      className={`rounded-md px-2 py-1 text-xs ${state.status === "error" ? "bg-fail-50 text-fail-700" : "bg-pass-50 text-pass-700"} ${className}`}
    >
      {state.message}
    </p>
  );
}

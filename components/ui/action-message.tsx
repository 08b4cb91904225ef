import type { FormState } from "@/lib/form-state";

/**
 * The outcome of a server action next to the control that ran it: an alert or a polite status,
 * marked ✓/✕ so it never rests on colour alone. `compact` fits it inside a table row.
 */
export function ActionMessage({ state, compact = false, className = "" }: { state: FormState; compact?: boolean; className?: string }) {
  if (state.status === "idle" || !state.message) return null;
  const error = state.status === "error";
  const size = compact ? "px-2 py-1 text-xs" : "px-3 py-2 text-sm";
  return (
    <p role={error ? "alert" : "status"} className={`rounded-md ${size} ${error ? "bg-fail-50 text-fail-700" : "bg-pass-50 text-pass-700"} ${className}`}>
      {error ? "✕ " : "✓ "}
      {state.message}
    </p>
  );
}

/**
 * The one state shape of every form backed by a server action: `useActionState` keeps it,
 * `formAction` (lib/actions.ts) returns it, `ActionMessage` (components/ui) shows it.
 */
export type FormState = {
  status: "idle" | "ok" | "error";
  message?: string;
  fieldErrors?: Record<string, string>;
  /** where the form goes next after success (a record it created); the form navigates there */
  href?: string;
};

export const IDLE_FORM_STATE: FormState = { status: "idle" };

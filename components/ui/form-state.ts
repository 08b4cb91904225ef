export type FormState = { status: "idle" | "ok" | "error"; message?: string; fieldErrors?: Record<string, string> };
export const IDLE_STATE: FormState = { status: "idle" };

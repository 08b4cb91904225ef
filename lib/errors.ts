/** The one error type that route handlers and actions turn into a status and a plain sentence. */
export class AppError extends Error {
  constructor(
    readonly status: 400 | 401 | 403 | 404 | 409 | 413 | 422 | 423 | 429 | 500 | 503,
    message: string,
    readonly field?: string,
  ) {
    super(message);
    this.name = "AppError";
  }
}

/**
 * A database that stayed locked past its busy timeout (SQLITE_BUSY / SQLITE_LOCKED, from the embedded file or a
 * libSQL server) is a moment's contention, not a fault: the caller gets 503 and may try again; nothing was written.
 */
export function databaseBusy(error: unknown): AppError | null {
  for (let e: unknown = error, depth = 0; e && depth < 4; e = (e as { cause?: unknown }).cause, depth++) {
    const code = String((e as { code?: unknown }).code ?? "");
    const message = e instanceof Error ? e.message : "";
    if (/SQLITE_(BUSY|LOCKED)/.test(code) || /SQLITE_(BUSY|LOCKED)|database is locked/.test(message)) {
      return new AppError(503, "The database is busy with another change. Nothing was changed; please try again in a moment.");
    }
  }
  return null;
}

export const notFound = (what = "That record") => new AppError(404, `${what} was not found.`);

/** One problem a zod schema found, as much of it as the plain sentence needs (zod's own issue type fits it). */
export type SchemaIssue = { code: string; path: readonly PropertyKey[]; message: string; expected?: unknown; minimum?: unknown; maximum?: unknown; origin?: unknown; input?: unknown };

// zod's built-in English messages ("Invalid input: expected string, received undefined", "Too small: …"): Papin's
// schemas write their own sentences, so one of these means a field without one, to be put in plain words here.
const ZOD_DEFAULT_MESSAGE = /^(Invalid|Too small|Too big|Unrecognized key)/;
// Trailing words of a parameter name that are units or plumbing, not what a person calls the field.
const NAME_TAIL_WORDS = new Set(["id", "ids", "s", "c", "k", "kpa", "abs", "l", "m", "ml", "kg", "per", "min", "pct"]);

/** What a person calls a field named by its parameter: "sterilizerId" → "the sterilizer", "holdingTimeS" → "the holding time". */
export function fieldLabel(path: readonly PropertyKey[]): string {
  const name = [...path].reverse().find((p): p is string => typeof p === "string");
  if (!name) return "the request";
  const words = name
    .replace(/([a-z0-9])([A-Z])/g, "$1 $2")
    .replace(/[-_]+/g, " ")
    .toLowerCase()
    .split(/\s+/)
    .filter(Boolean);
  while (words.length > 1 && NAME_TAIL_WORDS.has(words.at(-1)!)) words.pop();
  return `the ${words.join(" ")}`;
}

const capitalise = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

/**
 * The sentence a person reads for one schema problem: the schema's own message, or for zod's built-in wording a plain
 * sentence naming the field, never the parameter's name or zod's jargon.
 */
export function plainIssueMessage(issue: SchemaIssue): string {
  if (!ZOD_DEFAULT_MESSAGE.test(issue.message)) return issue.message;
  const label = fieldLabel(issue.path);
  const missing = issue.code === "invalid_type" && / received undefined$/.test(issue.message);
  switch (issue.code) {
    case "invalid_type":
      return missing ? `Enter ${label}: it is missing.` : `${capitalise(label)} is not in a form Papin can read: ${issue.expected === "number" ? "enter a number" : "enter it as text"}.`;
    case "too_small":
      return issue.origin === "string" && Number(issue.minimum) <= 1 ? `Enter ${label}.` : `Too small or too short: ${label} must be at least ${String(issue.minimum)}.`;
    case "too_big":
      return `Too large or too long: ${label} may be at most ${String(issue.maximum)}.`;
    case "invalid_value":
      return `Choose ${label} from the values offered.`;
    case "unrecognized_keys":
      return "The request carries a field Papin does not expect; send only the form's fields.";
    default:
      return `${capitalise(label)} is not valid; check it and try again.`;
  }
}

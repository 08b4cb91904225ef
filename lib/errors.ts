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

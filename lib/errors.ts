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

export const notFound = (what = "That record") => new AppError(404, `${what} was not found.`);

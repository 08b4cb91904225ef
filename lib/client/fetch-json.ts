/**
 * The one way a client component talks to Papin's route handlers: JSON (or a FormData upload)
 * in, the parsed JSON body out, and on any failure a `RequestError` whose message is the plain
 * sentence the server gave (`{ "error": … }`), or one of our own when the server could not be
 * reached or did not answer JSON.
 */
export class RequestError extends Error {
  constructor(
    message: string,
    /** HTTP status; 0 when the server could not be reached. */
    readonly status: number,
    /** The form field the server named, when it named one. */
    readonly field?: string,
  ) {
    super(message);
    this.name = "RequestError";
  }
}

export type FetchJsonOptions = {
  method?: "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
  /** Sent as JSON with `Content-Type: application/json`. */
  json?: unknown;
  /** Sent as multipart/form-data (uploads). */
  form?: FormData;
  headers?: Record<string, string>;
  signal?: AbortSignal;
  /** What is being fetched, for the fallback messages: "the chart data", "the cycle list"… */
  what?: string;
};

export async function fetchJson<T>(url: string, options: FetchJsonOptions = {}): Promise<T> {
  const what = options.what ?? "the server's answer";
  const headers: Record<string, string> = { accept: "application/json", ...options.headers };
  let body: BodyInit | undefined;
  if (options.form) body = options.form;
  else if (options.json !== undefined) {
    headers["content-type"] = "application/json";
    body = JSON.stringify(options.json);
  }
  let response: Response;
  try {
    response = await fetch(url, { method: options.method ?? (body ? "POST" : "GET"), headers, body, signal: options.signal });
  } catch (error) {
    if (error instanceof DOMException && error.name === "AbortError") throw error;
    throw new RequestError(`${capitalise(what)} could not be reached. Check the connection and try again.`, 0);
  }
  const data = (await response.json().catch(() => undefined)) as unknown;
  if (!response.ok) {
    const payload = (data ?? {}) as { error?: unknown; field?: unknown };
    const message = typeof payload.error === "string" ? payload.error : `${capitalise(what)} could not be loaded (HTTP ${response.status}).`;
    throw new RequestError(message, response.status, typeof payload.field === "string" ? payload.field : undefined);
  }
  if (data === undefined) throw new RequestError(`${capitalise(what)} came back unreadable (not JSON).`, response.status);
  return data as T;
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

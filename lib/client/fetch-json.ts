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
  return answerOf<T>(response.ok, response.status, data, what, `${capitalise(what)} could not be loaded (HTTP ${response.status}).`);
}

/** The parsed body of a successful answer, or the RequestError carrying the server's sentence (else `fallback`). */
function answerOf<T>(ok: boolean, status: number, data: unknown, what: string, fallback: string): T {
  if (!ok) {
    const payload = (data ?? {}) as { error?: unknown; field?: unknown };
    const message = typeof payload.error === "string" ? payload.error : fallback;
    throw new RequestError(message, status, typeof payload.field === "string" ? payload.field : undefined);
  }
  if (data === undefined) throw new RequestError(`${capitalise(what)} came back unreadable (not JSON).`, status);
  return data as T;
}

/** How far an upload has got: bytes going out, then the server working on them. */
export type UploadProgress = { stage: "uploading"; fraction: number; loaded: number; total: number } | { stage: "processing" };

export type UploadOptions = {
  onProgress: (progress: UploadProgress) => void;
  signal?: AbortSignal;
  /** What is being sent, for the fallback messages: "the upload", "the logger file"… */
  what?: string;
};

/**
 * POSTs a FormData upload and reports its progress, which fetch cannot do, hence XMLHttpRequest.
 * Answers as fetchJson does: the parsed JSON body, or a RequestError with a plain sentence; a
 * cancelled upload rejects with the same AbortError that fetch gives.
 */
export function uploadJson<T>(url: string, form: FormData, options: UploadOptions): Promise<T> {
  const what = options.what ?? "the upload";
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", url);
    xhr.responseType = "text";
    xhr.setRequestHeader("accept", "application/json");
    xhr.upload.onprogress = (event) => {
      const total = event.lengthComputable ? event.total : 0;
      options.onProgress({ stage: "uploading", fraction: total ? event.loaded / total : 0, loaded: event.loaded, total });
    };
    xhr.upload.onload = () => options.onProgress({ stage: "processing" });
    xhr.onload = () => {
      let data: unknown;
      try {
        data = xhr.responseText ? JSON.parse(xhr.responseText) : undefined;
      } catch {
        data = undefined;
      }
      try {
        resolve(answerOf<T>(xhr.status >= 200 && xhr.status < 300, xhr.status, data, what, uploadFallback(xhr.status)));
      } catch (error) {
        reject(error);
      }
    };
    xhr.onerror = () => reject(new RequestError(`${capitalise(what)} did not reach the server. Check the network connection and try again; nothing was saved.`, 0));
    xhr.onabort = () => reject(new DOMException(`${capitalise(what)} was cancelled.`, "AbortError"));
    options.signal?.addEventListener("abort", () => xhr.abort());
    options.onProgress({ stage: "uploading", fraction: 0, loaded: 0, total: 0 });
    xhr.send(form);
  });
}

function uploadFallback(status: number): string {
  if (status === 401) return "Your session has ended. Sign in again, then repeat the upload.";
  if (status === 403) return "Your role does not allow this upload.";
  if (status === 413) return "The upload is larger than the server accepts.";
  return `The server answered ${status} without an explanation. Nothing was saved; please try again.`;
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/**
 * Posts a multipart form with XMLHttpRequest, because fetch cannot report upload progress.
 * Stages: "uploading" with a fraction while bytes go out, then "processing" while the server works.
 */
export type SendProgress = { stage: "uploading"; fraction: number; loaded: number; total: number } | { stage: "processing" };

export type SendResult<T> = { ok: true; status: number; body: T } | { ok: false; status: number; error: string; field?: string };

export function sendForm<T>(url: string, form: FormData, onProgress: (p: SendProgress) => void, signal?: AbortSignal): Promise<SendResult<T>> {
  return new Promise((resolve) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", url);
    xhr.responseType = "text";
    xhr.setRequestHeader("accept", "application/json");
    xhr.upload.onprogress = (event) => {
      const total = event.lengthComputable ? event.total : 0;
      onProgress({ stage: "uploading", fraction: total ? event.loaded / total : 0, loaded: event.loaded, total });
    };
    xhr.upload.onload = () => onProgress({ stage: "processing" });
    xhr.onload = () => {
      let body: unknown = null;
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : null;
      } catch {
        body = null;
      }
      if (xhr.status >= 200 && xhr.status < 300 && body !== null) {
        resolve({ ok: true, status: xhr.status, body: body as T });
        return;
      }
      const problem = body as { error?: unknown; field?: unknown } | null;
      resolve({
        ok: false,
        status: xhr.status,
        error: typeof problem?.error === "string" ? problem.error : messageForStatus(xhr.status),
        field: typeof problem?.field === "string" ? problem.field : undefined,
      });
    };
    xhr.onerror = () => resolve({ ok: false, status: 0, error: "The upload did not reach the server. Check the network connection and try again; nothing was saved." });
    xhr.onabort = () => resolve({ ok: false, status: 0, error: "The upload was cancelled; nothing was saved." });
    signal?.addEventListener("abort", () => xhr.abort());
    onProgress({ stage: "uploading", fraction: 0, loaded: 0, total: 0 });
    xhr.send(form);
  });
}

function messageForStatus(status: number): string {
  if (status === 401) return "Your session has ended. Sign in again, then repeat the upload.";
  if (status === 403) return "Your role does not allow you to register cycles.";
  if (status === 413) return "The upload is larger than the server accepts.";
  return `The server answered ${status} without an explanation. Nothing was saved; please try again.`;
}

import "server-only";
import { env } from "./env";
import { AppError } from "./errors";
import { zodMessage } from "./http";
import { mappingOverridesSchema } from "./validations/intake";
import type { MappingOverrides } from "./logger-files";

const MAX_FILES_PER_UPLOAD = 10;

function uploadLimitBytes(): number {
  return env().PAPIN_UPLOAD_LIMIT_MB * 1024 * 1024;
}

/** Reads a multipart body, refusing oversize requests before they are buffered when the length is known. */
export async function readMultipart(request: Request): Promise<FormData> {
  const limit = uploadLimitBytes();
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > limit * MAX_FILES_PER_UPLOAD + 1024 * 1024) {
    throw new AppError(413, `The upload is ${(declared / 1048576).toFixed(1)} MB; Papin accepts at most ${MAX_FILES_PER_UPLOAD} files of ${env().PAPIN_UPLOAD_LIMIT_MB} MB each.`);
  }
  const type = request.headers.get("content-type") ?? "";
  if (!type.includes("multipart/form-data")) throw new AppError(400, "Send the files as multipart/form-data.");
  try {
    return await request.formData();
  } catch {
    throw new AppError(400, "The upload could not be read as multipart form data.");
  }
}

export type ReceivedFile = { name: string; bytes: Uint8Array; contentType: string };

export async function filesOf(form: FormData, field: string): Promise<ReceivedFile[]> {
  const limit = uploadLimitBytes();
  const entries = form.getAll(field).filter((v): v is File => typeof v === "object" && v !== null && "arrayBuffer" in v);
  if (entries.length > MAX_FILES_PER_UPLOAD) throw new AppError(413, `Attach at most ${MAX_FILES_PER_UPLOAD} files at once.`, field);
  const out: ReceivedFile[] = [];
  for (const file of entries) {
    if (file.size > limit) {
      throw new AppError(413, `${file.name} is ${(file.size / 1048576).toFixed(1)} MB; the limit is ${env().PAPIN_UPLOAD_LIMIT_MB} MB per file.`, field);
    }
    out.push({ name: (file.name || "upload").slice(0, 255), bytes: new Uint8Array(await file.arrayBuffer()), contentType: file.type });
  }
  return out;
}

/** The optional `mapping` field of an upload: JSON of the user's corrections to the guessed mapping. */
export function mappingFromForm(form: FormData): MappingOverrides | undefined {
  const raw = form.get("mapping");
  if (typeof raw !== "string" || !raw.trim()) return undefined;
  let json: unknown;
  try {
    json = JSON.parse(raw);
  } catch {
    throw new AppError(400, "mapping is not valid JSON.", "mapping");
  }
  const parsed = mappingOverridesSchema.safeParse(json);
  if (!parsed.success) throw new AppError(400, `mapping: ${zodMessage(parsed.error)}`, "mapping");
  return parsed.data;
}

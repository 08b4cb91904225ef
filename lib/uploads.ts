import "server-only";
import busboy from "busboy";
import { createWriteStream, type WriteStream } from "node:fs";
import { mkdir, mkdtemp, readFile, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import type { ReadableStream as NodeReadableStream } from "node:stream/web";
import { env } from "./env";
import { AppError } from "./errors";
import { zodMessage } from "./http";
import { sha256Hex } from "./integrity";
import { channelPlacementsSchema, mappingOverridesSchema } from "./validations/intake";
import type { MappingOverrides } from "./logger-files";
import { plural } from "@/lib/domain";
import type { ChannelPlacements } from "./domain";

/** Text fields are ids, short descriptions and the mapping JSON; none comes near this. */
export const FIELD_VALUE_LIMIT_BYTES = 64 * 1024;
const MAX_TEXT_FIELDS = 50;
/** Room beside the files for the text fields and the multipart framing. */
const FRAMING_ALLOWANCE_BYTES = 1024 * 1024;
const SPOOL_ROOT = path.join(tmpdir(), "papin-uploads");
const MB = 1024 * 1024;

export type UploadLimits = { fileBytes: number; maxFiles: number; totalBytes: number };

/** Per file PAPIN_UPLOAD_LIMIT_MB; per request that many files (PAPIN_UPLOAD_MAX_FILES, or fewer where a route takes fewer) plus the fields. */
export function uploadLimits(maxFiles?: number): UploadLimits {
  const { PAPIN_UPLOAD_LIMIT_MB, PAPIN_UPLOAD_MAX_FILES } = env();
  const fileBytes = Math.floor(PAPIN_UPLOAD_LIMIT_MB * MB);
  const files = Math.min(maxFiles ?? PAPIN_UPLOAD_MAX_FILES, PAPIN_UPLOAD_MAX_FILES);
  return { fileBytes, maxFiles: files, totalBytes: fileBytes * files + FRAMING_ALLOWANCE_BYTES };
}

export type ReceivedFile = { name: string; bytes: Uint8Array; contentType: string };
type FormFile = ReceivedFile & { field: string };

/** A parsed upload: its text fields (FormData-like `get`/`entries`) and its files, already within the limits. */
export class UploadForm {
  constructor(
    private readonly fieldPairs: Array<[string, string]>,
    readonly files: FormFile[],
  ) {}

  get(name: string): string | null {
    return this.fieldPairs.find(([key]) => key === name)?.[1] ?? null;
  }

  entries(): IterableIterator<[string, string]> {
    return this.fieldPairs.values();
  }

  /** A hash of what was sent (fields in name order, each file's field, name and bytes), independent of the multipart boundary. */
  digest(): string {
    const fields = [...this.fieldPairs].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    const files = this.files.map((f) => [f.field, f.name, sha256Hex(f.bytes)]);
    return sha256Hex(JSON.stringify({ fields, files }));
  }
}

export type MultipartOptions = {
  /** the only fields that may carry files; a file in any other field is refused */
  fileFields: readonly string[];
  /** at most this many files (never more than PAPIN_UPLOAD_MAX_FILES) */
  maxFiles?: number;
};

const tooLarge = (limits: UploadLimits) =>
  new AppError(413, `The upload is larger than ${(limits.totalBytes / MB).toFixed(0)} MB; Papin accepts at most ${limits.maxFiles} file(s) of ${limits.fileBytes / MB} MB each.`);

/**
 * Reads a multipart body as a stream: refused from its declared length before reading, and cut off with 413 the
 * moment a file or the whole request passes its limit (a chunked body too). Files are spooled to a temporary
 * folder while the body streams, so junk never sits in memory, and read back only once the request is complete.
 */
export async function readMultipart(request: Request, options: MultipartOptions): Promise<UploadForm> {
  const limits = uploadLimits(options.maxFiles);
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > limits.totalBytes) throw tooLarge(limits);
  const type = request.headers.get("content-type") ?? "";
  if (!type.toLowerCase().includes("multipart/form-data")) throw new AppError(400, "Send the files as multipart/form-data.");
  if (!request.body) throw new AppError(400, "The upload is empty: send the files as multipart/form-data.");
  await mkdir(SPOOL_ROOT, { recursive: true });
  const dir = await mkdtemp(path.join(SPOOL_ROOT, "upload-"));
  try {
    const spooled = await spool(request.body, type, dir, options.fileFields, limits);
    const files: FormFile[] = [];
    for (const file of spooled.files) {
      // A file input left empty still sends a part with no name and no bytes.
      if (!file.named && file.sizeBytes === 0) continue;
      files.push({ field: file.field, name: file.name, contentType: file.contentType, bytes: await readFile(file.path) });
    }
    return new UploadForm(spooled.fields, files);
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

type SpooledFile = { field: string; name: string; named: boolean; contentType: string; path: string; sizeBytes: number };

function spool(body: ReadableStream<Uint8Array>, contentType: string, dir: string, fileFields: readonly string[], limits: UploadLimits) {
  return new Promise<{ fields: Array<[string, string]>; files: SpooledFile[] }>((resolve, reject) => {
    const source = Readable.fromWeb(body as NodeReadableStream<Uint8Array>);
    let parser: busboy.Busboy;
    try {
      parser = busboy({
        headers: { "content-type": contentType },
        defParamCharset: "utf8",
        limits: { fileSize: limits.fileBytes, files: limits.maxFiles + 1, fields: MAX_TEXT_FIELDS, fieldSize: FIELD_VALUE_LIMIT_BYTES, parts: limits.maxFiles + MAX_TEXT_FIELDS + 1 },
      });
    } catch {
      source.destroy();
      reject(new AppError(400, "The upload's Content-Type names no multipart boundary, so it cannot be read."));
      return;
    }
    const fields: Array<[string, string]> = [];
    const files: SpooledFile[] = [];
    const outputs: WriteStream[] = [];
    const writes: Array<Promise<void>> = [];
    let receivedBytes = 0;
    let settled = false;

    const fail = (error: AppError) => {
      if (settled) return;
      settled = true;
      // Stop reading: destroying the node stream cancels the request's body stream.
      source.unpipe(parser);
      source.destroy();
      // Busboy may still be inside the write that raised the limit; tear it down once that call has returned.
      setImmediate(() => {
        parser.destroy();
        for (const out of outputs) out.destroy();
      });
      reject(error);
    };

    source.on("data", (chunk: Uint8Array) => {
      receivedBytes += chunk.byteLength;
      if (receivedBytes > limits.totalBytes) fail(tooLarge(limits));
    });
    source.on("error", () => fail(new AppError(400, "The upload was interrupted before it was complete; nothing was saved.")));

    parser.on("field", (name, value, info) => {
      if (info.nameTruncated || info.valueTruncated) return fail(new AppError(413, `The field ${name} is longer than ${FIELD_VALUE_LIMIT_BYTES / 1024} KB.`, name));
      fields.push([name, value]);
    });
    parser.on("file", (name, stream, info) => {
      // Destroying the parser on a refusal errors the open file stream; the refusal already says why.
      stream.on("error", () => undefined);
      if (settled) return stream.resume();
      if (!fileFields.includes(name)) {
        stream.resume();
        return fail(new AppError(400, `This upload takes files only in the field ${fileFields.join(" or ")}; a file came in the field ${name}.`, name));
      }
      if (files.length >= limits.maxFiles) {
        stream.resume();
        return fail(new AppError(413, `Attach at most ${plural(limits.maxFiles, "file")} at once.`, name));
      }
      const file: SpooledFile = {
        field: name,
        name: (info.filename || "upload").slice(0, 255),
        named: Boolean(info.filename),
        contentType: info.mimeType,
        path: path.join(dir, String(files.length)),
        sizeBytes: 0,
      };
      files.push(file);
      stream.on("data", (chunk: Uint8Array) => (file.sizeBytes += chunk.byteLength));
      stream.on("limit", () => fail(new AppError(413, `${file.name} is larger than ${limits.fileBytes / MB} MB, the limit per file.`, name)));
      const out = createWriteStream(file.path);
      outputs.push(out);
      writes.push(pipeline(stream, out).catch(() => fail(new AppError(400, `${file.name} could not be received completely; nothing was saved.`, name))));
    });
    parser.on("filesLimit", () => fail(new AppError(413, `Attach at most ${plural(limits.maxFiles, "file")} at once.`)));
    parser.on("fieldsLimit", () => fail(new AppError(413, `The upload has more than ${MAX_TEXT_FIELDS} form fields.`)));
    parser.on("partsLimit", () => fail(new AppError(413, `The upload has more than ${limits.maxFiles + MAX_TEXT_FIELDS} parts.`)));
    parser.on("error", () => fail(new AppError(400, "The upload could not be read as multipart form data.")));
    parser.on("close", () => {
      void Promise.all(writes).then(() => {
        if (settled) return;
        settled = true;
        resolve({ fields, files });
      });
    });
    source.pipe(parser);
  });
}

/** The files of one field of an upload (each already within the per-file limit). */
export async function filesOf(form: UploadForm, field: string): Promise<ReceivedFile[]> {
  return form.files.filter((f) => f.field === field).map(({ name, bytes, contentType }) => ({ name, bytes, contentType }));
}

/** The optional `mapping` field of an upload: JSON of the user's corrections to the guessed mapping. */
/** The optional `positions` JSON of a correction: sensor positions by channel header; undefined when absent. */
export function positionsFromForm(form: UploadForm): ChannelPlacements | undefined {
  const raw = form.get("positions");
  if (typeof raw !== "string" || !raw.trim()) return undefined;
  let json: unknown;
  try {
    json = JSON.parse(raw);
  } catch {
    throw new AppError(400, 'positions is not valid JSON; send it as {"<channel header>": {"position": "pack-centre", "note": "…"}}.', "positions");
  }
  const parsed = channelPlacementsSchema.safeParse(json);
  if (!parsed.success) throw new AppError(400, `positions: ${zodMessage(parsed.error)}`, "positions");
  return parsed.data;
}

export function mappingFromForm(form: UploadForm): MappingOverrides | undefined {
  const raw = form.get("mapping");
  if (typeof raw !== "string" || !raw.trim()) return undefined;
  let json: unknown;
  try {
    json = JSON.parse(raw);
  } catch {
    throw new AppError(400, "mapping is not valid JSON.", "mapping");
  }
  const parsed = mappingOverridesSchema.safeParse(json);
  if (!parsed.success) throw new AppError(400, `The column mapping is not valid: ${zodMessage(parsed.error)}`, "mapping");
  return parsed.data;
}

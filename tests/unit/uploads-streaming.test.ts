import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { mkdtempSync, readdirSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import type { AppError } from "@/lib/errors";

// The spool folder sits under os.tmpdir(): give this file its own, so the clean-up can be checked.
const ownTmp = mkdtempSync(path.join(tmpdir(), "papin-uploads-test-"));
const saved = { TMPDIR: process.env.TMPDIR, limit: process.env.PAPIN_UPLOAD_LIMIT_MB, files: process.env.PAPIN_UPLOAD_MAX_FILES };
let uploads: typeof import("@/lib/uploads");

beforeAll(async () => {
  process.env.TMPDIR = ownTmp;
  uploads = await import("@/lib/uploads");
});
beforeEach(() => {
  process.env.PAPIN_UPLOAD_LIMIT_MB = "1";
  process.env.PAPIN_UPLOAD_MAX_FILES = "3";
});
afterAll(() => {
  for (const [name, value] of [
    ["TMPDIR", saved.TMPDIR],
    ["PAPIN_UPLOAD_LIMIT_MB", saved.limit],
    ["PAPIN_UPLOAD_MAX_FILES", saved.files],
  ] as const) {
    if (value === undefined) delete process.env[name];
    else process.env[name] = value;
  }
  rmSync(ownTmp, { recursive: true, force: true });
});

const BOUNDARY = "papin-test-boundary";
const encoder = new TextEncoder();
const filePart = (field: string, name: string) => `--${BOUNDARY}\r\nContent-Disposition: form-data; name="${field}"; filename="${name}"\r\nContent-Type: text/csv\r\n\r\n`;
const fieldPart = (field: string, value: string) => `--${BOUNDARY}\r\nContent-Disposition: form-data; name="${field}"\r\n\r\n${value}\r\n`;
const headers = { "content-type": `multipart/form-data; boundary=${BOUNDARY}` };

/** A body that never ends: the head, then 64 KiB chunks of "1," for as long as anyone reads. Counts the chunks pulled. */
function endlessBody(head: string) {
  const counter = { pulls: 0 };
  const chunk = encoder.encode("1,".repeat(32 * 1024));
  const stream = new ReadableStream<Uint8Array>({
    start(controller) {
      controller.enqueue(encoder.encode(head));
    },
    pull(controller) {
      counter.pulls++;
      controller.enqueue(chunk);
    },
  });
  return { stream, counter };
}

const post = (body: BodyInit, extra: Record<string, string> = {}) => new Request("http://papin.test/api/x", { method: "POST", body, headers: { ...headers, ...extra }, duplex: "half" } as RequestInit);

async function refusal(promise: Promise<unknown>): Promise<AppError> {
  const error = await promise.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error, "the upload should have been refused").not.toBeNull();
  return error as AppError;
}

const spoolLeftovers = () => readdirSync(path.join(ownTmp, "papin-uploads"));

describe("streamed multipart intake (issue 11, bounded intake)", () => {
  it("cuts a chunked body without Content-Length off with 413 once it passes the request limit, and stops reading", async () => {
    // 1 MB per file × 1 file + 1 MB for fields: the request limit is 2 MiB (uploadLimits, worked by hand).
    // No boundary ever comes: the bytes are multipart preamble, which no per-file or per-field limit sees.
    const { stream, counter } = endlessBody("");
    const error = await refusal(uploads.readMultipart(post(stream), { fileFields: ["file"], maxFiles: 1 }));
    expect(error.status).toBe(413);
    expect(error.message).toBe("The upload is larger than 2 MB; Papin accepts at most 1 file(s) of 1 MB each.");
    const pullsAtRefusal = counter.pulls;
    // 2 MiB in 64 KiB chunks is 32 chunks; a little read-ahead is allowed, an endless read is not.
    expect(pullsAtRefusal).toBeLessThan(64);
    await new Promise((r) => setTimeout(r, 50));
    expect(counter.pulls).toBe(pullsAtRefusal);
    expect(spoolLeftovers()).toEqual([]);
  });

  it("cuts a file off with 413 at the per-file limit even while the request total is within its limit", async () => {
    const { stream, counter } = endlessBody(filePart("files", "big.csv"));
    const error = await refusal(uploads.readMultipart(post(stream), { fileFields: ["files"] }));
    expect(error.status).toBe(413);
    expect(error.message).toBe("big.csv is larger than 1 MB, the limit per file.");
    expect(error.field).toBe("files");
    expect(counter.pulls).toBeLessThan(32);
  });

  it("refuses from the declared Content-Length before reading a byte", async () => {
    const { stream, counter } = endlessBody(filePart("file", "declared.csv"));
    const error = await refusal(uploads.readMultipart(post(stream, { "content-length": String(50 * 1024 * 1024) }), { fileFields: ["file"], maxFiles: 1 }));
    expect(error.status).toBe(413);
    expect(counter.pulls).toBe(0);
  });

  it("refuses one file more than PAPIN_UPLOAD_MAX_FILES with 413 naming the field", async () => {
    const body = [1, 2, 3, 4].map((n) => `${filePart("files", `f${n}.csv`)}a,b\r\n`).join("") + `--${BOUNDARY}--\r\n`;
    const error = await refusal(uploads.readMultipart(post(body), { fileFields: ["files"] }));
    expect(error.status).toBe(413);
    expect(error.message).toBe("Attach at most 3 files at once.");
    expect(error.field).toBe("files");
  });

  it("refuses a second file where a route takes one, and a file in a field the route does not read", async () => {
    const two = [1, 2].map((n) => `${filePart("file", `f${n}.csv`)}a,b\r\n`).join("") + `--${BOUNDARY}--\r\n`;
    expect((await refusal(uploads.readMultipart(post(two), { fileFields: ["file"], maxFiles: 1 }))).status).toBe(413);
    const junk = `${filePart("file", "good.csv")}a,b\r\n${filePart("junk", "junk.bin")}xxxx\r\n--${BOUNDARY}--\r\n`;
    const error = await refusal(uploads.readMultipart(post(junk), { fileFields: ["file"], maxFiles: 1 }));
    expect(error.status).toBe(400);
    expect(error.field).toBe("junk");
  });

  it("refuses a text field longer than 64 KB with 413 naming it", async () => {
    const body = fieldPart("load", "x".repeat(64 * 1024 + 1)) + `--${BOUNDARY}--\r\n`;
    const error = await refusal(uploads.readMultipart(post(body), { fileFields: ["file"] }));
    expect(error.status).toBe(413);
    expect(error.field).toBe("load");
  });

  it("answers 400, not 500, to a body cut short and to a Content-Type without a boundary", async () => {
    const cut = `${filePart("file", "cut.csv")}a,b,c`;
    expect((await refusal(uploads.readMultipart(post(cut), { fileFields: ["file"] }))).status).toBe(400);
    const noBoundary = new Request("http://papin.test/api/x", { method: "POST", body: "x", headers: { "content-type": "multipart/form-data" } });
    expect((await refusal(uploads.readMultipart(noBoundary, { fileFields: ["file"] }))).status).toBe(400);
  });

  it("reads fields and files within the limits, byte for byte, and leaves nothing in the spool folder", async () => {
    const form = new FormData();
    form.set("cycleNumber", "C-1");
    form.set("load", "Prüfpaket – 7 kg");
    const csv = encoder.encode("time,T1\n0,20\n1,21\n");
    form.append("files", new Blob([csv], { type: "text/csv" }), "run.csv");
    form.append("files", new Blob([new Uint8Array(0)]), "");
    const parsed = await uploads.readMultipart(new Request("http://papin.test/api/x", { method: "POST", body: form }), { fileFields: ["files"] });
    expect(parsed.get("cycleNumber")).toBe("C-1");
    expect(parsed.get("load")).toBe("Prüfpaket – 7 kg");
    expect(parsed.get("missing")).toBeNull();
    // The empty part a file input sends when nothing was chosen is not a file.
    const files = await uploads.filesOf(parsed, "files");
    expect(files.map((f) => f.name)).toEqual(["run.csv"]);
    expect(Buffer.from(files[0].bytes).equals(Buffer.from(csv))).toBe(true);
    expect(spoolLeftovers()).toEqual([]);
  });

  it("gives the same digest for the same fields and files under another boundary, and another for other bytes", async () => {
    const body = (content: string, boundary: string) =>
      `--${boundary}\r\nContent-Disposition: form-data; name="a"\r\n\r\n1\r\n--${boundary}\r\nContent-Disposition: form-data; name="files"; filename="x.csv"\r\n\r\n${content}\r\n--${boundary}--\r\n`;
    const read = (content: string, boundary: string) =>
      uploads.readMultipart(new Request("http://papin.test/x", { method: "POST", body: body(content, boundary), headers: { "content-type": `multipart/form-data; boundary=${boundary}` } }), {
        fileFields: ["files"],
      });
    const first = (await read("t,T\n0,1", "b1")).digest();
    expect((await read("t,T\n0,1", "other-boundary")).digest()).toBe(first);
    expect((await read("t,T\n0,2", "b1")).digest()).not.toBe(first);
  });
});

import { LoggerFileError } from "./errors";

export type TextEncodingName = "utf-8" | "utf-8-bom" | "utf-16le" | "windows-1252";

// Windows-1252 bytes 0x80–0x9F; the rest of the high half equals Latin-1.
const CP1252_HIGH = [
  0x20ac, 0x81, 0x201a, 0x0192, 0x201e, 0x2026, 0x2020, 0x2021, 0x02c6, 0x2030, 0x0160, 0x2039, 0x0152, 0x8d, 0x017d, 0x8f, 0x90, 0x2018, 0x2019, 0x201c, 0x201d, 0x2022, 0x2013, 0x2014, 0x02dc,
  0x2122, 0x0161, 0x203a, 0x0153, 0x9d, 0x017e, 0x0178,
];

export function decodeWindows1252(bytes: Uint8Array): string {
  const chunk = 0x8000;
  const parts: string[] = [];
  const codes = new Uint16Array(Math.min(chunk, bytes.length));
  for (let offset = 0; offset < bytes.length; offset += chunk) {
    const n = Math.min(chunk, bytes.length - offset);
    for (let i = 0; i < n; i++) {
      const b = bytes[offset + i];
      codes[i] = b >= 0x80 && b <= 0x9f ? CP1252_HIGH[b - 0x80] : b;
    }
    parts.push(String.fromCharCode.apply(null, codes.subarray(0, n) as unknown as number[]));
  }
  return parts.join("");
}

const CP1252_REVERSE = new Map<number, number>(CP1252_HIGH.map((code, i) => [code, 0x80 + i]));

export function encodeWindows1252(text: string): Uint8Array {
  const out = new Uint8Array(text.length);
  for (let i = 0; i < text.length; i++) {
    const code = text.charCodeAt(i);
    if (code < 0x80 || (code >= 0xa0 && code <= 0xff)) out[i] = code;
    else out[i] = CP1252_REVERSE.get(code) ?? 0x3f;
  }
  return out;
}

type NodeBufferLike = { from(buffer: ArrayBufferLike, offset: number, length: number): { toString(encoding: "utf8" | "latin1"): string } };

function describeBinary(bytes: Uint8Array): string | null {
  const head = bytes.subarray(0, 8);
  const starts = (...sig: number[]) => sig.every((b, i) => head[i] === b);
  if (starts(0x50, 0x4b, 0x03, 0x04)) return "a ZIP archive (or an .xlsx workbook)";
  if (starts(0x1f, 0x8b)) return "a gzip archive";
  if (starts(0x25, 0x50, 0x44, 0x46)) return "a PDF document";
  if (starts(0xd0, 0xcf, 0x11, 0xe0)) return "an old Office document (.xls)";
  if (starts(0x89, 0x50, 0x4e, 0x47)) return "a PNG image";
  if (starts(0xff, 0xd8, 0xff)) return "a JPEG image";
  return null;
}

/** UTF-8 bytes as text; bytes that are not UTF-8 become U+FFFD. */
export function decodeUtf8(bytes: Uint8Array): string {
  const nodeBuffer = (globalThis as { Buffer?: NodeBufferLike }).Buffer;
  // Node's decoder is much faster than TextDecoder.
  if (nodeBuffer) return nodeBuffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString("utf8");
  return new TextDecoder("utf-8").decode(bytes);
}

/** One character per byte, whatever the bytes (bytes 0x80–0xFF stay at or above U+0080): for finding ASCII separators fast. */
export function decodeBytewise(bytes: Uint8Array): string {
  const nodeBuffer = (globalThis as { Buffer?: NodeBufferLike }).Buffer;
  if (nodeBuffer) return nodeBuffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString("latin1");
  return decodeWindows1252(bytes);
}

/** Refuses a file whose first bytes (up to 64 KiB) show it is binary, saying what it looks like or where. */
export function refuseBinaryHead(bytes: Uint8Array): void {
  const known = describeBinary(bytes);
  if (known) throw new LoggerFileError(`The file is ${known}, not a text export: save the logger data as CSV or text`);
  const probe = Math.min(bytes.length, 65536);
  for (let i = 0; i < probe; i++) {
    const b = bytes[i];
    if (b < 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d && b !== 0x0c && b !== 0x1a) {
      throw new LoggerFileError(`The file is not text: byte 0x${b.toString(16).padStart(2, "0")} at offset ${i} is a binary control byte; export the logger data as CSV or text`);
    }
  }
}

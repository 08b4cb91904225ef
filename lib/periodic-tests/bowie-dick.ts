import { BOWIE_DICK, HOLLOW_LOAD } from "./limits";

export type BowieDickOutcome = "uniform" | "non-uniform";

/** A steam-penetration indicator read by a person: the Bowie-Dick sheet, or the helix strip of a hollow load test. */
export function evaluateBowieDick(outcome: BowieDickOutcome, kind: "bowie-dick" | "hollow-load" = "bowie-dick"): { passed: boolean; basis: string; meaning: string } {
  const basis = kind === "hollow-load" ? HOLLOW_LOAD.basis : BOWIE_DICK.basis;
  if (outcome === "uniform") {
    return {
      passed: true,
      basis,
      meaning: kind === "hollow-load" ? "Uniform colour change: steam reached the far end of the helix." : "Uniform colour change: steam penetrated the test pack evenly.",
    };
  }
  return {
    passed: false,
    basis,
    meaning:
      "A paler or uneven area means steam did not penetrate evenly: poor air removal, a leak during air removal or non-condensable gas in the steam are possible causes. Take the sterilizer out of use until the cause is found and a repeat test passes.",
  };
}

/** A photo of the indicator sheet may be at most this large (issue 10: "JPEG or PNG up to 10 MB"). */
export const INDICATOR_PHOTO_MAX_BYTES = 10 * 1024 * 1024;
export const INDICATOR_PHOTO_TYPES = ["image/jpeg", "image/png"] as const;
export type IndicatorPhotoType = (typeof INDICATOR_PHOTO_TYPES)[number];

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
const JPEG_SIGNATURE = [0xff, 0xd8, 0xff];
const startsWith = (bytes: Uint8Array, signature: number[]) => bytes.length >= signature.length && signature.every((b, i) => bytes[i] === b);

/** The image type the bytes themselves declare (their magic number); the name and the browser's type are not trusted. */
export function indicatorPhotoTypeOf(bytes: Uint8Array): IndicatorPhotoType | null {
  if (startsWith(bytes, PNG_SIGNATURE)) return "image/png";
  if (startsWith(bytes, JPEG_SIGNATURE)) return "image/jpeg";
  return null;
}

function otherImageKind(bytes: Uint8Array): string | null {
  const head = new TextDecoder("latin1").decode(bytes.subarray(0, 12));
  if (head.startsWith("GIF8")) return "a GIF image";
  if (head.startsWith("RIFF") && head.slice(8, 12) === "WEBP") return "a WebP image";
  if (head.startsWith("BM")) return "a BMP image";
  if (head.slice(4, 12).startsWith("ftyp")) return "an HEIC or other camera format";
  if (head.startsWith("%PDF")) return "a PDF document";
  return null;
}

export type IndicatorPhotoCheck = { ok: true; contentType: IndicatorPhotoType } | { ok: false; message: string };

/** Whether an upload can stand as the photo of an indicator sheet: JPEG or PNG by its content, not empty, at most 10 MB. */
export function checkIndicatorPhoto({ name, bytes }: { name: string; bytes: Uint8Array }): IndicatorPhotoCheck {
  const label = name.trim() || "The photo";
  if (bytes.byteLength === 0) return { ok: false, message: `${label} is empty; attach the photo of the indicator sheet.` };
  if (bytes.byteLength > INDICATOR_PHOTO_MAX_BYTES) {
    return { ok: false, message: `${label} is ${(bytes.byteLength / 1048576).toFixed(1)} MB; the photo of the indicator sheet may be at most 10 MB.` };
  }
  const contentType = indicatorPhotoTypeOf(bytes);
  if (contentType) return { ok: true, contentType };
  const other = otherImageKind(bytes);
  return {
    ok: false,
    message: other
      ? `${label} is ${other}; the photo of the indicator sheet must be a JPEG or PNG image.`
      : `${label} is not a JPEG or PNG image (its content does not begin like one, whatever its name says); save the photo as JPEG or PNG.`,
  };
}

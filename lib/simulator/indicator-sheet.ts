/**
 * A drawn "photo" of a steam-penetration indicator sheet, as a small PNG, for the demo site and the
 * browser tests: a white sheet on a grey desk with a grid of printed indicator lines. A uniform
 * change leaves every line equally dark; a failed test leaves the lines paler towards the centre
 * (air kept steam from the middle of the pack). Papin's own drawing; no camera, no copied image.
 */
import { deflateSync } from "node:zlib";

export type DrawnSheet = "uniform" | "paler-centre";

const WIDTH = 200;
const HEIGHT = 150;

type Rgb = [number, number, number];
const DESK: Rgb = [118, 124, 130];
const PAPER: Rgb = [246, 244, 236];
const UNCHANGED_INK: Rgb = [222, 198, 120]; // the ink before steam reaches it
const CHANGED_INK: Rgb = [52, 44, 40]; // after a full change

const mix = (a: Rgb, b: Rgb, t: number): Rgb => [0, 1, 2].map((i) => Math.round(a[i] + (b[i] - a[i]) * t)) as Rgb;

function pixelAt(x: number, y: number, sheet: DrawnSheet): Rgb {
  const margin = 12;
  if (x < margin || y < margin || x >= WIDTH - margin || y >= HEIGHT - margin) return DESK;
  const inPrint = x >= margin + 10 && y >= margin + 10 && x < WIDTH - margin - 10 && y < HEIGHT - margin - 10;
  const onLine = (x + y) % 9 < 2 || (x - y + HEIGHT) % 9 < 2; // a diagonal lattice, as printed indicator lines often are
  if (!inPrint || !onLine) return PAPER;
  if (sheet === "uniform") return CHANGED_INK;
  // Change falls off towards the centre: full at the edge of the print, about a fifth in the middle.
  const dx = (x - WIDTH / 2) / (WIDTH / 2 - margin - 10);
  const dy = (y - HEIGHT / 2) / (HEIGHT / 2 - margin - 10);
  const distance = Math.min(1, Math.sqrt(dx * dx + dy * dy));
  return mix(UNCHANGED_INK, CHANGED_INK, 0.2 + 0.8 * Math.min(1, distance * 1.4) ** 2);
}

const CRC_TABLE = Array.from({ length: 256 }, (_, n) => {
  let c = n;
  for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
  return c >>> 0;
});

function crc32(bytes: Uint8Array): number {
  let c = 0xffffffff;
  for (const b of bytes) c = CRC_TABLE[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function chunk(type: string, data: Uint8Array): Buffer {
  const typed = Buffer.concat([Buffer.from(type, "ascii"), data]);
  const out = Buffer.alloc(12 + data.length);
  out.writeUInt32BE(data.length, 0);
  typed.copy(out, 4);
  out.writeUInt32BE(crc32(typed), 8 + data.length);
  return out;
}

/** The sheet as PNG bytes (8-bit RGB, no interlace, filter 0 on every row). */
export function drawIndicatorSheetPng(sheet: DrawnSheet): Uint8Array {
  const raw = Buffer.alloc(HEIGHT * (1 + WIDTH * 3));
  for (let y = 0; y < HEIGHT; y++) {
    const row = y * (1 + WIDTH * 3);
    for (let x = 0; x < WIDTH; x++) raw.set(pixelAt(x, y, sheet), row + 1 + x * 3);
  }
  const header = Buffer.alloc(13);
  header.writeUInt32BE(WIDTH, 0);
  header.writeUInt32BE(HEIGHT, 4);
  header.set([8, 2, 0, 0, 0], 8); // bit depth 8, colour type 2 (RGB)
  const signature = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  return new Uint8Array(Buffer.concat([signature, chunk("IHDR", header), chunk("IDAT", deflateSync(raw)), chunk("IEND", new Uint8Array(0))]));
}

import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import { inflateSync } from "node:zlib";
import { Font } from "@react-pdf/renderer";
import { FONT_MONO, FONT_SANS } from "./theme";

/**
 * A WOFF 1.0 file unpacked into the plain TrueType (sfnt) font it wraps. fontkit reads WOFF
 * directly but inflates the whole glyph table again for every glyph it touches, which made one
 * report cost seconds; unpacked once here, the same glyphs come out in a fraction of that.
 */
export function woffToSfnt(woff: Uint8Array): Buffer {
  const src = Buffer.from(woff.buffer, woff.byteOffset, woff.byteLength);
  if (src.length < 44 || src.toString("latin1", 0, 4) !== "wOFF") throw new Error("Not a WOFF 1.0 font file");
  const flavor = src.readUInt32BE(4);
  const numTables = src.readUInt16BE(12);
  const tables: Array<{ tag: number; checksum: number; data: Buffer }> = [];
  for (let i = 0; i < numTables; i++) {
    const at = 44 + i * 20;
    const tag = src.readUInt32BE(at);
    const offset = src.readUInt32BE(at + 4);
    const compLength = src.readUInt32BE(at + 8);
    const origLength = src.readUInt32BE(at + 12);
    const checksum = src.readUInt32BE(at + 16);
    const stored = src.subarray(offset, offset + compLength);
    const data = compLength < origLength ? inflateSync(stored) : Buffer.from(stored);
    if (data.length !== origLength) throw new Error("A table in the WOFF font file has the wrong length");
    tables.push({ tag, checksum, data });
  }
  tables.sort((a, b) => a.tag - b.tag);
  const pad4 = (n: number) => (n + 3) & ~3;
  const headerLength = 12 + 16 * numTables;
  const total = tables.reduce((sum, t) => sum + pad4(t.data.length), headerLength);
  const out = Buffer.alloc(total);
  const power = 2 ** Math.floor(Math.log2(numTables));
  out.writeUInt32BE(flavor, 0);
  out.writeUInt16BE(numTables, 4);
  out.writeUInt16BE(power * 16, 6);
  out.writeUInt16BE(Math.log2(power), 8);
  out.writeUInt16BE(numTables * 16 - power * 16, 10);
  let offset = headerLength;
  tables.forEach((t, i) => {
    const at = 12 + i * 16;
    out.writeUInt32BE(t.tag, at);
    out.writeUInt32BE(t.checksum, at + 4);
    out.writeUInt32BE(offset, at + 8);
    out.writeUInt32BE(t.data.length, at + 12);
    t.data.copy(out, offset);
    offset += pad4(t.data.length);
  });
  return out;
}

function fontSource(dir: string, file: string): string {
  const full = path.join(dir, file);
  if (!existsSync(full)) {
    throw new Error(`The report font ${file} is missing from ${dir}; reports are rendered with the fonts shipped in fonts/, from the project's folder`);
  }
  return `data:font/ttf;base64,${woffToSfnt(readFileSync(full)).toString("base64")}`;
}

let registered = false;

/** Registers the shipped fonts (fonts/*.woff, found from the working directory) once per process. */
export function registerReportFonts(): void {
  if (registered) return;
  const dir = path.join(process.cwd(), "fonts");
  Font.register({
    family: FONT_SANS,
    fonts: [400, 500, 600, 700].map((fontWeight) => ({ src: fontSource(dir, `inter-latin-${fontWeight}-normal.woff`), fontWeight })),
  });
  Font.register({
    family: FONT_MONO,
    fonts: [400, 500].map((fontWeight) => ({ src: fontSource(dir, `jetbrains-mono-latin-${fontWeight}-normal.woff`), fontWeight })),
  });
  // Hashes, file names and channel headers must never be split with a hyphen.
  Font.registerHyphenationCallback((word) => [word]);
  registered = true;
}

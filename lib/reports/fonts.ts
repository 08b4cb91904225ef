import { existsSync } from "node:fs";
import path from "node:path";
import { Font } from "@react-pdf/renderer";
import { FONT_MONO, FONT_SANS } from "./theme";

function fontSource(dir: string, file: string): string {
  const full = path.join(dir, file);
  if (!existsSync(full)) {
    throw new Error(`The report font ${file} is missing from ${dir}; reports are rendered with the fonts shipped in fonts/, from the project's folder`);
  }
  return full;
}

let registered = false;

/**
 * Registers the shipped TrueType fonts (fonts/*.ttf, found from the working directory) once per
 * process. TTF rather than WOFF: fontkit inflates a WOFF glyph table again for every glyph it
 * touches, which made one report cost seconds.
 */
export function registerReportFonts(): void {
  if (registered) return;
  const dir = path.join(process.cwd(), "fonts");
  Font.register({
    family: FONT_SANS,
    fonts: [400, 500, 600, 700].map((fontWeight) => ({ src: fontSource(dir, `inter-latin-${fontWeight}-normal.ttf`), fontWeight })),
  });
  Font.register({
    family: FONT_MONO,
    fonts: [400, 500].map((fontWeight) => ({ src: fontSource(dir, `jetbrains-mono-latin-${fontWeight}-normal.ttf`), fontWeight })),
  });
  // Hashes, file names and channel headers must never be split with a hyphen.
  Font.registerHyphenationCallback((word) => [word]);
  registered = true;
}

/**
 * The shipped Inter and JetBrains Mono files are "latin" subsets. The code points below are the
 * ones every shipped face has a glyph for (read from the fonts' cmap tables); anything else would
 * print as an empty box, so it is written out in characters the fonts carry.
 */
const REPLACEMENTS: Record<string, string> = {
  "≤": "<=",
  "≥": ">=",
  "≈": "~",
  "≠": "!=",
  "→": "›",
  "←": "‹",
  "⇒": "›",
  Δ: "delta ",
  "∆": "delta ",
  "✓": "yes",
  "✗": "no",
  "‰": " per mille",
  "\u2002": " ",
  "\u2003": " ",
  "\u2009": " ",
  "\u200a": " ",
  "\u202f": " ",
  "\u2010": "-",
  "\u2011": "-",
  "\u2012": "–",
  "\u2015": "—",
  "\u00ad": "",
  "\u200b": "",
};

const COVERED = new Set([
  0x131, 0x152, 0x153, 0x2bc, 0x2c6, 0x2da, 0x2dc, 0x300, 0x301, 0x303, 0x304, 0x308, 0x309, 0x323, 0x2013, 0x2014, 0x2018, 0x2019, 0x201a, 0x201c, 0x201d, 0x201e, 0x2022, 0x2026, 0x2032, 0x2033,
  0x2039, 0x203a, 0x2044, 0x20ac, 0x2122, 0x2191, 0x2193, 0x2212,
]);

/** True when every shipped face draws this code point. */
export function fontCovers(codePoint: number): boolean {
  return (codePoint >= 0x20 && codePoint <= 0x7e) || (codePoint >= 0xa0 && codePoint <= 0xff && codePoint !== 0xad) || COVERED.has(codePoint);
}

/** Text made safe for the report's fonts: known symbols spelt out, control characters dropped, the rest as "?". */
export function pdfText(value: string | number | null | undefined): string {
  if (value === null || value === undefined) return "";
  const text = String(value).normalize("NFC");
  let out = "";
  for (const char of text) {
    const replacement = REPLACEMENTS[char];
    if (replacement !== undefined) {
      out += replacement;
      continue;
    }
    const code = char.codePointAt(0) ?? 0;
    if (code === 0x0a) out += "\n";
    else if (code === 0x09) out += " ";
    else if (code < 0x20 || (code >= 0x7f && code < 0xa0)) continue;
    else if (fontCovers(code)) out += char;
    else out += "?";
  }
  return out;
}

export function fixed(value: number | null | undefined, digits: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  const text = value.toFixed(digits);
  return text.startsWith("-") ? `−${text.slice(1)}` : text;
}

export function signed(value: number | null | undefined, digits: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return value > 0 ? `+${value.toFixed(digits)}` : fixed(value, digits);
}

export function bytes(n: number): string {
  const grouped = Math.round(n).toLocaleString("en-GB");
  if (n < 1024) return `${grouped} bytes`;
  const unit = n < 1024 * 1024 ? `${(n / 1024).toFixed(1)} KiB` : `${(n / 1024 / 1024).toFixed(2)} MiB`;
  return `${unit} (${grouped} bytes)`;
}

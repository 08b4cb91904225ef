import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import type { SeriesResponse } from "@/lib/cycles/contracts";
import { SAFETY_NOTES } from "@/lib/safety";
import { downsampleForReport, pdfText } from "@/lib/reports";
import { strideIndexes } from "@/lib/reports/downsample";
import { bytes, fontCovers } from "@/lib/reports/text";
import { bothClocks, instantOf, siteText } from "@/lib/reports/time";

function series(values: Array<Array<number | null>>, timesS = values[0].map((_, i) => i)): SeriesResponse {
  return {
    startedAt: null,
    timesS,
    channels: values.map((v, k) => ({ header: `ch${k}`, kind: "temperature" as const, unit: "°C", role: k === 0 ? ("reference" as const) : ("load" as const), values: v })),
    plateau: { start: 10, end: 20 },
    band: { low: 134, high: 137 },
    flags: [],
    window: { from: timesS[0], to: timesS[timesS.length - 1] },
    totalSamples: timesS.length,
    fullResolution: true,
  };
}

describe("downsampleForReport", () => {
  const n = 10_000;
  const wave = Array.from({ length: n }, (_, i) => 100 + 10 * Math.sin(i / 300));
  const spiky = wave.slice();
  spiky[4321] = 150; // one sample spike
  spiky[777] = 20; // one sample dip

  it("returns the series untouched when it already has few enough points", () => {
    const s = series([wave.slice(0, 500)]);
    const out = downsampleForReport(s, 1000);
    expect(out.timesS).toBe(s.timesS);
    expect(out.channels[0].values).toBe(s.channels[0].values);
  });

  it("keeps every bucket's extremes, so a one-sample spike and dip survive", () => {
    const out = downsampleForReport(series([spiky, wave]), 600);
    expect(out.timesS.length).toBeLessThanOrEqual(600);
    expect(Math.max(...(out.channels[0].values as number[]))).toBe(150);
    expect(Math.min(...(out.channels[0].values as number[]))).toBe(20);
    expect(out.fullResolution).toBe(false);
    expect(out.plateau).toEqual({ start: 10, end: 20 });
    expect(out.band).toEqual({ low: 134, high: 137 });
    for (let i = 1; i < out.timesS.length; i++) expect(out.timesS[i]).toBeGreaterThanOrEqual(out.timesS[i - 1]);
  });

  it("keeps a gap as a gap and takes the readings either side of a short one", () => {
    const gappy: Array<number | null> = wave.slice();
    for (let i = 2000; i < 3000; i++) gappy[i] = null; // a long gap: whole buckets without a reading
    gappy[5000] = null; // a single missing sample inside a bucket
    const out = downsampleForReport(series([gappy]), 200);
    const inGap = out.timesS.map((t, i) => [t, out.channels[0].values[i]] as const).filter(([t]) => t > 2100 && t < 2900);
    expect(inGap.length).toBeGreaterThan(0);
    expect(inGap.every(([, v]) => v === null)).toBe(true);
    const aroundSingle = out.timesS.map((t, i) => [t, out.channels[0].values[i]] as const).filter(([t]) => t >= 4990 && t <= 5010);
    expect(aroundSingle.every(([, v]) => v !== null)).toBe(true);
  });

  it("cuts to a window when asked", () => {
    const out = downsampleForReport(series([wave]), 100, 1000, 1999);
    expect(out.timesS[0]).toBe(1000);
    expect(out.timesS[out.timesS.length - 1]).toBe(1999);
    expect(out.window).toEqual({ from: 1000, to: 1999 });
  });
});

describe("strideIndexes", () => {
  it("keeps the first and last sample and samples the kept span more densely", () => {
    const idx = strideIndexes(10_000, 100, 4000, 4100);
    expect(idx[0]).toBe(0);
    expect(idx[idx.length - 1]).toBe(9999);
    expect(idx.filter((i) => i >= 4000 && i <= 4100).length).toBeGreaterThanOrEqual(50);
    for (let i = 1; i < idx.length; i++) expect(idx[i]).toBeGreaterThan(idx[i - 1]);
  });
});

// A minimal reader of the OpenType 'cmap' table (formats 4 and 12; OpenType spec, "cmap — Character
// to glyph index mapping table"), to check the report's idea of glyph coverage against the font files.
function codePointsOf(sfnt: Buffer): Set<number> {
  const numTables = sfnt.readUInt16BE(4);
  let cmap = -1;
  for (let i = 0; i < numTables; i++) if (sfnt.toString("latin1", 12 + i * 16, 16 + i * 16) === "cmap") cmap = sfnt.readUInt32BE(12 + i * 16 + 8);
  const out = new Set<number>();
  const subtables = sfnt.readUInt16BE(cmap + 2);
  for (let i = 0; i < subtables; i++) {
    const at = cmap + sfnt.readUInt32BE(cmap + 4 + i * 8 + 4);
    const format = sfnt.readUInt16BE(at);
    if (format === 4) {
      const segX2 = sfnt.readUInt16BE(at + 6);
      const ends = at + 14;
      const starts = ends + segX2 + 2;
      const deltas = starts + segX2;
      const offsets = deltas + segX2;
      for (let s = 0; s < segX2 / 2; s++) {
        const end = sfnt.readUInt16BE(ends + 2 * s);
        const start = sfnt.readUInt16BE(starts + 2 * s);
        const delta = sfnt.readInt16BE(deltas + 2 * s);
        const rangeOffset = sfnt.readUInt16BE(offsets + 2 * s);
        for (let c = start; c <= end && c !== 0xffff; c++) {
          const glyph = rangeOffset === 0 ? (c + delta) & 0xffff : sfnt.readUInt16BE(offsets + 2 * s + rangeOffset + 2 * (c - start));
          if (glyph !== 0) out.add(c);
        }
      }
    } else if (format === 12) {
      const groups = sfnt.readUInt32BE(at + 12);
      for (let g = 0; g < groups; g++) {
        const start = sfnt.readUInt32BE(at + 16 + g * 12);
        const end = sfnt.readUInt32BE(at + 20 + g * 12);
        for (let c = start; c <= end; c++) out.add(c);
      }
    }
  }
  return out;
}

const fontFile = (name: string) => readFileSync(path.join(process.cwd(), "fonts", name));

describe("the shipped fonts and the report's glyph rules", () => {
  const faces = ["inter-latin-400-normal.ttf", "inter-latin-700-normal.ttf", "jetbrains-mono-latin-400-normal.ttf", "jetbrains-mono-latin-500-normal.ttf"];

  it("are TrueType fonts whose table and whole-file checksums hold (OpenType spec, table checksums)", () => {
    const checksum = (data: Buffer, from: number, length: number, skip = -1) => {
      let sum = 0;
      for (let p = 0; p < length; p += 4) {
        const word = p + 4 <= length ? data.readUInt32BE(from + p) : Buffer.concat([data.subarray(from + p, from + length), Buffer.alloc(4)]).readUInt32BE(0);
        sum = (sum + (p === skip ? 0 : word)) >>> 0;
      }
      return sum;
    };
    for (const face of faces) {
      const sfnt = fontFile(face);
      expect(sfnt.readUInt32BE(0)).toBe(0x00010000);
      const numTables = sfnt.readUInt16BE(4);
      expect(numTables).toBeGreaterThan(8);
      for (let i = 0; i < numTables; i++) {
        const rec = 12 + i * 16;
        const tag = sfnt.toString("latin1", rec, rec + 4);
        // head's checkSumAdjustment (bytes 8–11) counts as zero in head's own checksum
        expect(checksum(sfnt, sfnt.readUInt32BE(rec + 8), sfnt.readUInt32BE(rec + 12), tag === "head" ? 8 : -1), `${face} ${tag}`).toBe(sfnt.readUInt32BE(rec + 4));
      }
      expect(checksum(sfnt, 0, sfnt.length), `${face} whole file`).toBe(0xb1b0afba);
    }
  });

  it("have a glyph for every character the report lets through, and none for the ones it spells out", () => {
    for (const face of faces) {
      const cmap = codePointsOf(fontFile(face));
      for (const c of [..."°±–—³²µ·×’“”…−"]) expect(cmap.has(c.codePointAt(0)!), `${face} ${c}`).toBe(true);
      for (const c of [..."≤≥→≈Δ"]) expect(cmap.has(c.codePointAt(0)!), `${face} ${c}`).toBe(false);
      for (let code = 0; code <= 0xffff; code++) {
        if (fontCovers(code)) expect(cmap.has(code), `${face} U+${code.toString(16)}`).toBe(true);
      }
    }
  });

  it("spell out the symbols the fonts lack and keep the ones they carry", () => {
    expect(pdfText("≤ 2 K and ≥ 15 s")).toBe("<= 2 K and >= 15 s");
    expect(pdfText("Signed archive → Check a report")).toBe("Signed archive › Check a report");
    expect(pdfText("134 °C ± 0.5 K, 121–134 °C, 336 l (0.336 m³)")).toBe("134 °C ± 0.5 K, 121–134 °C, 336 l (0.336 m³)");
    expect(pdfText("07:30\u202fAM, 2\u2009K")).toBe("07:30 AM, 2 K");
    expect(pdfText("cafe\u0301")).toBe("café"); // decomposed accents are composed first (NFC)
    expect(pdfText("bad\u0007bell")).toBe("badbell");
    expect(pdfText("試験")).toBe("??");
    expect(pdfText(null)).toBe("");
  });

  it("print the safety notes without a single substituted character", () => {
    for (const note of SAFETY_NOTES) {
      expect(pdfText(note.title)).toBe(note.title);
      expect(pdfText(note.text)).toBe(note.text);
    }
  });
});

describe("figures as the report prints them", () => {
  it("gives file sizes in binary units with the exact byte count", () => {
    expect(bytes(512)).toBe("512 bytes");
    expect(bytes(92_603)).toBe("90.4 KiB (92,603 bytes)");
  });

  it("places a logger's wall-clock time in the site's zone, across summer time [common practice: UK GMT/BST, US EST]", () => {
    // UK summer time (BST, UTC+1) runs from the last Sunday of March to the last Sunday of October.
    expect(instantOf("2025-07-01 09:00:00", "Europe/London")?.toISOString()).toBe("2025-07-01T08:00:00.000Z");
    expect(instantOf("2025-01-15 09:00:00", "Europe/London")?.toISOString()).toBe("2025-01-15T09:00:00.000Z");
    expect(instantOf("2025-01-15T07:00:00", "America/New_York")?.toISOString()).toBe("2025-01-15T12:00:00.000Z");
    // A text with its own offset means that instant, whatever the site.
    expect(instantOf("2025-07-01T09:00:00+02:00", "Europe/London")?.toISOString()).toBe("2025-07-01T07:00:00.000Z");
    expect(instantOf("not a time", "Europe/London")).toBeNull();
  });

  it("names the zone beside the site's clock and gives UTC too", () => {
    expect(siteText(new Date("2025-07-01T08:00:00Z"), "Europe/London")).toBe("1 Jul 2025 09:00:00 BST (Europe/London)");
    expect(bothClocks("2025-03-03T10:12:41.000Z", "Europe/London")).toEqual({ site: "3 Mar 2025 10:12:41 GMT (Europe/London)", utc: "2025-03-03 10:12:41 UTC" });
    expect(bothClocks(null, "Europe/London")).toEqual({ site: "—", utc: "—" });
  });
});

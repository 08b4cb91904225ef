import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { LoggerFileError, inspectLoggerFile, readLoggerFile } from "@/lib/logger-files";

// Property: whatever bytes arrive, the reader and the inspect path either answer or refuse with LoggerFileError,
// the typed error the intake turns into a 422 — never a TypeError, a RangeError or a hang (issue 11).
// Fixed seed and bounded runs, so CI sees the same cases every time and stays fast.
const SEED = 20261111;

function onlyTypedRefusals(bytes: Uint8Array): void {
  for (const read of [inspectLoggerFile, readLoggerFile]) {
    try {
      read(bytes);
    } catch (error) {
      if (!(error instanceof LoggerFileError)) throw error;
      expect(error.message.length).toBeGreaterThan(0);
    }
  }
}

const encoder = new TextEncoder();

/** One cell as loggers and careless hands write them: numbers with either decimal mark, times, words, quotes, blanks. */
const cell = fc.oneof(
  fc.double({ min: -1e6, max: 1e6, noNaN: true }).map((v) => String(v)),
  fc.double({ min: 0, max: 400, noNaN: true }).map((v) => v.toFixed(2).replace(".", ",")),
  fc
    .integer({ min: 0, max: 86_400 })
    .map((s) => `2025-03-03 ${String(Math.floor(s / 3600) % 24).padStart(2, "0")}:${String(Math.floor(s / 60) % 60).padStart(2, "0")}:${String(s % 60).padStart(2, "0")}`),
  fc.constantFrom("", " ", "Time", "Drain (°C)", "Pack 1 (°F)", "Chamber (kPa abs)", "P (bar g)", "T (K)", "NaN", "-", "1e400", "Infinity", "12:00:00 PM"),
  fc.string({ maxLength: 12 }),
  fc.string({ maxLength: 8 }).map((s) => `"${s.replace(/"/g, '""')}"`),
  fc.constantFrom('"', '""', '"a,b"', '"line\nbreak"', '"unclosed'),
);

/** A field now and then far longer than any logger writes (the line and row limits are met with in their own tests). */
const hugeCell = fc.integer({ min: 1000, max: 20_000 }).map((n) => "9".repeat(n));

const csvish = fc
  .record({
    bom: fc.boolean(),
    separator: fc.constantFrom(",", ";", "\t", " ", "|"),
    lineEnding: fc.constantFrom("\n", "\r\n", "\r"),
    preamble: fc.array(fc.string({ maxLength: 30 }), { maxLength: 3 }),
    rows: fc.array(fc.array(fc.oneof({ weight: 20, arbitrary: cell }, { weight: 1, arbitrary: hugeCell }), { minLength: 0, maxLength: 8 }), { minLength: 0, maxLength: 40 }),
    blankEvery: fc.integer({ min: 0, max: 7 }),
  })
  .map(({ bom, separator, lineEnding, preamble, rows, blankEvery }) => {
    const lines = [...preamble, ...rows.map((r) => r.join(separator))];
    if (blankEvery > 0) for (let i = lines.length; i > 0; i -= blankEvery) lines.splice(i, 0, "");
    return (bom ? "\uFEFF" : "") + lines.join(lineEnding);
  });

/** Well-formed logger tables (time, temperatures, pressure) with one thing broken now and then. */
const loggerTable = fc
  .record({
    separator: fc.constantFrom(",", ";", "\t"),
    decimalComma: fc.boolean(),
    channels: fc.integer({ min: 1, max: 5 }),
    values: fc.array(fc.double({ min: 90, max: 140, noNaN: true }), { minLength: 3, maxLength: 60 }),
    damage: fc.option(fc.record({ at: fc.nat(), text: fc.oneof(cell, fc.constantFrom("\n", '"', ";;;", ",,,")) }), { nil: undefined }),
  })
  .map(({ separator, decimalComma, channels, values, damage }) => {
    const number = (v: number) => (decimalComma && separator !== "," ? v.toFixed(2).replace(".", ",") : v.toFixed(2));
    const head = ["Time (s)", ...Array.from({ length: channels }, (_, k) => `TC${k + 1} (°C)`), "Chamber (kPa abs)"].join(separator);
    const body = values.map((v, t) => [String(t), ...Array.from({ length: channels }, () => number(v)), number(300)].join(separator));
    let text = [head, ...body].join("\n");
    if (damage) {
      const at = damage.at % (text.length + 1);
      text = text.slice(0, at) + damage.text + text.slice(at);
    }
    return text;
  });

describe("fuzzing the logger reader (issue 11): nothing throws but LoggerFileError", () => {
  it("random bytes", () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 2048 }), (bytes) => onlyTypedRefusals(bytes)),
      { seed: SEED, numRuns: 300 },
    );
  });

  it("random bytes behind a text-looking start (past the binary probe)", () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 512 }), (tail) => {
        const head = encoder.encode("Time,T1 (°C),P (kPa abs)\n0,121,205\n1,121,205\n2,121,205\n");
        const bytes = new Uint8Array(head.length + tail.length);
        bytes.set(head);
        bytes.set(tail, head.length);
        onlyTypedRefusals(bytes);
      }),
      { seed: SEED, numRuns: 200 },
    );
  });

  it("CSV-ish text: separators, quotes, BOMs, decimal commas, huge fields, blank lines", () => {
    fc.assert(
      fc.property(csvish, (text) => onlyTypedRefusals(encoder.encode(text))),
      { seed: SEED, numRuns: 300 },
    );
  });

  it("logger tables with a piece of damage somewhere", () => {
    fc.assert(
      fc.property(loggerTable, (text) => onlyTypedRefusals(encoder.encode(text))),
      { seed: SEED, numRuns: 300 },
    );
  });

  it("a sound table is read, so the property above is not met by refusing everything", () => {
    const text = "Time (s),TC1 (°C),Chamber (kPa abs)\n0,121.1,205.0\n1,121.2,205.1\n2,121.3,205.2\n";
    expect(readLoggerFile(encoder.encode(text)).recording.timesS.length).toBe(3);
  });
});

import { describe, expect, it } from "vitest";
import { bytesSource, readLoggerFile, type ByteSource } from "@/lib/logger-files";

// The reader takes a file 4 MiB at a time (lib/logger-files/lines.ts) and decodes a block of lines at a time (issue 12,
// item 4: memory per row). These files are over 4 MiB, so lines, numbers and encodings cross the chunk boundaries.
const ROWS = 200_000;
const CHUNK_BYTES = 4 * 1024 * 1024;

/** Row i: elapsed seconds, drain and pack in °C (two decimals), chamber in kPa abs; values worked by hand from i. */
function rowValues(i: number): [number, number, number, number] {
  return [i, 120 + (i % 1500) / 100, 119 + ((i * 7) % 1300) / 100, 200 + ((i * 13) % 9000) / 100];
}

function csv(eol: string, footer = ""): Uint8Array {
  const lines = ["Time (s),Drain (°C),Pack (°C),Chamber (kPa abs)"];
  for (let i = 0; i < ROWS; i++) lines.push(rowValues(i).join(","));
  const text = new TextEncoder().encode(lines.join(eol) + eol);
  const tail = new Uint8Array(footer.length);
  // The footer is written byte for byte (Windows-1252): one byte ≥ 0x80 there is not UTF-8.
  for (let k = 0; k < footer.length; k++) tail[k] = footer.charCodeAt(k);
  const out = new Uint8Array(text.length + tail.length);
  out.set(text);
  out.set(tail, text.length);
  return out;
}

/** A source over bytes in memory that notes the longest piece the reader asked for. */
function watchedSource(bytes: Uint8Array): ByteSource & { longest: number } {
  const inner = bytesSource(bytes);
  const source = {
    byteLength: inner.byteLength,
    longest: 0,
    slice: (start: number, end: number) => {
      source.longest = Math.max(source.longest, end - start);
      return inner.slice(start, end);
    },
  };
  return source;
}

function expectRowsAsWritten(times: Float64Array, drain: Float64Array, pack: Float64Array, chamber: Float64Array) {
  expect(times.length).toBe(ROWS);
  for (let i = 0; i < ROWS; i++) {
    const [t, d, p, c] = rowValues(i);
    if (times[i] !== t || drain[i] !== d || pack[i] !== p || chamber[i] !== c) {
      throw new Error(`row ${i + 2}: read ${times[i]}, ${drain[i]}, ${pack[i]}, ${chamber[i]}; written ${t}, ${d}, ${p}, ${c}`);
    }
  }
}

describe("the reader takes a large file a piece at a time (issue 12, item 4)", () => {
  it.each([
    ["LF", "\n", "lf"],
    ["CRLF", "\r\n", "crlf"],
  ])("reads every row of a %s file over 4 MiB as written, never asking for the whole file", (_name, eol, lineEnding) => {
    const bytes = csv(eol);
    expect(bytes.length).toBeGreaterThan(1.2 * CHUNK_BYTES);
    const source = watchedSource(bytes);
    const { recording, dialect, warnings } = readLoggerFile(source);
    const [drain, pack] = recording.temperatures;
    expectRowsAsWritten(recording.timesS, drain.values, pack.values, recording.pressure.values);
    expect(dialect.lineEnding).toBe(lineEnding);
    expect(dialect.encoding).toBe("utf-8");
    expect(drain.header).toBe("Drain (°C)");
    expect(source.longest).toBeLessThanOrEqual(CHUNK_BYTES + 64);
    // The same file from memory reads the same (the columns compared element by element: toEqual is slow on 200,000).
    const fromBytes = readLoggerFile(bytes);
    const { timesS, temperatures, pressure, ...rest } = fromBytes.recording;
    expectRowsAsWritten(timesS, temperatures[0].values, temperatures[1].values, pressure.values);
    expect(rest).toEqual({ startedAt: recording.startedAt, referenceIndex: recording.referenceIndex, freeSpaceIndex: recording.freeSpaceIndex, source: recording.source });
    expect(fromBytes.warnings).toEqual(warnings);
  });

  it("a byte that is not UTF-8 after the first 4 MiB still makes the whole file Windows-1252, as one decode of it would", () => {
    const bytes = csv("\n", "End of record \xB0\n");
    expect(bytes.length - 3).toBeGreaterThan(CHUNK_BYTES);
    const { recording, dialect, warnings } = readLoggerFile(watchedSource(bytes));
    expect(dialect.encoding).toBe("windows-1252");
    // Read as Windows-1252, the header's UTF-8 degree sign (C2 B0) is two characters.
    expect(recording.temperatures[0].header).toBe("Drain (\u00C2\u00B0C)");
    expect(warnings).toContain(`Ignored 1 line(s) after the data from line ${ROWS + 2} ("End of record \u00B0")`);
    const [drain, pack] = recording.temperatures;
    expectRowsAsWritten(recording.timesS, drain.values, pack.values, recording.pressure.values);
  });

  it("a row that breaks the file after the first 4 MiB is refused with its own row number", () => {
    const good = csv("\n");
    const bad = new TextEncoder().encode(`${ROWS},121.00,12x.5,300.00\n`);
    const bytes = new Uint8Array(good.length + bad.length);
    bytes.set(good);
    bytes.set(bad, good.length);
    expect(() => readLoggerFile(watchedSource(bytes))).toThrow(`Row ${ROWS + 2}, column "Pack (°C)": "12x.5" is not a number`);
  });
});

import { describe, expect, it } from "vitest";
import { LoggerFileError, inspectLoggerFile, readLoggerFile } from "@/lib/logger-files";

const utf8 = (text: string) => new TextEncoder().encode(text);
const header = "Time (s),Drain (°C),Pack (°C),Chamber (kPa abs)\n";
const rows = "0,134.1,134.0,304.2\n1,134.2,134.1,304.9\n2,134.3,134.2,305.6\n";

function refusal(bytes: Uint8Array): string {
  for (const read of [inspectLoggerFile, readLoggerFile]) {
    try {
      read(bytes);
    } catch (error) {
      expect(error).toBeInstanceOf(LoggerFileError);
      return (error as Error).message;
    }
  }
  throw new Error("expected the file to be refused");
}

// The limits are the issue's own figures (issue 11): 1 MB per line, 10,000 fields per row.
describe("the reader refuses a line or a row over its limits before splitting it (issue 11)", () => {
  it("a single line of 3 million `1,` fields (6 MB) is refused by its length, fast", () => {
    const bytes = utf8("1,".repeat(3_000_000));
    const started = performance.now();
    const message = refusal(bytes);
    // Over 3 bytes per allowed character, it is refused from its bytes, before they are decoded into text.
    expect(message).toBe("Line 1 is 6,000,000 bytes long; Papin reads lines of at most 1,048,576 characters (1 MB)");
    // Splitting 3 million fields took seconds and hundreds of MB before; counting characters takes milliseconds.
    expect(performance.now() - started).toBeLessThan(2000);
  });

  it("a line just over 1 MiB further down names its line", () => {
    const long = "x".repeat(1024 * 1024 + 1);
    expect(refusal(utf8(header + rows + long + "\n"))).toBe("Line 5 is 1,048,577 characters long; Papin reads lines of at most 1,048,576 characters (1 MB)");
  });

  it("a 4 MiB line in a file broken by CR only is counted as CR lines are", () => {
    expect(refusal(utf8("Time (s),Drain (°C)\r0,134\r" + "7".repeat(4 * 1024 * 1024) + "\r1,134\r"))).toBe("Line 3 is 4,194,304 bytes long; Papin reads lines of at most 1,048,576 characters (1 MB)");
  });

  it("a row of 10,001 semicolon-separated fields is refused, one of 10,000 is not refused for its width", () => {
    const wide = (fields: number) => Array.from({ length: fields }, () => "1").join(";");
    expect(refusal(utf8(header + rows + wide(10_001) + "\n"))).toBe("Line 5 has 10,001 semicolon-separated fields; Papin reads at most 10,000 fields per row");
    // 10,000 fields are within the limit: the line is read (here as a footer the table does not fit), not refused.
    const { warnings } = readLoggerFile(utf8(header + rows + wide(10_000) + "\n"));
    expect(warnings[0]).toMatch(/^Ignored 1 line\(s\) after the data from line 5/);
  });

  it("a quoted row that runs over many lines is refused once it passes 10,000 fields", () => {
    // Each physical line stays under the per-line count; the open quote at each end joins them into one row.
    const piece = Array.from({ length: 3000 }, () => "1").join(",");
    const joined = `${piece},"\n",${piece},"\n",${piece},"\n",${piece}\n`;
    const quotedRows = Array.from({ length: 20 }, (_, t) => `${t},"134.1",134.0,304.2\n`).join("");
    expect(refusal(utf8(header + quotedRows + joined))).toMatch(/^Row 22 has 12,00\d fields; Papin reads at most 10,000 fields per row$/);
  });

  it("an ordinary file with long but lawful lines still reads", () => {
    const channels = 200;
    const head = ["Time (s)", ...Array.from({ length: channels }, (_, k) => `TC${k + 1} (°C)`), "Chamber (kPa abs)"].join(",");
    const body = Array.from({ length: 5 }, (_, t) => [t, ...Array.from({ length: channels }, () => "134.1"), "304.2"].join(",")).join("\n");
    const { recording } = readLoggerFile(utf8(`${head}\n${body}\n`));
    expect(recording.temperatures.length).toBe(channels);
    expect(recording.timesS.length).toBe(5);
  });
});

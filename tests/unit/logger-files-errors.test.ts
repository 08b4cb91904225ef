import { describe, expect, it } from "vitest";
import { LoggerFileError, inspectLoggerFile, parseDecimal, readLoggerFile } from "@/lib/logger-files";

const utf8 = (text: string) => new TextEncoder().encode(text);
const header = "Time,Drain (°C),Pack 1 (°C),Chamber (kPa abs)\n";
const rows = "0,134.1,134.0,304.2\n1,134.2,134.1,304.9\n2,134.3,134.2,305.6\n".replace(/^(\d)/gm, "2025-03-03 07:30:0$1");

function messageOf(bytes: Uint8Array, overrides?: Parameters<typeof readLoggerFile>[1]): string {
  try {
    readLoggerFile(bytes, overrides);
  } catch (error) {
    expect(error).toBeInstanceOf(LoggerFileError);
    return (error as Error).message;
  }
  throw new Error("expected the file to be refused");
}

describe("unusable logger files are refused with a message that says what and where", () => {
  it("blank space only", () => {
    expect(messageOf(utf8(" \n\n  \r\n"))).toBe("The file is empty: it holds only blank space");
  });

  it("a PDF", () => {
    expect(messageOf(utf8("%PDF-1.7\n..."))).toMatch(/^The file is a PDF document, not a text export/);
  });

  it("an override naming a column that is not there lists the columns", () => {
    expect(messageOf(utf8(header + rows), { pressureColumn: "Jacket (kPa)" })).toBe(
      'The pressure column "Jacket (kPa)" is not a column of this file; its columns are "Time", "Drain (°C)", "Pack 1 (°C)", "Chamber (kPa abs)"',
    );
  });

  it("a time column override whose cells are not times", () => {
    const file = utf8("Label,Time,Drain (°C),Pack 1 (°C),Chamber (kPa abs)\nA,2025-03-03 07:30:00,134.1,134,304\nB,2025-03-03 07:30:01,134.1,134,304\nC,2025-03-03 07:30:02,134.1,134,304\n");
    expect(messageOf(file, { timeColumn: "Label" })).toMatch(/^Column "Label" was given as the time column, but its cells \(e\.g\. "A"\) are neither/);
  });

  it("a reference that is not a temperature column", () => {
    expect(messageOf(utf8(header + rows), { referenceColumn: "Chamber (kPa abs)" })).toBe('The reference column "Chamber (kPa abs)" is not a temperature column');
  });

  it("a temperature below absolute zero", () => {
    expect(messageOf(utf8("Time (s),Drain (K),Pack (K),P (kPa abs)\n0,407,407,304\n1,-3,407,304\n2,407,407,304\n"))).toBe('Row 3, column "Drain (K)": "-3" is below absolute zero in K');
  });

  it("every row at the same time", () => {
    expect(messageOf(utf8("Time (s),Drain (°C),Pack (°C),P (kPa abs)\n5,134,134,304\n5,134,134,304\n5,134,134,304\n"))).toMatch(/every row has the same time/);
  });
});

describe("inspection stays cheap and honest", () => {
  it("counts rows and previews the first ten", () => {
    const many = Array.from({ length: 40 }, (_, i) => `${i},134.1,134.0,304.2`).join("\n");
    const result = inspectLoggerFile(utf8("Time (s),Drain (°C),Pack (°C),P (kPa abs)\n" + many));
    expect(result.rowCount).toBe(40);
    expect(result.preview.rows).toHaveLength(10);
    expect(result.preview.rows[9][0]).toBe("9");
  });

  it("reads UTF-16 exports (Excel's 'Unicode text') too", () => {
    const text = "Time (s)\tDrain (°C)\tPack (°C)\tP (kPa abs)\n0\t134,1\t134\t304\n1\t134,2\t134\t305\n2\t134,3\t134\t306\n";
    const bytes = new Uint8Array(2 + text.length * 2);
    bytes.set([0xff, 0xfe]);
    for (let i = 0; i < text.length; i++) {
      bytes[2 + 2 * i] = text.charCodeAt(i) & 0xff;
      bytes[3 + 2 * i] = text.charCodeAt(i) >> 8;
    }
    const { recording, dialect } = readLoggerFile(bytes);
    expect(dialect.encoding).toBe("utf-16le");
    expect(recording.temperatures[0].values[2]).toBeCloseTo(134.3, 12);
  });
});

describe("number parsing", () => {
  it.each([
    ["134.25", ".", 134.25],
    ["134,25", ",", 134.25],
    ["-0.5", ".", -0.5],
    ["+12", ".", 12],
    [" 7.5 ", ".", 7.5],
    ["1.5e2", ".", 150],
    ["1,5E-1", ",", 0.15],
    ["0.1", ".", 0.1],
    ["123456789.123456789", ".", 123456789.123456789],
  ])("%s with decimal %s is %f, exactly as parseFloat would give", (text, decimal, expected) => {
    expect(parseDecimal(text, 0, text.length, decimal.charCodeAt(0))).toBe(expected);
  });

  it.each([["12,a"], ["abc"], [""], ["1.2.3"], ["134,5"], ["--1"]])("%s is not a number with a decimal point", (text) => {
    expect(parseDecimal(text, 0, text.length, 46)).toBeNaN();
  });
});

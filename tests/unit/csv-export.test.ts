import { describe, expect, it } from "vitest";
import Papa from "papaparse";
import { csvCell, csvRow, neutraliseFormula, toCsv } from "@/lib/csv-export";

// The characters that make a spreadsheet evaluate a cell: OWASP "CSV Injection" page
// (= + - @, tab 0x09, carriage return 0x0D).
describe("CSV export is safe against spreadsheet formula injection", () => {
  it.each(["=HYPERLINK(\"http://x\",\"y\")", "+1+1", "-2+3", "@SUM(A1:A2)", "\tcmd", "\r=1"])(
    "a cell starting %j is prefixed with a single quote",
    (text) => {
      expect(neutraliseFormula(text)).toBe(`'${text}`);
      const cell = csvCell(text);
      expect(cell.startsWith(`"'`)).toBe(true);
      // Read back by an RFC 4180 parser, the value is the original text behind one quote.
      const [[parsed]] = Papa.parse<string[]>(cell, { newline: "\r\n" }).data;
      expect(parsed).toBe(`'${text}`);
    },
  );

  it("leaves ordinary text, numbers and an empty cell alone", () => {
    expect(csvCell("BD-134 cycle 0042")).toBe("BD-134 cycle 0042");
    expect(csvCell("Sterilizer 2 (theatre)")).toBe("Sterilizer 2 (theatre)");
    expect(csvCell(134.5)).toBe("134.5");
    expect(csvCell(-3.2)).toBe("-3.2");
    expect(csvCell(null)).toBe("");
    expect(csvCell(undefined)).toBe("");
    expect(csvCell(Number.NaN)).toBe("");
    expect(csvCell(true)).toBe("true");
  });

  it("quotes delimiters, quotes and line breaks (RFC 4180)", () => {
    expect(csvCell("instruments, trays")).toBe('"instruments, trays"');
    expect(csvCell('a "wrapped" load')).toBe('"a ""wrapped"" load"');
    expect(csvCell("two\nlines")).toBe('"two\nlines"');
  });

  it("a full document round-trips through a CSV parser with every value intact", () => {
    const rows = [
      ["c1", "=cmd|' /C calc'!A0", 121.4, "pass"],
      ["c2", 'load "A", trays\r\nand wraps', -1, null],
      ["c3", "@attacker", 0, "fail"],
    ] as const;
    const text = toCsv(["id", "load", "value", "verdict"], rows);
    expect(text.charCodeAt(0)).toBe(0xfeff);
    const parsed = Papa.parse<string[]>(text.slice(1), { newline: "\r\n", skipEmptyLines: true }).data;
    expect(parsed).toEqual([
      ["id", "load", "value", "verdict"],
      ["c1", "'=cmd|' /C calc'!A0", "121.4", "pass"],
      ["c2", 'load "A", trays\r\nand wraps', "-1", ""],
      ["c3", "'@attacker", "0", "fail"],
    ]);
    // No cell of the file, as a spreadsheet reads it, starts with a formula character.
    for (const row of parsed.slice(1)) for (const cell of row) if (!/^-?\d/.test(cell)) expect(cell).not.toMatch(/^[=+\-@\t\r]/);
  });

  it("csvRow joins cells with commas", () => {
    expect(csvRow(["a", 1, null, "=x"])).toBe(`a,1,,"'=x"`);
  });
});

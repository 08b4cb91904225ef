import { describe, expect, it } from "vitest";
import { encodeWindows1252, inspectLoggerFile, readLoggerFile } from "@/lib/logger-files";

const utf8 = (text: string) => new TextEncoder().encode(text);
const values = (a: Float64Array) => Array.from(a, (v) => Math.round(v * 1e6) / 1e6);

describe("delimiters, decimal marks and time formats", () => {
  it("comma-separated, ISO date-times with a space, °C and kPa abs", () => {
    const file = utf8(
      "Time,Drain (°C),Pack 1 (°C),Chamber (kPa abs)\n" + "2025-03-03 07:30:00,121.50,120.25,205.10\n" + "2025-03-03 07:30:01,121.60,120.50,205.90\n" + "2025-03-03 07:30:02,121.70,120.75,206.70\n",
    );
    const { recording, dialect, columns } = readLoggerFile(file);
    expect(dialect).toMatchObject({ delimiter: ",", decimal: ".", timeFormat: "iso", encoding: "utf-8", lineEnding: "lf", preambleLines: 0, headerLine: 1 });
    expect(recording.startedAt).toBe("2025-03-03T07:30:00");
    expect(values(recording.timesS)).toEqual([0, 1, 2]);
    expect(recording.temperatures.map((t) => t.header)).toEqual(["Drain (°C)", "Pack 1 (°C)"]);
    expect(values(recording.temperatures[1].values)).toEqual([120.25, 120.5, 120.75]);
    expect(values(recording.pressure.values)).toEqual([205.1, 205.9, 206.7]);
    expect(columns.map((c) => [c.role, c.unit, c.gauge])).toEqual([
      ["time", null, false],
      ["temperature", "C", false],
      ["temperature", "C", false],
      ["pressure", "kPa", false],
    ]);
  });

  it("semicolons with decimal commas, day.month.year times and bar gauge", () => {
    const file = utf8(
      "Zeit;Drain (°C);Pack 1 (°C);Kammer (bar g)\n" + "03.03.2025 23:59:58;134,10;133,95;2,028\n" + "03.03.2025 23:59:59;134,20;134,05;2,030\n" + "04.03.2025 00:00:00;134,30;134,15;2,032\n",
    );
    const { recording, dialect } = readLoggerFile(file);
    expect(dialect).toMatchObject({ delimiter: ";", decimal: ",", timeFormat: "dmy" });
    expect(recording.startedAt).toBe("2025-03-03T23:59:58");
    expect(values(recording.timesS)).toEqual([0, 1, 2]);
    expect(values(recording.temperatures[0].values)).toEqual([134.1, 134.2, 134.3]);
    // gauge + 101.325 kPa standard atmosphere
    expect(values(recording.pressure.values)).toEqual([304.125, 304.325, 304.525]);
  });

  it("tabs, month/day/year with AM/PM, °F and psig", () => {
    const file = utf8(
      "Date Time\tDrain (°F)\tPack 1 (°F)\tChamber (psig)\n" +
        "03/04/2025 11:59:59 AM\t273.20\t273.02\t29.42\n" +
        "03/04/2025 12:00:00 PM\t273.38\t273.20\t29.50\n" +
        "03/04/2025 12:00:01 PM\t273.56\t273.38\t29.60\n",
    );
    const { recording, dialect, columns } = readLoggerFile(file);
    expect(dialect).toMatchObject({ delimiter: "\t", decimal: ".", timeFormat: "mdy-ampm" });
    expect(recording.startedAt).toBe("2025-03-04T11:59:59");
    expect(values(recording.timesS)).toEqual([0, 1, 2]);
    expect(recording.temperatures[0].values[0]).toBeCloseTo(134, 9); // 273.2 °F = 134 °C
    expect(recording.pressure.values[0]).toBeCloseTo(29.42 * 6.894757293168361 + 101.325, 9);
    expect(columns[3]).toMatchObject({ unit: "psi", gauge: true });
  });

  it("12 AM is midnight and 12 PM is noon", () => {
    const file = utf8("Time,Drain (°C),Pack (°C),P (kPa)\n" + "12/31/2024 11:59:59 PM,20,20,101\n" + "01/01/2025 12:00:00 AM,20,20,101\n" + "01/01/2025 12:00:01 AM,20,20,101\n");
    const { recording } = readLoggerFile(file);
    expect(values(recording.timesS)).toEqual([0, 1, 2]);
  });

  it("ISO date-times with a T, a fraction of a second and a UTC offset", () => {
    const file = utf8(
      "timestamp,drain_degC,load_degC,p_kPa_abs\n" + "2025-06-01T10:00:00.500+02:00,100,99,101.4\n" + "2025-06-01T10:00:01.000+02:00,101,100,105.0\n" + "2025-06-01T10:00:01.500+02:00,102,101,108.8\n",
    );
    const { recording, dialect, columns } = readLoggerFile(file);
    expect(dialect.timeFormat).toBe("iso");
    expect(recording.startedAt).toBe("2025-06-01T08:00:00.500Z");
    expect(values(recording.timesS)).toEqual([0, 0.5, 1]);
    expect(columns.map((c) => c.role)).toEqual(["time", "temperature", "temperature", "pressure"]);
  });

  it("elapsed seconds, kelvin and MPa", () => {
    const file = utf8("t (s),Drain (K),Pack 1 (K),P (MPa)\n0,407.15,406.15,0.30420\n2.5,407.25,406.65,0.30500\n5,407.35,407.15,0.30560\n");
    const { recording, dialect, columns } = readLoggerFile(file);
    expect(dialect.timeFormat).toBe("elapsed-seconds");
    expect(recording.startedAt).toBeNull();
    expect(values(recording.timesS)).toEqual([0, 2.5, 5]);
    expect(values(recording.temperatures[0].values)).toEqual([134, 134.1, 134.2]);
    expect(values(recording.pressure.values)).toEqual([304.2, 305, 305.6]);
    expect(columns[0]).toMatchObject({ role: "time", unit: "s" });
  });

  it("elapsed minutes and decimal commas in the time column", () => {
    const file = utf8("Elapsed [min];Drain [°C];Pack [°C];Chamber [mbar a]\n0;120;119;1985\n0,5;121;120;2050\n1,0;122;121;2115\n");
    const { recording } = readLoggerFile(file);
    expect(values(recording.timesS)).toEqual([0, 30, 60]);
    expect(values(recording.pressure.values)).toEqual([198.5, 205, 211.5]);
  });

  it("clock times without a date carry over midnight", () => {
    const file = utf8("Time,Drain (°C),Pack (°C),P (kPa abs)\n23:59:59,20,20,101\n00:00:00,20,20,101\n00:00:01,20,20,101\n");
    const { recording, dialect, warnings } = readLoggerFile(file);
    expect(dialect.timeFormat).toBe("clock");
    expect(values(recording.timesS)).toEqual([0, 1, 2]);
    expect(warnings[0]).toMatch(/pass midnight 1 time/);
  });
});

describe("units and gauge markers in headers", () => {
  const hot = (pressure: string[]) => pressure.map((p, i) => `${i},${(134 + i * 0.1).toFixed(1)},${(133.9 + i * 0.1).toFixed(1)},${p}`).join("\n") + "\n";

  it.each([
    ["Chamber (kPa abs)", ["304.2", "305.1", "306.0"], "kPa", false, 304.2],
    ["Chamber (kPa a)", ["304.2", "305.1", "306.0"], "kPa", false, 304.2],
    ["Chamber [kPa(g)]", ["202.9", "203.8", "204.7"], "kPa", true, 304.225],
    ["Chamber (bar abs)", ["3.042", "3.051", "3.060"], "bar", false, 304.2],
    ["Chamber (barg)", ["2.029", "2.038", "2.047"], "bar", true, 304.225],
    ["Chamber (mbar abs)", ["3042", "3051", "3060"], "mbar", false, 304.2],
    ["Chamber (MPa)", ["0.3042", "0.3051", "0.3060"], "MPa", false, 304.2],
    ["Chamber (psia)", ["44.12", "44.25", "44.38"], "psi", false, 44.12 * 6.894757293168361],
    ["Chamber (psi g)", ["29.42", "29.55", "29.68"], "psi", true, 29.42 * 6.894757293168361 + 101.325],
    ["Chamber (mmHg)", ["2281.7", "2288.5", "2295.2"], "mmHg", false, 2281.7 * 0.133322387415],
    ["Chamber pressure gauge (bar)", ["2.029", "2.038", "2.047"], "bar", true, 304.225],
  ])("%s", (header, pressure, unit, gauge, firstKpa) => {
    const { recording, columns } = readLoggerFile(utf8(`Time (s),Drain (°C),Pack (°C),${header}\n` + hot(pressure)));
    expect(columns[3]).toMatchObject({ role: "pressure", unit, gauge });
    expect(recording.pressure.values[0]).toBeCloseTo(firstKpa, 6);
  });

  it.each([["°C"], ["degC"], ["deg C"], ["C"], ["℃"]])("reads %s in headers as Celsius", (label) => {
    const { columns } = readLoggerFile(utf8(`Time (s),Drain (${label}),Pack (${label}),P (kPa abs)\n` + hot(["304.2", "305.1", "306.0"])));
    expect(columns[1]).toMatchObject({ role: "temperature", unit: "C", unsure: [] });
  });

  it("a gauge-pressure file without a marker is read as absolute, never as whichever fits steam, and says so (issue 9 rule 5)", () => {
    const file = utf8("Time (s),Drain (°C),Pack (°C),Chamber (kPa)\n" + hot(["202.9", "203.8", "204.7"]));
    const { recording, columns, warnings } = readLoggerFile(file);
    expect(columns[3]).toMatchObject({ unit: "kPa", gauge: false });
    expect(columns[3].unsure[0]).toMatch(/no abs\/gauge marker/);
    expect(recording.pressure.values[0]).toBeCloseTo(202.9, 6);
    expect(recording.source?.pressureReference).toEqual({ kind: "absolute", source: "assumed" });
    expect(warnings.join(" ")).toMatch(/no abs\/gauge marker, so its readings were taken as absolute/);
    // Told gauge, by an option or a user's mapping, the same file reads 202.9 + 101.325 kPa.
    const told = readLoggerFile(file, { pressureGauge: true }, { overrideSource: "user" });
    expect(told.recording.pressure.values[0]).toBeCloseTo(304.225, 6);
    expect(told.recording.source?.pressureReference).toEqual({ kind: "gauge", source: "user" });
  });

  it("an unmarked absolute file stays absolute", () => {
    const { columns } = readLoggerFile(utf8("Time (s),Drain (°C),Pack (°C),Chamber (kPa)\n" + hot(["304.2", "305.1", "306.0"])));
    expect(columns[3]).toMatchObject({ unit: "kPa", gauge: false });
  });

  it("a pressure column without a unit gets the unit that fits saturated steam, and says it is unsure", () => {
    const { columns } = readLoggerFile(utf8("Time (s),Drain (°C),Pack (°C),Pressure\n" + hot(["3.042", "3.051", "3.060"])));
    expect(columns[3]).toMatchObject({ role: "pressure", unit: "bar", gauge: false });
    expect(columns[3].unsure.join(" ")).toMatch(/no unit in the header/);
  });

  it("takes the reference from a header naming the drain, else the first temperature", () => {
    const drainLast = readLoggerFile(utf8("Time (s),Pack (°C),Drain (°C),P (kPa abs)\n" + hot(["304.2", "305.1", "306.0"])));
    expect(drainLast.recording.referenceIndex).toBe(1);
    const ref = inspectLoggerFile(utf8("Time (s),Pack (°C),REF probe (°C),P (kPa abs)\n" + hot(["304.2", "305.1", "306.0"])));
    expect(ref.referenceColumn).toBe("REF probe (°C)");
    const none = inspectLoggerFile(utf8("Time (s),Pack A (°C),Pack B (°C),P (kPa abs)\n" + hot(["304.2", "305.1", "306.0"])));
    expect(none.referenceColumn).toBe("Pack A (°C)");
    expect(none.columns[1].unsure[0]).toMatch(/first temperature column/);
  });
});

describe("encodings, line endings, preambles and quotes", () => {
  const table =
    "Time;Drain (°C);Pack 1 (°C);Chamber (kPa abs)\r\n" +
    "03.03.2025 07:30:00;134,10;134,00;304,20\r\n" +
    "03.03.2025 07:30:05;134,20;134,10;304,90\r\n" +
    "03.03.2025 07:30:10;134,30;134,20;305,60\r\n";

  it("Windows-1252 with the degree sign as byte 0xB0, CRLF and preamble lines", () => {
    const text = "Sterilizer: Autoclave 2\r\nOperator: J. Müller\r\n\r\n" + table;
    const bytes = encodeWindows1252(text);
    expect(bytes.includes(0xb0)).toBe(true);
    const inspected = inspectLoggerFile(bytes);
    expect(inspected.dialect).toMatchObject({ encoding: "windows-1252", lineEnding: "crlf", preambleLines: 3, headerLine: 4, decimal: ",", delimiter: ";" });
    expect(inspected.preamble).toEqual(["Sterilizer: Autoclave 2", "Operator: J. Müller", ""]);
    expect(inspected.columns[1].header).toBe("Drain (°C)");
    const { recording } = readLoggerFile(bytes);
    expect(recording.temperatures[0].header).toBe("Drain (°C)");
    expect(values(recording.timesS)).toEqual([0, 5, 10]);
  });

  it("UTF-8 with a byte-order mark", () => {
    const bytes = new Uint8Array([0xef, 0xbb, 0xbf, ...utf8(table)]);
    const { recording, dialect, columns } = readLoggerFile(bytes);
    expect(dialect.encoding).toBe("utf-8-bom");
    expect(columns[0].header).toBe("Time");
    expect(values(recording.pressure.values)).toEqual([304.2, 304.9, 305.6]);
  });

  it("quoted fields (read through papaparse)", () => {
    const file = utf8(
      '"Time","Drain (°C)","Pack, centre (°C)","Chamber (kPa abs)"\n' +
        '"2025-03-03 07:30:00","134.1","134.0","304.2"\n' +
        '"2025-03-03 07:30:01","134.2","134.1","304.9"\n' +
        '"2025-03-03 07:30:02","134.3","134.2","305.6"\n',
    );
    const { recording, dialect } = readLoggerFile(file);
    expect(dialect.quoted).toBe(true);
    expect(recording.temperatures[1].header).toBe("Pack, centre (°C)");
    expect(values(recording.temperatures[1].values)).toEqual([134, 134.1, 134.2]);
  });

  it("ignores a footer after the data and says so", () => {
    const { recording, warnings } = readLoggerFile(utf8(table + "End of record;;;\r\nChecksum;A1B2;;\r\n"));
    expect(recording.timesS.length).toBe(3);
    expect(warnings[0]).toMatch(/Ignored 2 line\(s\) after the data from line 5/);
  });

  it("headers are reported trimmed, exactly as in the file", () => {
    const { columns } = inspectLoggerFile(utf8("  Time ,  Drain (°C)  , Pack 1 (°C),Chamber (kPa abs)\n0,1,2,3\n1,1,2,3\n2,1,2,3\n"));
    expect(columns.map((c) => c.header)).toEqual(["Time", "Drain (°C)", "Pack 1 (°C)", "Chamber (kPa abs)"]);
  });
});

describe("inspecting and overriding the mapping", () => {
  const file = utf8(
    "Run 17\n" + "Index,Clock,TC1,TC2,Kammerdruck\n" + "1,10:00:00,20.0,20.1,101.3\n" + "2,10:00:10,60.0,55.0,150.0\n" + "3,10:00:20,134.2,134.0,203.1\n" + "4,10:00:30,134.3,134.1,203.3\n",
  );

  it("shows the guessed mapping, a preview and what it is unsure of", () => {
    const inspected = inspectLoggerFile(file);
    expect(inspected.dialect.preambleLines).toBe(1);
    expect(inspected.preview.header).toEqual(["Index", "Clock", "TC1", "TC2", "Kammerdruck"]);
    expect(inspected.preview.rows[0]).toEqual(["1", "10:00:00", "20.0", "20.1", "101.3"]);
    expect(inspected.rowCount).toBe(4);
    expect(inspected.columns.map((c) => c.role)).toEqual(["ignored", "time", "temperature", "temperature", "pressure"]);
    expect(inspected.columns[2].unsure.join(" ")).toMatch(/no unit in the header; read as °C/);
    expect(inspected.columns[4].unsure.length).toBeGreaterThan(0);
  });

  it("applies overrides for the time column, pressure unit and gauge, temperature unit and reference", () => {
    const { recording, columns } = readLoggerFile(file, {
      timeColumn: "Index",
      pressureColumn: "Kammerdruck",
      pressureUnit: "kPa",
      pressureGauge: true,
      temperatureUnit: "C",
      referenceColumn: "TC2",
      atmosphereKpa: 95,
      columns: { Clock: { role: "ignored" } },
    });
    expect(columns[0].role).toBe("time");
    expect(columns[1].role).toBe("ignored");
    expect(values(recording.timesS)).toEqual([0, 1, 2, 3]);
    expect(recording.referenceIndex).toBe(1);
    expect(recording.pressure.values[0]).toBeCloseTo(196.3, 9);
  });

  it("maps columns by header, with units", () => {
    const { recording } = readLoggerFile(file, { columns: { TC1: { role: "temperature", unit: "°F" }, TC2: { role: "ignored" } } });
    expect(recording.temperatures.map((t) => t.header)).toEqual(["TC1"]);
    expect(recording.temperatures[0].values[0]).toBeCloseTo(((20 - 32) * 5) / 9, 9);
  });
});

describe("quoted headers above plain data", () => {
  it("reads the headers without quotes and the data by the fast path", () => {
    const file = utf8('"Time (s)";"Drain (°C)";"Pack (°C)";"P (kPa abs)"\n0;134,1;134;304,2\n1;134,2;134,1;304,9\n2;134,3;134,2;305,6\n');
    const { recording, dialect } = readLoggerFile(file);
    expect(dialect.quoted).toBe(true);
    expect(recording.temperatures.map((t) => t.header)).toEqual(["Drain (°C)", "Pack (°C)"]);
    expect(values(recording.pressure.values)).toEqual([304.2, 304.9, 305.6]);
  });
});

describe("the time column is found by its header before its content", () => {
  it("a rising probe named T1 is not mistaken for elapsed time", () => {
    const file = utf8("T1,T2,Time (s),P (kPa abs)\n120.1,119.0,0,198.7\n121.3,120.2,1,206.0\n122.0,121.1,2,211.0\n");
    const { columns, recording } = readLoggerFile(file);
    expect(columns.map((c) => c.role)).toEqual(["temperature", "temperature", "time", "pressure"]);
    expect(values(recording.timesS)).toEqual([0, 1, 2]);
  });
});

describe("several pressure columns", () => {
  it("uses the chamber pressure and says why the other is left out", () => {
    const file = utf8("Time (s),Drain (°C),Pack (°C),Jacket pressure,Chamber pressure (kPa)\n0,134.1,134,320,304.2\n1,134.2,134.1,321,304.9\n2,134.3,134.2,320,305.6\n");
    const { columns, recording } = readLoggerFile(file);
    expect(recording.pressure.header).toBe("Chamber pressure (kPa)");
    expect(columns[3].role).toBe("ignored");
    expect(columns[3].unsure).toEqual(['another pressure column; "Chamber pressure (kPa)" is used as the chamber pressure']);
  });
});

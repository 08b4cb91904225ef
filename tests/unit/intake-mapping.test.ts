import { describe, expect, it } from "vitest";
import type { InspectResponse } from "@/lib/cycles/contracts";
import { columnsFrom, draftProblems, hasProblems, toMappingOverrides, type IntakeDraft } from "@/components/intake/intake-request";
import { changeColumn } from "@/components/intake/mapping-table";

/** An inspection answer as the server gives it for a file with time, two temperatures and one pressure column. */
function inspected(pressureReference: InspectResponse["pressureReference"], pressureHeader = "Chamber (kPa)"): InspectResponse {
  const gauge = pressureReference?.kind === "gauge";
  return {
    dialect: { encoding: "utf-8", delimiter: ",", decimal: ".", lineEnding: "lf", preambleLines: 0, headerLine: 1, timeFormat: "iso", quoted: false },
    columns: [
      { index: 0, header: "Time", role: "time", unit: null, gauge: false, unsure: [] },
      { index: 1, header: "Drain (°C)", role: "temperature", unit: "C", gauge: false, unsure: [] },
      { index: 2, header: "Free space (°C)", role: "temperature", unit: "C", gauge: false, unsure: [] },
      { index: 3, header: pressureHeader, role: "pressure", unit: "kPa", gauge, unsure: [] },
    ],
    referenceColumn: "Drain (°C)",
    freeSpaceColumn: "Free space (°C)",
    pressureReference,
    preview: { header: ["Time", "Drain (°C)", "Free space (°C)", pressureHeader], rows: [] },
    rowCount: 100,
    preamble: [],
    problems: [],
    name: "cycle.csv",
    size: 1000,
    sha256: "0".repeat(64),
    warnings: [],
    savedMapping: null,
  } as InspectResponse;
}

function draftOf(inspect: InspectResponse, columns = columnsFrom(inspect)): IntakeDraft {
  const fields = {
    sterilizerId: "7b0c5d8e-3a41-4c55-9a3e-1f2b3c4d5e6f",
    profileId: "8c1d6e9f-4b52-4d66-8b4f-2a3b4c5d6e7f",
    instrumentId: "",
    cycleNumber: "",
    load: "",
    loadType: "" as const,
    loadLot: "",
    testKind: "thermometric-small-load" as const,
    startedAt: "",
    duplicateReason: "",
  };
  return { files: [new File(["x"], "cycle.csv")], inspect, columns, referenceColumn: "Drain (°C)", freeSpaceColumn: inspect.freeSpaceColumn, placements: {}, fields, saveMapping: false };
}

describe("absolute or gauge on the intake screen", () => {
  it("an assumed reference leaves the choice open, refuses to analyse, and sends no gauge flag", () => {
    const inspect = inspected({ kind: "absolute", source: "assumed" });
    const columns = columnsFrom(inspect);
    expect(columns[3].gauge).toBeNull();
    const problems = draftProblems(draftOf(inspect, columns));
    expect(problems.pressureReferenceError).toMatch(/Choose whether "Chamber \(kPa\)" reads absolute or gauge pressure/);
    expect(hasProblems(problems)).toBe(true);
    const overrides = toMappingOverrides(columns, "Drain (°C)", null);
    expect(overrides).not.toHaveProperty("pressureGauge");
    expect(overrides.columns!["Chamber (kPa)"]).toEqual({ role: "pressure", unit: "kPa" });
  });

  it("the user's choice is sent, and then nothing stands in the way", () => {
    const inspect = inspected({ kind: "absolute", source: "assumed" });
    const columns = changeColumn(columnsFrom(inspect), 3, { gauge: true });
    expect(columns[3]).toMatchObject({ gauge: true, gaugeFrom: "user" });
    expect(draftProblems(draftOf(inspect, columns)).pressureReferenceError).toBeNull();
    const overrides = toMappingOverrides(columns, "Drain (°C)", null);
    expect(overrides.pressureGauge).toBe(true);
    expect(overrides.columns!["Chamber (kPa)"]).toEqual({ role: "pressure", unit: "kPa", gauge: true });
  });

  it("a header marker is shown as the header's and left for the server to read; a saved confirmation is sent again", () => {
    const fromHeader = columnsFrom(inspected({ kind: "gauge", source: "header" }, "Chamber (bar g)"));
    expect(fromHeader[3]).toMatchObject({ gauge: true, gaugeFrom: "header" });
    expect(toMappingOverrides(fromHeader, "Drain (°C)", null)).not.toHaveProperty("pressureGauge");
    const fromSaved = columnsFrom(inspected({ kind: "absolute", source: "user" }));
    expect(fromSaved[3]).toMatchObject({ gauge: false, gaugeFrom: "saved" });
    expect(toMappingOverrides(fromSaved, "Drain (°C)", null).pressureGauge).toBe(false);
  });

  it("a column newly marked as pressure waits for the choice again", () => {
    const inspect = inspected({ kind: "gauge", source: "header" }, "Chamber (bar g)");
    const columns = changeColumn(changeColumn(columnsFrom(inspect), 3, { role: "ignored" }), 2, { role: "pressure" });
    expect(columns[2]).toMatchObject({ role: "pressure", gauge: null, gaugeFrom: null });
  });
});

describe("the free-space sensor in the mapping", () => {
  it("is named when marked, and named as none ('') otherwise, so the analysis uses what the table shows", () => {
    const columns = columnsFrom(inspected({ kind: "absolute", source: "header" }, "Chamber (kPa abs)"));
    expect(toMappingOverrides(columns, "Drain (°C)", "Free space (°C)").freeSpaceColumn).toBe("Free space (°C)");
    expect(toMappingOverrides(columns, "Drain (°C)", null).freeSpaceColumn).toBe("");
    // A free-space column that is no longer a temperature column is not sent.
    expect(toMappingOverrides(changeColumn(columns, 2, { role: "ignored" }), "Drain (°C)", "Free space (°C)").freeSpaceColumn).toBe("");
  });
});

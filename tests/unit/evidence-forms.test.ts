import { describe, expect, it } from "vitest";
import { formatPopulation, indicatorCellKey, indicatorGrid, isIndicatorCorrection, parsePopulation, type IndicatorReading } from "@/lib/domain/study-evidence";
import { closeDeviationSchema, indicatorFormSchema, raiseDeviationSchema, updateDeviationSchema } from "@/lib/validations/study-evidence";

describe("a biological indicator's population per carrier", () => {
  it("is shown with its power of ten, as certificates print it (worked by hand)", () => {
    expect(formatPopulation(1_000_000)).toBe("1.0 × 10⁶");
    expect(formatPopulation(1_500_000)).toBe("1.5 × 10⁶");
    expect(formatPopulation(23_000)).toBe("2.3 × 10⁴");
    expect(formatPopulation(250)).toBe("250");
    expect(formatPopulation(null)).toBe("—");
  });

  it("is read from the ways people type it, and refused rather than guessed otherwise", () => {
    expect(parsePopulation("1000000")).toBe(1e6);
    expect(parsePopulation("1.5e6")).toBe(1.5e6);
    expect(parsePopulation("1,5 × 10^6")).toBe(1.5e6);
    expect(parsePopulation("2.1 x 10^5")).toBeCloseTo(2.1e5, 6);
    expect(parsePopulation("1.0 × 10⁶")).toBe(1e6);
    expect(parsePopulation(formatPopulation(2_300_000))).toBeCloseTo(2.3e6, 6);
    // "× 100" without a caret could be 10^0 or the number 100: not guessed
    expect(parsePopulation("2 x 100")).toBeNull();
    expect(parsePopulation("a million")).toBeNull();
    expect(parsePopulation("0")).toBeNull();
    expect(parsePopulation("-1e6")).toBeNull();
    expect(parsePopulation("")).toBeNull();
  });
});

describe("the grid of indicator readings (runs × positions)", () => {
  const reading = (id: string, runId: string, positionId: string, kind: IndicatorReading["kind"], result: IndicatorReading["result"], recordedAt: string, current: boolean): IndicatorReading => ({
    id,
    runId,
    positionId,
    kind,
    result,
    recordedAt,
    current,
  });
  const readings = [
    reading("a", "r1", "P1", "biological", "growth", "2026-03-01T10:00:00Z", false),
    reading("b", "r1", "P1", "biological", "no-growth", "2026-03-02T10:00:00Z", true),
    reading("c", "r1", "P1", "chemical", "fail", "2026-03-01T09:00:00Z", true),
    reading("d", "r2", "P1", "biological", "no-growth", "2026-03-05T10:00:00Z", true),
  ];

  it("holds the current reading per kind and every reading newest first, so a correction stays visible", () => {
    const cells = indicatorGrid(readings);
    const cell = cells.get(indicatorCellKey("r1", "P1"))!;
    expect(cell.current.biological?.id).toBe("b");
    expect(cell.current.chemical?.result).toBe("fail");
    expect(cell.history.map((r) => r.id)).toEqual(["b", "a", "c"]);
    expect(cells.get(indicatorCellKey("r2", "P1"))!.history).toHaveLength(1);
    expect(cells.has(indicatorCellKey("r2", "P2"))).toBe(false);
  });

  it("calls a second reading of the same run, position and kind a correction, and only that", () => {
    expect(isIndicatorCorrection(readings, { runId: "r1", positionId: "P1", kind: "chemical" })).toBe(true);
    expect(isIndicatorCorrection(readings, { runId: "r2", positionId: "P1", kind: "chemical" })).toBe(false);
    expect(isIndicatorCorrection(readings, { runId: "r1", positionId: "P2", kind: "biological" })).toBe(false);
  });
});

describe("the indicator form", () => {
  const biological = {
    studyId: "s1",
    runId: "r1",
    positionId: "P3",
    kind: "biological",
    result: "no-growth",
    organism: "Geobacillus stearothermophilus",
    lot: "BI-2231",
    population: "1.5 × 10^6",
    incubation: "55–60 °C, 7 days",
    readBy: "Lab, K. Mensah",
    readAt: "2026-03-02T08:00:00.000Z",
    reason: "",
  };

  it("reads a biological reading with its population as a number", () => {
    const parsed = indicatorFormSchema.parse(biological);
    expect(parsed).toMatchObject({ kind: "biological", result: "no-growth", population: 1.5e6, reason: null, organism: "Geobacillus stearothermophilus" });
  });

  it("refuses a biological reading without population or incubation, naming the field", () => {
    const result = indicatorFormSchema.safeParse({ ...biological, population: "", incubation: "" });
    expect(result.success).toBe(false);
    expect(result.error!.issues.map((i) => i.path[0]).sort()).toEqual(["incubation", "population"]);
  });

  it("refuses a result of the other kind (growth is not a chemical result)", () => {
    const result = indicatorFormSchema.safeParse({ ...biological, kind: "chemical", result: "growth" });
    expect(result.success).toBe(false);
    expect(result.error!.issues[0].path).toEqual(["result"]);
  });

  it("drops the biological fields from a chemical reading", () => {
    const parsed = indicatorFormSchema.parse({ ...biological, kind: "chemical", result: "fail" });
    expect(parsed).toMatchObject({ kind: "chemical", result: "fail", organism: null, population: null, incubation: null, lot: "BI-2231" });
  });

  it("refuses a reading time in the future and a population that is not a number", () => {
    const future = new Date(Date.now() + 3_600_000).toISOString();
    expect(indicatorFormSchema.safeParse({ ...biological, readAt: future }).error!.issues[0].message).toBe("The reading time is in the future.");
    expect(indicatorFormSchema.safeParse({ ...biological, population: "lots" }).error!.issues[0].path).toEqual(["population"]);
  });
});

describe("the deviation forms", () => {
  it("raise one for the study as a whole when no run is chosen, and need what happened", () => {
    expect(raiseDeviationSchema.parse({ studyId: "s1", runId: "", what: "Probe P2 came loose in run 2." })).toEqual({
      studyId: "s1",
      runId: null,
      what: "Probe P2 came loose in run 2.",
      // the service's schema takes an impact or none, never null
      impact: undefined,
    });
    expect(raiseDeviationSchema.parse({ studyId: "s1", what: "Seal leak.", impact: "Run 2 void." }).impact).toBe("Run 2 void.");
    expect(raiseDeviationSchema.safeParse({ studyId: "s1", what: "  " }).error!.issues[0].path).toEqual(["what"]);
  });

  it("keep a cleared investigation field as empty (a change), and one not sent as no change", () => {
    expect(updateDeviationSchema.parse({ studyId: "s1", deviationId: "d1", impact: "", rootCause: "Door gasket worn." })).toEqual({
      studyId: "s1",
      deviationId: "d1",
      impact: "",
      rootCause: "Door gasket worn.",
      capaReference: undefined,
    });
  });

  it("close one only with a reason", () => {
    expect(closeDeviationSchema.safeParse({ studyId: "s1", deviationId: "d1", reason: "" }).error!.issues[0].path).toEqual(["reason"]);
    expect(closeDeviationSchema.parse({ studyId: "s1", deviationId: "d1", reason: "Gasket replaced; repeat run passed." }).reason).toBe("Gasket replaced; repeat run passed.");
  });
});

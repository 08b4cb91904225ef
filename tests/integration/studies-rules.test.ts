import { describe, expect, it } from "vitest";
import { proposeSensorMap, sensorMapProblem } from "@/lib/studies/sensor-map";
import { studySignatureRefusal, type SignRuleInput } from "@/lib/studies/sign-rules";
import { addMonths } from "@/lib/studies/dates";
import type { PatternPosition } from "@/lib/domain/studies";

// The pure rules behind the study services, on constructed inputs (worked by hand).

const POSITIONS: PatternPosition[] = [
  { id: "P1", label: "Tray 1 centre", sensorPosition: "load-item" },
  { id: "P2", label: "Tray 2 left", sensorPosition: "load-item" },
  { id: "P3", label: "Door side", sensorPosition: "door" },
];

describe("the sensor-map proposal", () => {
  it("a header that starts with a position id as a word, equals its label, or whose placement note names it, gets that position; P30 is not P3", () => {
    const proposal = proposeSensorMap({
      headers: ["P1 (°C)", "Tray 2 left", "T7", "P30", "Drain (°C)"],
      placements: { T7: { position: "load-item", note: "at P3, by the door" }, "Drain (°C)": { position: "reference-drain" } },
      positions: POSITIONS,
    });
    expect(proposal.sensorMap).toEqual({ "P1 (°C)": "P1", "Tray 2 left": "P2", T7: "P3" });
    expect(proposal.channels.find((c) => c.header === "P30")!.positionId).toBeNull();
    // The drain is not a load position: the pattern has none at the reference point.
    expect(proposal.channels.find((c) => c.header === "Drain (°C)")).toEqual({ header: "Drain (°C)", placement: "reference-drain", positionId: null });
    expect(proposal).toMatchObject({ missing: [], complete: true });
  });

  it("falls back to the single position with the channel's chamber position; two candidates or two claimants give none (fail closed)", () => {
    const proposal = proposeSensorMap({
      headers: ["Ch 1", "Ch 2", "Ch 3"],
      placements: { "Ch 1": { position: "door" }, "Ch 2": { position: "load-item" }, "Ch 3": { position: "door" } },
      positions: POSITIONS,
    });
    // Ch 2 could be P1 or P2; Ch 1 and Ch 3 both claim P3.
    expect(proposal.sensorMap).toEqual({});
    expect(proposal).toMatchObject({ missing: ["P1", "P2", "P3"], complete: false });
  });

  it("a confirmed map must name the cycle's channels and the pattern's positions, and cover every position", () => {
    const headers = ["A", "B", "C"];
    expect(sensorMapProblem({ sensorMap: { A: "P1", B: "P2", C: "P3" }, headers, positions: POSITIONS })).toBeNull();
    // Two channels at one position are allowed (read together by the summary).
    expect(sensorMapProblem({ sensorMap: { A: "P1", B: "P1", C: "P2" }, headers, positions: POSITIONS })).toMatch(/position P3;/);
    expect(sensorMapProblem({ sensorMap: { A: "P1", B: "P2", C: "P9" }, headers, positions: POSITIONS })).toMatch(/"P9", which the loading pattern does not have/);
    expect(sensorMapProblem({ sensorMap: { Z: "P1" }, headers, positions: POSITIONS })).toMatch(/"Z", which is not a temperature channel/);
    expect(sensorMapProblem({ sensorMap: { A: "P1" }, headers, positions: POSITIONS })).toMatch(/positions P2 and P3;/);
  });
});

describe("who signs a study when", () => {
  const base: SignRuleInput = {
    actor: { id: "qa", role: "engineer" },
    status: "ready-for-review",
    authorId: "author",
    signatures: [
      { meaning: "protocol-approved", userId: "rev" },
      { meaning: "submitted-for-review", userId: "author" },
      { meaning: "reviewed", userId: "rev" },
    ],
    seriesComplete: true,
    pendingRuns: 0,
    openDeviations: 0,
    runsRequired: 3,
  };

  it("QA approval: a third engineer, after the review, with the series complete and nothing open", () => {
    expect(studySignatureRefusal(base, "qa-approved", null)).toBeNull();
    expect(studySignatureRefusal({ ...base, actor: { id: "rev", role: "engineer" } }, "qa-approved", null)?.status).toBe(403);
    expect(studySignatureRefusal({ ...base, actor: { id: "author", role: "engineer" } }, "qa-approved", null)?.status).toBe(403);
    expect(studySignatureRefusal({ ...base, actor: { id: "qa", role: "auditor" } }, "qa-approved", null)?.status).toBe(403);
    expect(studySignatureRefusal({ ...base, openDeviations: 2 }, "qa-approved", null)?.message).toMatch(/while 2 deviations are open/);
    expect(studySignatureRefusal({ ...base, seriesComplete: false }, "qa-approved", null)?.message).toMatch(/last 3 runs attached must all pass/);
    expect(studySignatureRefusal({ ...base, pendingRuns: 1 }, "qa-approved", null)?.message).toMatch(/a run is still pending/);
    // A review before the latest submission does not count: the study was returned and submitted again.
    const resubmitted = { ...base, signatures: [...base.signatures, { meaning: "returned" as const, userId: "qa" }, { meaning: "submitted-for-review" as const, userId: "author" }] };
    expect(studySignatureRefusal(resubmitted, "qa-approved", null)?.message).toMatch(/must be reviewed/);
    expect(studySignatureRefusal({ ...resubmitted, actor: { id: "rev", role: "engineer" } }, "reviewed", null)).toBeNull();
  });

  it("the state decides the meaning; returned and failed need a reason", () => {
    expect(studySignatureRefusal({ ...base, status: "draft" }, "qa-approved", null)?.status).toBe(409);
    expect(studySignatureRefusal({ ...base, status: "draft" }, "protocol-approved", null)).toBeNull();
    expect(studySignatureRefusal({ ...base, status: "running" }, "failed", null)?.status).toBe(400);
    expect(studySignatureRefusal({ ...base, status: "running" }, "failed", "Load changed.")).toBeNull();
    expect(studySignatureRefusal({ ...base, status: "approved" }, "failed", "late")?.status).toBe(409);
    expect(studySignatureRefusal(base, "returned", "Missing chart.")).toBeNull();
  });
});

describe("the requalification date", () => {
  it("adds calendar months, ending on the month's last day when the day is missing (common practice)", () => {
    expect(addMonths("2026-12-02", 12)).toBe("2027-12-02");
    expect(addMonths("2026-01-31", 1)).toBe("2026-02-28");
    expect(addMonths("2027-01-31", 1)).toBe("2027-02-28");
    expect(addMonths("2028-01-31", 1)).toBe("2028-02-29");
    expect(addMonths("2026-11-30", 3)).toBe("2027-02-28");
    expect(addMonths("2026-03-15", 24)).toBe("2028-03-15");
  });
});

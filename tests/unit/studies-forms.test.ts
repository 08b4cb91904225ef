import { describe, expect, it } from "vitest";
import { attachRunFormSchema, createStudyFormSchema, signStudyFormSchema, updateDraftFormSchema } from "@/lib/validations/study-forms";

/** The study pages' forms as a browser posts them: flat strings, the pattern's rows as one JSON field. */
const base = { sterilizerId: "s1", profileId: "p1", kind: "heat-penetration", runsRequired: "3", requalificationMonths: "12", protocol: "Three runs." };
const pattern = {
  name: "Tray set",
  items: [{ name: "Tray", quantity: 4 }],
  positions: [
    { id: "P1", label: "Tray 1, top" },
    { id: "P2", label: "Tray 2, centre", sensorPosition: "pack-centre" },
  ],
};

describe("planning form", () => {
  it("reads a new pattern, the criteria as numbers (decimal comma accepted) and an unticked indicator box as false", () => {
    const parsed = createStudyFormSchema.parse({ ...base, pattern: JSON.stringify(pattern), minF0Min: "30,5", maxSpreadK: "" });
    expect(parsed.pattern).toMatchObject({ name: "Tray set", positions: [{ id: "P1" }, { id: "P2", sensorPosition: "pack-centre" }] });
    expect(parsed.minF0Min).toBe(30.5);
    expect(parsed.maxSpreadK).toBeNull();
    expect(parsed.indicatorsRequired).toBe(false);
    expect(parsed.runsRequired).toBe(3);
  });

  it("takes an existing pattern by id", () => {
    expect(createStudyFormSchema.parse({ ...base, pattern: JSON.stringify({ existingId: "lp-7" }), indicatorsRequired: "on" })).toMatchObject({ pattern: "lp-7", indicatorsRequired: true });
  });

  it("names the row of a bad position, and refuses two positions with one id", () => {
    const noLabel = createStudyFormSchema.safeParse({ ...base, pattern: JSON.stringify({ ...pattern, positions: [pattern.positions[0], { id: "P2", label: "" }] }) });
    expect(noLabel.success).toBe(false);
    expect(noLabel.error!.issues[0].path).toEqual(["pattern"]);
    expect(noLabel.error!.issues[0].message).toMatch(/^Position 2: /);
    const twice = createStudyFormSchema.safeParse({ ...base, pattern: JSON.stringify({ ...pattern, positions: [pattern.positions[0], { id: "p1", label: "Again" }] }) });
    expect(twice.error!.issues[0].message).toMatch(/same id/);
  });

  it("refuses a pattern without positions, runs outside 1–10 and a text that is not JSON, each with a sentence", () => {
    expect(createStudyFormSchema.safeParse({ ...base, pattern: JSON.stringify({ ...pattern, positions: [] }) }).error!.issues[0].message).toMatch(/at least one probe position/);
    expect(createStudyFormSchema.safeParse({ ...base, runsRequired: "11", pattern: JSON.stringify(pattern) }).error!.issues[0].message).toMatch(/between 1 and 10/);
    expect(createStudyFormSchema.safeParse({ ...base, pattern: "{not json" }).error!.issues[0].message).toMatch(/could not be read/);
  });
});

describe("draft, attach and sign forms", () => {
  it("leaves the pattern alone unless it was sent", () => {
    expect(updateDraftFormSchema.parse({ id: "st1", ...base }).pattern).toBeUndefined();
  });

  it("drops channels left out of the sensor map", () => {
    expect(attachRunFormSchema.parse({ id: "st1", cycleId: "c1", sensorMap: JSON.stringify({ "Drain (°C)": "", "Pack 1 (°C)": "P1" }) }).sensorMap).toEqual({ "Pack 1 (°C)": "P1" });
    expect(attachRunFormSchema.safeParse({ id: "st1", cycleId: "" }).error!.issues[0].message).toMatch(/Choose the signed cycle/);
  });

  it("needs a password and a meaning the study knows", () => {
    expect(signStudyFormSchema.safeParse({ id: "st1", meaning: "qa-approved" }).error!.issues[0].message).toMatch(/password/);
    expect(signStudyFormSchema.safeParse({ id: "st1", meaning: "approved", password: "x" }).success).toBe(false);
  });
});

import { describe, expect, it } from "vitest";
import { basisNoteFor, basisShortfalls, PROFILE_BASES, summariseBasisMinimums, type ProfileLimitsInput } from "@/lib/domain";
import { analyzeRecording } from "@/lib/analysis";
import { readLoggerFile } from "@/lib/logger-files";
import { simulateCycle, toLoggerCsv } from "@/lib/simulator";

// Minimums from ../shared/DOMAIN.md: EN 285 §2.2/§2.3 (121 °C 15 min, 126 °C 10 min, 134 °C 3 min,
// band 3 K, equilibration 15 s up to 800 l / 30 s above, spread 2 K, saturation 2 K) [memory; the
// time–temperature pairs found in the Central Sterilising Club textbook, the equilibration limit in
// HTM 2010 §13.14(c)]; EN 13060 §2.10 (121 °C 15 min, 134 °C 3 min; band 3 or 4 K unconfirmed; no
// equilibration limit confirmed) [memory]; ANSI/AAMI ST79 §2.11 (121 °C 30 min gravity, 132 °C 4 min and
// 135 °C 3 min dynamic air removal) [memory].
const en285At134: ProfileLimitsInput = { sterilizationTempC: 134, bandK: 3, holdingTimeS: 180, maxEquilibrationS: 15, maxSpreadK: 2, saturationLimitK: 2, basis: "en-285" };
const messages = (p: ProfileLimitsInput) => basisShortfalls(p).map((s) => `${s.field}: ${s.message}`);

describe("a profile's basis and the minimums it brings", () => {
  it("accepts EN 285's own figures at 121, 126 and 134 °C", () => {
    expect(messages(en285At134)).toEqual([]);
    expect(messages({ ...en285At134, sterilizationTempC: 126, holdingTimeS: 600 })).toEqual([]);
    expect(messages({ ...en285At134, sterilizationTempC: 121, holdingTimeS: 900, maxEquilibrationS: 30 })).toEqual([]);
  });

  it("refuses a 60 s hold at 134 °C under EN 285, naming the minimum", () => {
    expect(messages({ ...en285At134, holdingTimeS: 60 })).toEqual(["holdingTimeS: EN 285 requires a holding time of at least 3 min at 134 °C."]);
    expect(messages({ ...en285At134, sterilizationTempC: 121, holdingTimeS: 600 })).toEqual(["holdingTimeS: EN 285 requires a holding time of at least 15 min at 121 °C."]);
  });

  it("refuses each EN 285 limit that is looser than the standard's", () => {
    expect(messages({ ...en285At134, bandK: 4, maxEquilibrationS: 45, maxSpreadK: 3, saturationLimitK: 2.5 })).toEqual([
      "bandK: EN 285 allows a band of at most 3 K above 134 °C (up to 137 °C); this band reaches 138 °C.",
      "maxEquilibrationS: EN 285 allows an equilibration time of at most 30 s (15 s for chambers up to 800 l).",
      "maxSpreadK: EN 285 allows a spread of at most 2 K between the temperatures during holding.",
      "saturationLimitK: EN 285 allows the reference at most 2 K from the saturation temperature.",
    ]);
  });

  it("treats a narrower band inside EN 285's as stricter, and a temperature between its bands as not covered", () => {
    // 134.5–136.5 °C: the window one analysis of EN 285:2015 derives after measurement uncertainty [found: van Doornmalen et al. 2020].
    expect(messages({ ...en285At134, sterilizationTempC: 134.5, bandK: 2 })).toEqual([]);
    expect(messages({ ...en285At134, sterilizationTempC: 130, holdingTimeS: 600 })).toEqual([
      "sterilizationTempC: EN 285 sets the bands 121–124 °C, 126–129 °C and 134–137 °C; 130 °C is not covered, so choose local practice and give the reason.",
    ]);
    expect(messages({ ...en285At134, sterilizationTempC: 115, holdingTimeS: 1800 })[0]).toMatch(/^sterilizationTempC: EN 285 sets the bands/);
  });

  it("imposes no EN 13060 equilibration or spread minimum, since none is confirmed, but keeps its holding times", () => {
    const benchtop: ProfileLimitsInput = { ...en285At134, basis: "en-13060", maxEquilibrationS: 120, maxSpreadK: 5, bandK: 4 };
    expect(messages(benchtop)).toEqual([]);
    expect(messages({ ...benchtop, holdingTimeS: 150 })).toEqual(["holdingTimeS: EN 13060 requires a holding time of at least 3 min at 134 °C."]);
    expect(messages({ ...benchtop, bandK: 5 })[0]).toMatch(/^bandK: EN 13060 allows a band of at most 4 K/);
    expect(summariseBasisMinimums("en-13060")).toMatch(/no equilibration and spread figures known, so none imposed/);
  });

  it("holds ANSI/AAMI ST79 profiles to the shortest listed exposure at or below their temperature", () => {
    const st79: ProfileLimitsInput = { ...en285At134, basis: "ansi-aami-st79", sterilizationTempC: 132, holdingTimeS: 240 };
    expect(messages(st79)).toEqual([]);
    expect(messages({ ...st79, holdingTimeS: 180 })).toEqual(["holdingTimeS: ANSI/AAMI ST79 requires a holding time of at least 4 min at 132 °C."]);
    expect(messages({ ...st79, sterilizationTempC: 121, holdingTimeS: 900 })).toEqual(["holdingTimeS: ANSI/AAMI ST79 requires a holding time of at least 30 min at 121 °C."]);
  });

  it("lets local practice set any figure, but never without its reason", () => {
    const local: ProfileLimitsInput = { ...en285At134, basis: "local", holdingTimeS: 60 };
    expect(messages(local)).toEqual(["basisReason: Local practice needs its reason: say which protocol or validation these limits come from."]);
    expect(messages({ ...local, basisReason: "   " })).toHaveLength(1);
    expect(messages({ ...local, basisReason: "Validated flash cycle, report VR-2025-07" })).toEqual([]);
  });

  it("has words for every basis", () => {
    for (const b of PROFILE_BASES) expect(summariseBasisMinimums(b).length).toBeGreaterThan(20);
  });
});

describe("the basis printed beside each check", () => {
  const sim = simulateCycle({ scenario: "pass", sterilizationTempC: 134.6, holdingTimeS: 210, seed: 3 });
  const analysis = analyzeRecording(readLoggerFile(toLoggerCsv(sim)).recording, { ...en285At134, bandK: 3, f0ReferenceC: 121.1, f0ZK: 10 });
  // The analysis's checks, and the ids issue 9 adds, each with the words of the profile's basis.
  const ids = [...analysis.checks.map((c) => c.id), "saturation-band", "free-space", "record-complete"];

  it("never describes a benchtop judged under EN 13060 with EN 285 wording", () => {
    for (const id of ids) {
      const text = basisNoteFor(id, "en-13060", "type B cycle", 134);
      expect(text, id).not.toMatch(/EN ?285|HTM/);
      expect(text, id).toMatch(/^EN 13060/);
    }
    expect(basisNoteFor("equilibration-time", "en-13060", null, 134)).toBe("EN 13060: no equilibration limit confirmed; the profile's limit applies");
    expect(basisNoteFor("holding-time", "en-13060", null, 134)).toBe("EN 13060: at least 3 min at 134 °C");
  });

  it("gives EN 285's own figure beside its checks", () => {
    expect(basisNoteFor("holding-time", "en-285", null, 134)).toBe("EN 285: at least 3 min at 134 °C");
    expect(basisNoteFor("band", "en-285", null, 121)).toBe("EN 285: band 121–124 °C");
    expect(basisNoteFor("equilibration-time", "en-285", null, 134)).toBe("EN 285: at most 15 s for chambers up to 800 l, 30 s above");
  });

  it("prints local practice with its reason, and says so where a standard has no figure", () => {
    expect(basisNoteFor("band", "local", "site protocol SP-12", 134)).toBe("Local practice: site protocol SP-12");
    expect(basisNoteFor("spread", "iso-17665", null, 134)).toBe("ISO 17665: no figure of its own for this check; the profile's applies");
  });
});

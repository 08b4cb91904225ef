// The pure rules behind sign-off: which calibration certificate was in force on a test's date, and how a replaced
// logger file differs from the first one. Dates and names are constructed; the expectations are worked by hand.
import { describe, expect, it } from "vitest";
import { certificateOnDate } from "@/lib/periodic-tests/calibration";
import { describeReplacement, recordedChannels } from "@/lib/cycles/file-replacement";
import { isEditableCycleStatus, isLockedCycleStatus, needsCalibratedInstrument } from "@/lib/domain";

const certificates = [
  { certificateNumber: "CAL-1", calibratedOn: "2025-01-10", dueOn: "2026-01-10" },
  { certificateNumber: "CAL-2", calibratedOn: "2026-02-01", dueOn: "2027-02-01" },
];

describe("the certificate in force on a test's date", () => {
  it("is the latest calibrated on or before that day, valid up to and including its due date", () => {
    expect(certificateOnDate(certificates, "2025-06-01")).toMatchObject({ certificate: { certificateNumber: "CAL-1" }, lapsed: false });
    expect(certificateOnDate(certificates, "2026-01-10")).toMatchObject({ certificate: { certificateNumber: "CAL-1" }, lapsed: false });
  });

  it("has lapsed in the gap between a due date and the next calibration", () => {
    // CAL-1 was due on 10 Jan 2026 and CAL-2 not issued before 1 Feb 2026: on 20 Jan the logger was out of calibration.
    expect(certificateOnDate(certificates, "2026-01-20T09:00:00Z")).toMatchObject({ certificate: { certificateNumber: "CAL-1" }, lapsed: true });
    expect(certificateOnDate(certificates, "2026-02-01")).toMatchObject({ certificate: { certificateNumber: "CAL-2" }, lapsed: false });
  });

  it("is none before the first calibration, and a later certificate does not cover an earlier test", () => {
    expect(certificateOnDate(certificates, "2024-12-31")).toBeNull();
    expect(certificateOnDate([], "2026-03-01")).toBeNull();
  });
});

const facts = (over: Partial<Parameters<typeof describeReplacement>[0]>) => ({
  fileName: "a.csv",
  sha256: "aa",
  startedAt: "2026-11-25T07:00:00.000Z",
  channels: ["Drain", "Pack 1", "Chamber"],
  ...over,
});

describe("a replaced logger file", () => {
  it("is no replacement when the bytes are the same", () => {
    expect(describeReplacement(facts({}), facts({ fileName: "renamed.csv" }))).toBeNull();
  });

  it("with the same start and channels is stated, with nothing to acknowledge", () => {
    expect(describeReplacement(facts({}), facts({ sha256: "bb", fileName: "b.csv" }))).toEqual({
      first: { fileName: "a.csv", sha256: "aa" },
      current: { fileName: "b.csv", sha256: "bb" },
      differences: [],
    });
  });

  it("names another start time and other channels", () => {
    const r = describeReplacement(facts({}), facts({ sha256: "bb", startedAt: "2026-11-25T10:00:00.000Z", channels: ["Drain", "Pack 9", "Chamber"] }));
    expect(r?.differences).toEqual([
      "The recording starts at 2026-11-25T10:00:00.000Z; the first file's started at 2026-11-25T07:00:00.000Z.",
      'The channels differ from the first file\'s: new channels "Pack 9"; channels of the first file missing: "Pack 1".',
    ]);
  });

  it("reads the channels of a stored result, temperatures and pressure", () => {
    expect(recordedChannels({ channels: [{ header: "Drain" }, { header: "Pack 1" }], pressureChannel: "Chamber" })).toEqual(["Drain", "Pack 1", "Chamber"]);
    expect(recordedChannels(null)).toEqual([]);
  });
});

describe("the cycle's states", () => {
  it("locks the confirmed outcomes and opens draft and returned to correction", () => {
    expect(["approved", "failure-confirmed"].every(isLockedCycleStatus)).toBe(true);
    expect(["draft", "submitted", "returned"].some(isLockedCycleStatus)).toBe(false);
    expect(["draft", "returned"].every(isEditableCycleStatus)).toBe(true);
    expect(isEditableCycleStatus("submitted")).toBe(false);
  });

  it("asks for a calibrated instrument for thermometric and air leakage tests only", () => {
    expect(["thermometric-small-load", "thermometric-full-load", "air-leakage"].every(needsCalibratedInstrument)).toBe(true);
    expect(needsCalibratedInstrument("bowie-dick")).toBe(false);
  });
});

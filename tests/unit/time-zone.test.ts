import { describe, expect, it } from "vitest";
import { hasZone, instantInZone, isValidTimeZone, localDateTimeToInstant, zoneOffsetMs } from "@/lib/domain";
import { resolveCycleStart, siteClockStamp, timeFormatHasDate } from "@/lib/cycles/start-time";

const iso = (d: Date | null) => d?.toISOString() ?? null;

// Daylight-saving dates used below [found: the rules as published]:
// - EU summer time (Directive 2000/84/EC): begins the last Sunday of March at 01:00 UTC, ends the
//   last Sunday of October at 01:00 UTC; in 2024 those are 31 March and 27 October. The UK follows
//   the same dates (Summer Time Order 2002): GMT (UTC+0) in winter, BST (UTC+1) in summer.
// - US (Energy Policy Act of 2005): begins the second Sunday of March at 02:00 local, ends the first
//   Sunday of November at 02:00 local; in 2024 those are 10 March and 3 November. New York is
//   UTC−5 (EST) in winter, UTC−4 (EDT) in summer.
describe("a logger's local date-time read in the site's time zone", () => {
  it("reads a winter and a summer time with the zone's offset, not the server's", () => {
    expect(iso(localDateTimeToInstant("2024-01-15T08:00:00", "Europe/London"))).toBe("2024-01-15T08:00:00.000Z");
    expect(iso(localDateTimeToInstant("2024-07-15T08:00:00", "Europe/London"))).toBe("2024-07-15T07:00:00.000Z");
    expect(iso(localDateTimeToInstant("2024-07-15 08:00", "Europe/Berlin"))).toBe("2024-07-15T06:00:00.000Z");
    expect(iso(localDateTimeToInstant("2024-01-15T08:00:00", "America/New_York"))).toBe("2024-01-15T13:00:00.000Z");
    expect(iso(localDateTimeToInstant("2024-07-15T08:00:00.250", "America/New_York"))).toBe("2024-07-15T12:00:00.250Z");
  });

  it("changes offset exactly at the EU change of 31 March 2024, 01:00 UTC", () => {
    expect(iso(localDateTimeToInstant("2024-03-31T00:59:59", "Europe/London"))).toBe("2024-03-31T00:59:59.000Z");
    expect(iso(localDateTimeToInstant("2024-03-31T02:00:00", "Europe/London"))).toBe("2024-03-31T01:00:00.000Z");
    expect(iso(localDateTimeToInstant("2024-03-31T03:30:00", "Europe/Berlin"))).toBe("2024-03-31T01:30:00.000Z");
  });

  it("places a time the clocks skipped after the jump (read with the offset before it)", () => {
    // 01:30 never showed on a London clock on 31 March 2024; read at GMT it is 01:30 UTC = 02:30 BST.
    expect(iso(localDateTimeToInstant("2024-03-31T01:30:00", "Europe/London"))).toBe("2024-03-31T01:30:00.000Z");
    // 02:30 never showed in New York on 10 March 2024; read at EST it is 07:30 UTC = 03:30 EDT.
    expect(iso(localDateTimeToInstant("2024-03-10T02:30:00", "America/New_York"))).toBe("2024-03-10T07:30:00.000Z");
  });

  it("takes the earlier of a time that showed twice when the clocks went back", () => {
    // 01:30 showed at 00:30 UTC (BST) and again at 01:30 UTC (GMT) on 27 October 2024.
    expect(iso(localDateTimeToInstant("2024-10-27T01:30:00", "Europe/London"))).toBe("2024-10-27T00:30:00.000Z");
    expect(iso(localDateTimeToInstant("2024-10-27T02:30:00", "Europe/London"))).toBe("2024-10-27T02:30:00.000Z");
    // 01:30 showed at 05:30 UTC (EDT) and 06:30 UTC (EST) on 3 November 2024.
    expect(iso(localDateTimeToInstant("2024-11-03T01:30:00", "America/New_York"))).toBe("2024-11-03T05:30:00.000Z");
  });

  it("refuses what is not a real local date-time or zone instead of guessing", () => {
    expect(localDateTimeToInstant("2024-02-30T08:00:00", "Europe/London")).toBeNull();
    expect(localDateTimeToInstant("2024-05-01T24:00:00", "Europe/London")).toBeNull();
    expect(localDateTimeToInstant("01.05.2024 08:00", "Europe/London")).toBeNull();
    expect(localDateTimeToInstant("2024-05-01T08:00:00", "Europe/Atlantis")).toBeNull();
    expect(isValidTimeZone("Europe/Atlantis")).toBe(false);
    expect(isValidTimeZone("Asia/Kolkata")).toBe(true);
  });

  it("keeps a time that names its zone as written", () => {
    expect(hasZone("2024-07-15T08:00:00Z")).toBe(true);
    expect(hasZone("2024-07-15T08:00:00+05:30")).toBe(true);
    expect(hasZone("2024-07-15T08:00:00")).toBe(false);
    expect(iso(instantInZone("2024-07-15T08:00:00+05:30", "Europe/London"))).toBe("2024-07-15T02:30:00.000Z");
    expect(iso(instantInZone("2024-07-15T08:00:00", "Asia/Kolkata"))).toBe("2024-07-15T02:30:00.000Z");
  });

  it("gives the zone's offset at an instant", () => {
    expect(zoneOffsetMs(Date.parse("2024-07-15T12:00:00Z"), "Europe/London")).toBe(3_600_000);
    expect(zoneOffsetMs(Date.parse("2024-01-15T12:00:00Z"), "America/New_York")).toBe(-5 * 3_600_000);
    // India keeps UTC+05:30 all year [found: IST, no daylight saving].
    expect(zoneOffsetMs(Date.parse("2024-07-15T12:00:00Z"), "Asia/Kolkata")).toBe(5.5 * 3_600_000);
  });
});

describe("the cycle's start", () => {
  it("comes from the file's clock read in the site's zone, and ignores a start typed for it", () => {
    expect(resolveCycleStart({ fileStartedAt: "2024-07-15T08:00:00", givenStartedAt: "2024-07-15T09:00", timeZone: "Europe/London" })).toEqual({ ok: true, startedAt: "2024-07-15T07:00:00.000Z" });
    expect(resolveCycleStart({ fileStartedAt: "2024-07-15T08:00:00Z", timeZone: "America/New_York" })).toEqual({ ok: true, startedAt: "2024-07-15T08:00:00.000Z" });
  });

  it("needs the user's start for a file of elapsed times, and never falls back to the upload time", () => {
    const missing = resolveCycleStart({ fileStartedAt: null, givenStartedAt: "", timeZone: "Europe/London" });
    expect(missing).toMatchObject({ ok: false, status: 422, field: "startedAt" });
    expect(missing.ok ? "" : missing.message).toMatch(/elapsed times.*startedAt.*Europe\/London/);
    expect(resolveCycleStart({ fileStartedAt: null, givenStartedAt: "2024-07-15T08:00", timeZone: "Europe/London" })).toEqual({ ok: true, startedAt: "2024-07-15T07:00:00.000Z" });
    expect(resolveCycleStart({ fileStartedAt: null, givenStartedAt: "2024-02-30T08:00", timeZone: "Europe/London" })).toMatchObject({ ok: false, status: 422, field: "startedAt" });
  });

  it("refuses to place a local time in a site zone that does not exist", () => {
    expect(resolveCycleStart({ fileStartedAt: "2024-07-15T08:00:00", timeZone: "Mars/Olympus" })).toMatchObject({ ok: false, status: 409, field: "files" });
  });

  it("numbers a cycle by the site's wall clock", () => {
    expect(siteClockStamp("2024-07-15T07:00:00.000Z", "Europe/London")).toBe("202407150800");
    expect(timeFormatHasDate("elapsed-seconds")).toBe(false);
    expect(timeFormatHasDate("clock")).toBe(false);
    expect(timeFormatHasDate("dmy")).toBe(true);
  });
});

import { describe, expect, it } from "vitest";
import { defaultScheduleFor, failuresToAcknowledge, sterilizerStatusOf, type ConfirmedOutcome, type ManualStatusEvent, type StatusInput, type StatusSchedule } from "@/lib/periodic-tests";

// Every date below is worked by hand on a calendar; the site clocks are UTC unless a test names Europe/London
// (BST = UTC+1 from the last Sunday of March to the last Sunday of October).
const BOWIE_DICK_DAILY: StatusSchedule = { kind: "bowie-dick", intervalDays: 1, requiredBeforeUse: true, since: "2025-01-01T00:00:00.000Z" };
const AIR_LEAKAGE_WEEKLY: StatusSchedule = { kind: "air-leakage", intervalDays: 7, requiredBeforeUse: true, since: "2025-01-01T00:00:00.000Z" };
const THERMOMETRIC_QUARTERLY: StatusSchedule = { kind: "thermometric-small-load", intervalDays: 91, requiredBeforeUse: false, since: "2025-01-01T00:00:00.000Z" };

let n = 0;
const outcome = (kind: string, at: string, result: "pass" | "fail"): ConfirmedOutcome => ({ kind, at, result, source: { type: "periodic-test", id: `r${++n}` } });
const hold = (at: string, reason = "door seal leaking"): ManualStatusEvent => ({ status: "out-of-use", at, reason, byName: "E. Engineer", acknowledged: [] });
const release = (at: string, acknowledged: string[] = [], reason = "seal replaced and checked"): ManualStatusEvent => ({ status: "in-use", at, reason, byName: "E. Engineer", acknowledged });

function statusAt(now: string, input: Partial<StatusInput>) {
  return sterilizerStatusOf({ schedules: [], outcomes: [], manual: [], timeZone: "UTC", previous: null, ...input, now: new Date(now) });
}

describe("a test required before use", () => {
  it("never passed counts as overdue (fail closed): out of use since the test was scheduled", () => {
    const r = statusAt("2025-03-03T09:00:00Z", { schedules: [BOWIE_DICK_DAILY] });
    expect(r.status).toBe("out-of-use");
    expect(r.since).toBe("2025-01-01T00:00:00.000Z");
    expect(r.reason).toBe("No signed passing Bowie-Dick test is on record; it is required before use.");
  });

  it("a daily test passed on 3 March keeps the sterilizer in use that day and is due from midnight on 4 March", () => {
    const schedules = [BOWIE_DICK_DAILY];
    const outcomes = [outcome("bowie-dick", "2025-03-03T06:30:00.000Z", "pass")];
    expect(statusAt("2025-03-03T23:59:00Z", { schedules, outcomes }).status).toBe("in-use");
    const next = statusAt("2025-03-04T05:00:00Z", { schedules, outcomes });
    expect(next).toMatchObject({ status: "out-of-use", since: "2025-03-04T00:00:00.000Z" });
    expect(next.reason).toBe("The Bowie-Dick test is due today and is required before use (last passed 2025-03-03).");
  });

  it("falls due at the site's midnight, not UTC's: London in summer is UTC+1", () => {
    // Passed 06:30 BST on 1 July = 05:30 UTC; due from 00:00 BST on 2 July = 23:00 UTC on 1 July.
    const input = { schedules: [BOWIE_DICK_DAILY], outcomes: [outcome("bowie-dick", "2025-07-01T05:30:00.000Z", "pass")], timeZone: "Europe/London" };
    expect(statusAt("2025-07-01T22:59:00Z", input).status).toBe("in-use");
    expect(statusAt("2025-07-01T23:30:00Z", input)).toMatchObject({ status: "out-of-use", since: "2025-07-01T23:00:00.000Z" });
  });

  it("a weekly air leakage test passed on Monday 3 March is current until Sunday 9 March and overdue after", () => {
    const schedules = [AIR_LEAKAGE_WEEKLY];
    const outcomes = [outcome("air-leakage", "2025-03-03T07:00:00.000Z", "pass")];
    expect(statusAt("2025-03-09T20:00:00Z", { schedules, outcomes }).status).toBe("in-use");
    expect(statusAt("2025-03-10T08:00:00Z", { schedules, outcomes }).reason).toMatch(/^The air leakage test is due today/);
    const late = statusAt("2025-03-12T08:00:00Z", { schedules, outcomes });
    expect(late).toMatchObject({ status: "out-of-use", since: "2025-03-10T00:00:00.000Z" });
    expect(late.reason).toBe("The air leakage test has been due since 2025-03-10 and is required before use (last passed 2025-03-03).");
  });

  it("a required test that failed after its last pass must pass again: a release acknowledges nothing there", () => {
    const schedules = [BOWIE_DICK_DAILY];
    const morning = outcome("bowie-dick", "2025-03-05T06:30:00.000Z", "pass");
    const failed = outcome("bowie-dick", "2025-03-05T07:00:00.000Z", "fail");
    const released = [release("2025-03-05T08:00:00.000Z", failuresToAcknowledge([morning, failed]))];
    const r = statusAt("2025-03-05T08:30:00Z", { schedules, outcomes: [morning, failed], manual: released });
    expect(r).toMatchObject({ status: "out-of-use", since: "2025-03-05T07:00:00.000Z" });
    expect(r.reason).toBe("The Bowie-Dick test of 2025-03-05 failed (confirmed); it must pass again before use.");
    const retest = outcome("bowie-dick", "2025-03-05T09:00:00.000Z", "pass");
    expect(statusAt("2025-03-05T09:30:00Z", { schedules, outcomes: [morning, failed, retest], manual: released }).status).toBe("in-use");
  });

  it("a test not required before use may be overdue without taking the sterilizer out of use", () => {
    const r = statusAt("2025-09-01T08:00:00Z", { schedules: [THERMOMETRIC_QUARTERLY], outcomes: [outcome("thermometric-small-load", "2025-03-03T07:00:00.000Z", "pass")] });
    expect(r.status).toBe("in-use");
  });

  it("in use with no test required before use says so, rather than calling required tests current", () => {
    const r = statusAt("2025-09-01T08:00:00Z", { schedules: [THERMOMETRIC_QUARTERLY], outcomes: [] });
    expect(r.reason).toBe("No test is required before use and no confirmed failure is open.");
    const vacuum = statusAt("2025-03-03T08:00:00Z", { schedules: [BOWIE_DICK_DAILY], outcomes: [outcome("bowie-dick", "2025-03-03T07:00:00.000Z", "pass")] });
    expect(vacuum.reason).toBe("The tests required before use are current and no confirmed failure is open.");
  });
});

describe("a confirmed failure", () => {
  const failed = outcome("thermometric-small-load", "2025-03-05T10:00:00.000Z", "fail");

  it("takes the sterilizer out of use since the failed test, whether or not the kind is scheduled", () => {
    const r = statusAt("2025-03-06T08:00:00Z", { outcomes: [failed] });
    expect(r).toMatchObject({ status: "out-of-use", since: "2025-03-05T10:00:00.000Z" });
    expect(r.reason).toBe("Thermometric test, small load of 2025-03-05 failed (confirmed).");
  });

  it("is cleared by a later approved pass of the same kind, not by a pass of another kind", () => {
    const otherKind = outcome("bowie-dick", "2025-03-06T06:30:00.000Z", "pass");
    expect(statusAt("2025-03-06T08:00:00Z", { outcomes: [failed, otherKind] }).status).toBe("out-of-use");
    const retest = outcome("thermometric-small-load", "2025-03-06T11:00:00.000Z", "pass");
    const r = statusAt("2025-03-06T12:00:00Z", { outcomes: [failed, otherKind, retest], previous: { status: "out-of-use", since: failed.at } });
    expect(r).toMatchObject({ status: "in-use", since: "2025-03-06T12:00:00.000Z" });
  });

  it("stands against a pass recorded at the very same instant (fail closed)", () => {
    const pass = outcome("thermometric-small-load", failed.at, "pass");
    expect(statusAt("2025-03-06T08:00:00Z", { outcomes: [pass, failed] }).status).toBe("out-of-use");
  });

  it("is acknowledged by an engineer's release; a new failure afterwards takes it out again", () => {
    const ack = failuresToAcknowledge([failed]);
    expect(ack).toEqual([`periodic-test:${failed.source.id}`]);
    const released = statusAt("2025-03-06T09:00:00Z", { outcomes: [failed], manual: [release("2025-03-06T08:30:00.000Z", ack)] });
    expect(released).toMatchObject({ status: "in-use", reason: "Released by E. Engineer: seal replaced and checked." });
    const again = outcome("thermometric-small-load", "2025-03-07T10:00:00.000Z", "fail");
    expect(statusAt("2025-03-07T11:00:00Z", { outcomes: [failed, again], manual: [release("2025-03-06T08:30:00.000Z", ack)] })).toMatchObject({
      status: "out-of-use",
      since: "2025-03-07T10:00:00.000Z",
    });
  });
});

describe("an engineer's decision", () => {
  it("a hold keeps the sterilizer out of use until released, whatever the tests show", () => {
    const outcomes = [outcome("bowie-dick", "2025-03-06T06:30:00.000Z", "pass")];
    const held = statusAt("2025-03-06T09:00:00Z", { outcomes, manual: [hold("2025-03-06T08:00:00.000Z")] });
    expect(held).toMatchObject({ status: "out-of-use", since: "2025-03-06T08:00:00.000Z", reason: "Taken out of use by E. Engineer: door seal leaking." });
    expect(statusAt("2025-03-06T11:00:00Z", { outcomes, manual: [hold("2025-03-06T08:00:00.000Z"), release("2025-03-06T10:00:00.000Z")] }).status).toBe("in-use");
  });

  it("a release does not make a required test current", () => {
    const r = statusAt("2025-03-06T11:00:00Z", { schedules: [BOWIE_DICK_DAILY], manual: [hold("2025-03-06T08:00:00.000Z"), release("2025-03-06T10:00:00.000Z")] });
    expect(r.status).toBe("out-of-use");
    expect(r.causes.map((c) => c.kind)).toEqual(["never-passed"]);
  });

  it("out of use since the earliest of the causes that hold together", () => {
    const outcomes = [outcome("bowie-dick", "2025-03-03T06:30:00.000Z", "pass"), outcome("steam-dryness", "2025-03-04T09:00:00.000Z", "fail")];
    const r = statusAt("2025-03-05T09:00:00Z", { schedules: [BOWIE_DICK_DAILY], outcomes, manual: [hold("2025-03-05T08:00:00.000Z")] });
    // Bowie-Dick due from 00:00 on 4 March; the failure at 09:00 on 4 March; the hold at 08:00 on 5 March.
    expect(r.since).toBe("2025-03-04T00:00:00.000Z");
    expect(r.causes.map((c) => c.kind)).toEqual(["overdue", "failure", "manual"]);
  });

  it("an in-use sterilizer stays in use since the moment it last became so", () => {
    const r = statusAt("2025-03-06T09:00:00Z", { previous: { status: "in-use", since: "2025-02-01T10:00:00.000Z" } });
    expect(r).toMatchObject({ status: "in-use", since: "2025-02-01T10:00:00.000Z" });
  });
});

describe("default schedule of a new sterilizer (DOMAIN.md §2.12, common practice)", () => {
  it("a vacuum sterilizer: Bowie-Dick daily and air leakage weekly, both required before use; a fluids one: neither", () => {
    expect(defaultScheduleFor({ vacuumAirRemoval: true })).toEqual([
      { kind: "bowie-dick", intervalDays: 1, requiredBeforeUse: true },
      { kind: "air-leakage", intervalDays: 7, requiredBeforeUse: true },
    ]);
    expect(defaultScheduleFor({ vacuumAirRemoval: false })).toEqual([]);
  });
});

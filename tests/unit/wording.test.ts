import { describe, expect, it } from "vitest";
import { z } from "zod";
import { agree, cycleStatusLabel, CYCLE_STATUS_LABELS, formatVolume, headerWithUnit, plural, SIGNATURE_MEANING_LABELS } from "@/lib/domain";
import { fieldLabel, plainIssueMessage } from "@/lib/errors";
import { summariseAuditValue, describeMapping } from "@/components/cycles/record/record-format";
import { calculatorNumber } from "@/components/steam/calculator-input";
import { VERIFY_IDLE, verifyReducer } from "@/components/archive/verify-state";

// Constructed definition tests: the exact words Papin prints (issue 13, item 5).
describe("counts with their nouns", () => {
  it("says one in the singular and every other count in the plural", () => {
    expect(plural(1, "channel")).toBe("1 channel");
    expect(plural(12, "channel")).toBe("12 channels");
    expect(plural(0, "channel")).toBe("0 channels");
    expect(`(${plural(1, "attempt")} left)`).toBe("(1 attempt left)");
    expect(plural(1204, "reading")).toBe("1,204 readings");
    expect(plural(2, "analysis", "analyses")).toBe("2 analyses");
    expect(`${plural(1, "interval")} ${agree(1, "is", "are")} longer`).toBe("1 interval is longer");
    expect(`${plural(3, "interval")} ${agree(3, "is", "are")} longer`).toBe("3 intervals are longer");
  });
});

describe("volumes", () => {
  it("print litres with the standards' symbol, lower-case l", () => {
    expect(formatVolume(445)).toBe("445 l");
    expect(formatVolume(23)).toBe("23 l");
    expect(formatVolume(1200)).toBe("1,200 l");
    expect(formatVolume(23.5)).toBe("23.5 l");
    expect(formatVolume(null)).toBe("—");
  });
});

describe("cycle state names", () => {
  it("are one table for list, CSV, e-mail and PDF; the legacy word rejected reads as Returned", () => {
    expect(cycleStatusLabel("returned")).toBe("Returned");
    expect(cycleStatusLabel("rejected")).toBe("Returned");
    expect(cycleStatusLabel("submitted")).toBe("Awaiting review");
    expect(cycleStatusLabel("failure-confirmed")).toBe("Failure confirmed");
    expect(cycleStatusLabel("on-hold")).toBe("On hold");
    for (const [status, label] of Object.entries(CYCLE_STATUS_LABELS)) expect(cycleStatusLabel(status)).toBe(label);
    expect(SIGNATURE_MEANING_LABELS.rejected).toBe("Returned for correction (signed as rejected)");
  });
});

describe("a column header with its unit", () => {
  it("never says the unit twice", () => {
    expect(headerWithUnit("Chamber (bar abs)", "bar abs")).toBe("Chamber (bar abs)");
    expect(headerWithUnit("Chamber [kPa abs]", "kPa abs")).toBe("Chamber [kPa abs]");
    expect(headerWithUnit("Chamber (bar)", "bar abs")).toBe("Chamber (bar), abs");
    expect(headerWithUnit("P1", "kPa gauge")).toBe("P1 (kPa gauge)");
    expect(describeMapping({ columns: { "Chamber (bar abs)": { role: "pressure", unit: "bar", gauge: false } } })).toEqual(["Chamber (bar abs): pressure"]);
  });
});

describe("the record history line of an audit value", () => {
  it("lists files by name, never [object Object]", () => {
    const json = JSON.stringify({
      cycleNumber: "P1-20261110-004",
      files: [
        { name: "run-4.csv", sha256: "ab12" },
        { name: "photo.png", sha256: "cd34" },
      ],
    });
    expect(summariseAuditValue(json)).toBe("cycleNumber: P1-20261110-004 · files: run-4.csv, photo.png");
    expect(summariseAuditValue(JSON.stringify({ marks: [{ t: 12, label: "t1" }] }))).toBe("marks: 12 t1");
  });
});

describe("schema problems in plain words", () => {
  const schema = z.object({ sterilizerId: z.string(), holdingTimeS: z.number(), notes: z.string().max(3), basis: z.enum(["en-285", "local"]), reason: z.string().min(1, "Give a reason.") });
  const messageFor = (input: unknown) => plainIssueMessage(schema.safeParse(input).error!.issues[0]);
  const valid = { sterilizerId: "s1", holdingTimeS: 180, notes: "ok", basis: "local", reason: "r" };

  it("names the field as a person calls it, never the parameter", () => {
    expect(fieldLabel(["sterilizerId"])).toBe("the sterilizer");
    expect(fieldLabel(["holdingTimeS"])).toBe("the holding time");
    expect(fieldLabel(["leakRateLimitKpaPerMin"])).toBe("the leak rate limit");
    expect(fieldLabel(["files", 0, "name"])).toBe("the name");
    expect(fieldLabel([])).toBe("the request");
  });

  it("turns zod's built-in wording into a sentence and keeps a schema's own", () => {
    expect(messageFor({ ...valid, sterilizerId: undefined })).toBe("Enter the sterilizer: it is missing.");
    expect(messageFor({ ...valid, holdingTimeS: "abc" })).toBe("The holding time is not in a form Papin can read: enter a number.");
    expect(messageFor({ ...valid, notes: "too long" })).toBe("Too large or too long: the notes may be at most 3.");
    expect(messageFor({ ...valid, basis: "iso" })).toBe("Choose the basis from the values offered.");
    expect(messageFor({ ...valid, reason: "" })).toBe("Give a reason.");
    for (const bad of [
      { ...valid, sterilizerId: 4 },
      { ...valid, holdingTimeS: undefined },
    ])
      expect(messageFor(bad)).not.toMatch(/sterilizerId|holdingTimeS|Invalid|expected/);
  });
});

describe("the steam calculator's inputs", () => {
  it("answers empty or non-numeric input with a sentence naming the field", () => {
    expect(calculatorNumber("", "temperature", "134")).toEqual({ ok: false, problem: "Enter the temperature, for example 134." });
    expect(calculatorNumber("abc", "temperature", "134")).toEqual({ ok: false, problem: "The temperature “abc” is not a number; enter it in figures, for example 134." });
    expect(calculatorNumber("1.2.3", "pressure", "2.03")).toEqual({ ok: false, problem: "The pressure “1.2.3” is not a number; enter it in figures, for example 2.03." });
    expect(calculatorNumber(" 2,03 ", "pressure", "2.03")).toEqual({ ok: true, text: "2.03" });
    expect(calculatorNumber("-5", "temperature", "134")).toEqual({ ok: true, text: "-5" });
  });
});

describe("the report checker's state", () => {
  const match = { match: true as const, sha256: "ab", cycleId: "c1", reportNumber: "PR-1", cycleNumber: "P1-001", archivedAt: "2026-11-10T10:00:00Z" };
  it("clears the previous file's result when a new file is refused or checked", () => {
    const answered = verifyReducer(verifyReducer(VERIFY_IDLE, { type: "start", name: "a.pdf" }), { type: "answered", check: 1, outcome: match });
    expect(answered.outcome).toEqual(match);
    const refused = verifyReducer(answered, { type: "refused", name: "b.png", error: "Drop one PDF file." });
    expect(refused).toMatchObject({ name: "b.png", outcome: null, error: "Drop one PDF file.", busy: false });
    const again = verifyReducer(refused, { type: "start", name: "c.pdf" });
    expect(again).toMatchObject({ name: "c.pdf", outcome: null, error: null, busy: true });
  });
  it("ignores a late answer for an earlier file", () => {
    const first = verifyReducer(VERIFY_IDLE, { type: "start", name: "a.pdf" });
    const second = verifyReducer(first, { type: "start", name: "b.pdf" });
    expect(verifyReducer(second, { type: "answered", check: 1, outcome: match })).toBe(second);
    expect(verifyReducer(second, { type: "failed", check: 1, error: "late" })).toBe(second);
  });
});

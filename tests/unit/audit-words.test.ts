import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { AUDIT_ACTIONS, AUDIT_ACTION_CHOICES, auditSiteText, describeAuditEvent, type AuditEventFacts, type AuditPerson } from "@/lib/domain/audit-words";
import { SIGNING_MEANINGS, SIGNATURE_MEANINGS, PERIODIC_SIGNATURE_MEANINGS, STERILIZER_STATUSES } from "@/lib/domain";

const CYCLE = "11111111-1111-4111-8111-111111111111";
const PROFILE = "22222222-2222-4222-8222-222222222222";
const PROFILE_V2 = "33333333-3333-4333-8333-333333333333";
const STERILIZER = "44444444-4444-4444-8444-444444444444";
const ENGINEER = "55555555-5555-4555-8555-555555555555";
const USER = "66666666-6666-4666-8666-666666666666";

const names = new Map([
  [CYCLE, "P2-20261112-009"],
  [PROFILE, "134 °C / 3 min"],
  [PROFILE_V2, "134 °C / 3 min (v2)"],
  [STERILIZER, "Porous load 1"],
  [USER, "Tom Technician"],
]);
const people = new Map<string, AuditPerson>([[ENGINEER, { name: "Erin Engineer", role: "engineer" }]]);

function event(partial: Partial<AuditEventFacts> & { action: string }): AuditEventFacts {
  return { seq: 42, at: "2026-11-12T08:14:03.000Z", entityType: "cycle", entityId: null, actorId: ENGINEER, actorEmail: "erin@site.example", oldValue: null, newValue: null, reason: null, ...partial };
}
const describeIt = (e: AuditEventFacts, timeZone = "Europe/Berlin") => describeAuditEvent(e, { people, names, timeZone });

describe("an audit event in words", () => {
  it("says who approved which cycle, by name and role, with a link to the cycle and both clocks", () => {
    const line = describeIt(
      event({ action: "cycle.sign.approved", entityId: CYCLE, oldValue: JSON.stringify({ status: "submitted" }), newValue: JSON.stringify({ status: "approved", signature: "x", report: "y" }) }),
    );
    expect(line.who).toBe("Erin Engineer");
    expect(line.role).toBe("Validation engineer");
    expect(line.what).toBe("approved cycle P2-20261112-009");
    expect(line.record).toEqual({ label: "cycle P2-20261112-009", href: `/cycles/${CYCLE}` });
    // 08:14:03 UTC is 09:14:03 in Berlin in November (CET, UTC+1): worked by hand
    expect(line.when).toEqual({ site: "12 Nov 2026 09:14:03 CET", utc: "2026-11-12 08:14:03 UTC" });
    expect(line.changes).toContainEqual({ field: "Status", old: "Awaiting review", new: "Approved" });
    expect(line.changes.map((c) => c.field)).not.toContain("Signature");
  });

  it("names the profile and the changed field with its unit and the reason", () => {
    const line = describeIt(
      event({
        action: "profile.update",
        entityType: "acceptance-profile",
        entityId: PROFILE,
        oldValue: JSON.stringify({ holdingTimeS: 180 }),
        newValue: JSON.stringify({ holdingTimeS: 210 }),
        reason: "site protocol 7 asks for 3.5 min",
      }),
    );
    expect(line.what).toBe("changed the profile 134 °C / 3 min: hold 180 → 210 s");
    expect(line.reason).toBe("site protocol 7 asks for 3.5 min");
    expect(line.changes).toEqual([{ field: "Holding time", old: "180 s", new: "210 s" }]);
    expect(line.record?.href).toBe(`/profiles/${PROFILE}`);
  });

  it("replaces ids in values by the names of their records", () => {
    const line = describeIt(
      event({
        action: "sterilizer.update",
        entityType: "sterilizer",
        entityId: STERILIZER,
        oldValue: JSON.stringify({ defaultProfileId: PROFILE }),
        newValue: JSON.stringify({ defaultProfileId: PROFILE_V2 }),
      }),
    );
    expect(line.what).toBe("changed the sterilizer Porous load 1: default profile 134 °C / 3 min → 134 °C / 3 min (v2)");
    expect(line.changes).toEqual([{ field: "Default profile", old: "134 °C / 3 min", new: "134 °C / 3 min (v2)" }]);
  });

  it("spells out nested values (files) instead of [object Object] or raw JSON", () => {
    const line = describeIt(
      event({
        action: "cycle.create",
        entityId: CYCLE,
        newValue: JSON.stringify({ cycleNumber: "P2-20261112-009", files: [{ name: "run.csv", size: 2048, sha256: "ab".repeat(32) }], verdict: "pass" }),
      }),
    );
    expect(line.what).toBe("registered and analysed cycle P2-20261112-009");
    const files = line.changes.find((c) => c.field === "Files");
    expect(files?.new).toBe(`run.csv (2048 bytes), SHA-256 ${"ab".repeat(32)}`);
    for (const c of line.changes) expect(`${c.old} ${c.new}`).not.toMatch(/\[object Object\]|[{}"]/);
  });

  it("keeps the capitals of a test named after people and words a status change's cause", () => {
    const bowieDick = describeIt(event({ action: "periodic-test.record", entityType: "periodic-test", newValue: JSON.stringify({ kind: "bowie-dick", sterilizer: "Porous load 2" }) }));
    expect(bowieDick.what).toBe("recorded a Bowie-Dick test for Porous load 2");
    const leak = describeIt(event({ action: "periodic-test.record", entityType: "periodic-test", newValue: JSON.stringify({ kind: "air-leakage", sterilizer: "Porous load 1" }) }));
    expect(leak.what).toBe("recorded an air leakage test for Porous load 1");
    const status = describeIt(
      event({ action: "sterilizer.status", entityType: "sterilizer", entityId: STERILIZER, newValue: JSON.stringify({ status: "in-use", cause: "periodic-test.sign.approved" }) }),
    );
    expect(status.changes).toContainEqual(expect.objectContaining({ field: "Cause", new: "a periodic test approved" }));
  });

  it("says sign-ins, password changes and exports in plain words", () => {
    expect(describeIt(event({ action: "auth.sign-in", entityType: "user", entityId: ENGINEER })).what).toBe("signed in");
    expect(describeIt(event({ action: "user.password-change", entityType: "user", entityId: ENGINEER })).what).toBe("changed their own password");
    expect(describeIt(event({ action: "report.download", entityId: CYCLE, newValue: JSON.stringify({ report: "PR-RV-01-20261112" }) })).what).toBe(
      "downloaded the report PR-RV-01-20261112 of cycle P2-20261112-009",
    );
    expect(describeIt(event({ action: "audit.export", entityType: "site", newValue: JSON.stringify({ format: "pdf", events: 1 }) })).what).toBe(
      "exported the audit trail as a signed PDF extract (1 event)",
    );
  });

  it("falls back to the e-mail, and to Papin itself for an automatic event", () => {
    expect(describeIt(event({ action: "auth.sign-in", actorId: "unknown" })).who).toBe("erin@site.example");
    const automatic = describeIt(event({ action: "sterilizer.out-of-use", entityType: "sterilizer", entityId: STERILIZER, actorId: null, actorEmail: null }));
    expect(automatic.who).toBe("Papin (automatic)");
    expect(automatic.what).toBe("took the sterilizer Porous load 1 out of use");
  });

  it("describes an action this version does not know in readable words, never raw JSON", () => {
    const line = describeIt(event({ action: "cycle.label-print", entityId: CYCLE, newValue: JSON.stringify({ copies: 2, printer: { room: "B2" } }) }));
    expect(line.what).toBe("label print (cycle P2-20261112-009)");
    expect(line.kind).toBe("Label print (cycle)");
    expect(line.changes).toEqual([
      { field: "Copies", old: null, new: "2" },
      { field: "Printer", old: null, new: "room B2" },
    ]);
  });

  it("keeps a bare text value as one line and survives a value that is not JSON", () => {
    expect(describeIt(event({ action: "cycle.submit", entityId: CYCLE, newValue: "not json {" })).changes).toEqual([{ field: "Value", old: null, new: "not json {" }]);
  });

  it("reads the site's clock across daylight saving (BST in July: UTC+1)", () => {
    expect(auditSiteText("2026-07-01T12:00:00Z", "Europe/London")).toBe("1 Jul 2026 13:00:00 BST");
    expect(auditSiteText("2026-07-01T12:00:00Z", "Not/AZone")).toBe("2026-07-01 12:00:00 UTC");
  });
});

/** Every action name the code writes to the ledger: literal `action: "…"` and the templated signature meanings and statuses. */
function actionsWritten(): string[] {
  const root = path.join(import.meta.dirname, "../..");
  const files = (dir: string): string[] =>
    readdirSync(dir, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? files(path.join(dir, e.name)) : /\.tsx?$/.test(e.name) ? [path.join(dir, e.name)] : []));
  const found = new Set<string>();
  for (const file of [...files(path.join(root, "lib")), ...files(path.join(root, "db"))]) {
    const text = readFileSync(file, "utf8");
    for (const m of text.matchAll(/action: (?:[a-zA-Z]+ \? )?"([a-z-]+\.[a-z.-]+)"(?: : "([a-z-]+\.[a-z.-]+)")?/g)) {
      found.add(m[1]);
      if (m[2]) found.add(m[2]);
    }
  }
  for (const m of SIGNING_MEANINGS) found.add(`cycle.sign.${m}`);
  for (const m of PERIODIC_SIGNATURE_MEANINGS) found.add(`periodic-test.sign.${m}`);
  for (const s of STERILIZER_STATUSES) found.add(`sterilizer.${s}`);
  return [...found].sort();
}

describe("the action catalogue", () => {
  const written = actionsWritten();

  it("finds the actions the code writes (the scan itself works)", () => {
    for (const known of ["auth.sign-in", "cycle.create", "profile.retire", "schedule.update", "schedule.create", "signature.locked", "audit.export", "cycle.sign.approved"])
      expect(written).toContain(known);
  });

  it("has words for every action the code writes, and for the old 'rejected' signatures", () => {
    expect(written.filter((a) => !AUDIT_ACTIONS[a])).toEqual([]);
    for (const m of SIGNATURE_MEANINGS) expect(AUDIT_ACTIONS[`cycle.sign.${m}`]).toBeDefined();
  });

  it("describes every catalogued action without raw JSON, [object Object] or undefined", () => {
    const values = JSON.stringify({ name: "X", kind: "bowie-dick", intervalDays: 1, status: "approved", report: "PR-1", rows: 3, events: 2, format: "csv", route: "/api/cycles", nested: { a: 1 } });
    for (const action of Object.keys(AUDIT_ACTIONS)) {
      const line = describeIt(event({ action, entityId: CYCLE, oldValue: values, newValue: values }));
      const text = [line.what, line.kind, ...line.changes.flatMap((c) => [c.field, c.old ?? "", c.new ?? ""])].join(" | ");
      expect(text, action).not.toMatch(/\[object Object\]|undefined|\{|\}/);
      expect(line.what.length, action).toBeGreaterThan(5);
    }
  });

  it("offers each action once in the filter, in words", () => {
    expect(AUDIT_ACTION_CHOICES.map((c) => c.value).sort()).toEqual(Object.keys(AUDIT_ACTIONS).sort());
    expect(AUDIT_ACTION_CHOICES.find((c) => c.value === "cycle.sign.approved")?.label).toBe("Approved a cycle");
  });
});

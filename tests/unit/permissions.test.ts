import { describe, expect, it } from "vitest";
import { can, PERMISSIONS } from "@/lib/auth/permissions";
import { ROLES } from "@/lib/domain";

describe("the permissions table", () => {
  it("lets a technician upload and submit, but not sign or manage users", () => {
    expect(can("technician", "cycle:create")).toBe(true);
    expect(can("technician", "cycle:submit")).toBe(true);
    expect(can("technician", "cycle:sign")).toBe(false);
    expect(can("technician", "users:manage")).toBe(false);
  });

  it("lets an engineer sign and manage equipment, but not manage users", () => {
    expect(can("engineer", "cycle:sign")).toBe(true);
    expect(can("engineer", "equipment:manage")).toBe(true);
    expect(can("engineer", "users:manage")).toBe(false);
  });

  it("lets engineers, auditors and admins read their site's audit trail, but not technicians", () => {
    expect(can("engineer", "audit:read")).toBe(true);
    expect(can("technician", "audit:read")).toBe(false);
  });

  it("keeps the auditor read-only: archive and ledger yes, any change no", () => {
    expect(can("auditor", "archive:read")).toBe(true);
    expect(can("auditor", "audit:read")).toBe(true);
    for (const change of ["cycle:create", "cycle:submit", "cycle:sign", "equipment:manage", "periodic-test:record", "users:manage"] as const) {
      expect(can("auditor", change)).toBe(false);
    }
  });

  it("lets an admin manage users but never sign a record (separation of duties)", () => {
    expect(can("admin", "users:manage")).toBe(true);
    expect(can("admin", "cycle:sign")).toBe(false);
    expect(can("admin", "cycle:create")).toBe(false);
  });

  it("refuses everything to a missing role", () => {
    for (const permission of Object.keys(PERMISSIONS) as Array<keyof typeof PERMISSIONS>) {
      expect(can(undefined, permission)).toBe(false);
    }
  });

  it("names only known roles", () => {
    for (const roles of Object.values(PERMISSIONS)) for (const r of roles) expect(ROLES).toContain(r);
  });
});

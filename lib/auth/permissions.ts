import type { Role } from "@/db/schema";

/**
 * Who may do what, in one place. Route handlers, server actions and pages ask `can(role, action)`;
 * navigation only hides what the server would refuse anyway.
 */
export const PERMISSIONS = {
  "cycle:read": ["technician", "engineer", "auditor"],
  "cycle:create": ["technician", "engineer"],
  "cycle:submit": ["technician", "engineer"],
  "cycle:sign": ["engineer"],
  "review:queue": ["engineer"],
  "equipment:read": ["technician", "engineer", "auditor"],
  "equipment:manage": ["engineer"],
  "periodic-test:record": ["technician", "engineer"],
  "archive:read": ["engineer", "auditor"],
  "report:read": ["technician", "engineer", "auditor"],
  "report:verify": ["technician", "engineer", "auditor", "admin"],
  "audit:read": ["auditor", "admin"],
  "steam:calculate": ["technician", "engineer", "auditor", "admin"],
  "users:manage": ["admin"],
  "settings:manage": ["admin"],
  "mail:read-outbox": ["admin"],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export function can(role: Role | undefined | null, permission: Permission): boolean {
  if (!role) return false;
  return (PERMISSIONS[permission] as readonly Role[]).includes(role);
}

export const ROLE_LABELS: Record<Role, string> = {
  technician: "Technician",
  engineer: "Validation engineer",
  auditor: "Auditor",
  admin: "Administrator",
};

export const ROLE_DUTIES: Record<Role, string> = {
  technician: "Registers test cycles, uploads logger files and submits them for review.",
  engineer: "Owns sterilizers, instruments and acceptance profiles; reviews and signs cycles.",
  auditor: "Reads the signed archive and the audit ledger; changes nothing.",
  admin: "Manages users, roles, sites and settings; cannot sign records.",
};

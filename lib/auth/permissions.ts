import type { Role } from "@/lib/domain";

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
  "periodic-test:sign": ["engineer"],
  "archive:read": ["engineer", "auditor"],
  "report:read": ["technician", "engineer", "auditor"],
  "report:verify": ["technician", "engineer", "auditor", "admin"],
  "audit:read": ["engineer", "auditor", "admin"],
  "steam:calculate": ["technician", "engineer", "auditor", "admin"],
  "users:manage": ["admin"],
  "settings:manage": ["admin"],
  "mail:read-outbox": ["admin"],
  "account:own-password": ["technician", "engineer", "auditor", "admin"],
  "api-token:manage": ["engineer", "admin"],
  // Qualification studies (issue 14): roles as for cycles. Engineers plan and sign; technicians attach runs and record indicators.
  "study:read": ["technician", "engineer", "auditor"],
  "study:plan": ["engineer"],
  "study:run": ["technician", "engineer"],
  "study:sign": ["engineer"],
  "deviation:close": ["engineer"],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export function can(role: Role | undefined | null, permission: Permission): boolean {
  if (!role) return false;
  return (PERMISSIONS[permission] as readonly Role[]).includes(role);
}

export const ROLES = ["technician", "engineer", "auditor", "admin"] as const;
export type Role = (typeof ROLES)[number];

export const ROLES = ["technician", "engineer", "auditor", "admin"] as const;
export type Role = (typeof ROLES)[number];

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

/** Who is acting: the signed-in user as every layer sees them, without the database row. */
export type Actor = { id: string; email: string; siteId: string | null; role: Role; name: string };

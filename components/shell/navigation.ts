import type { Permission } from "@/lib/auth/permissions";

export type NavItem = { href: string; label: string; permission?: Permission };

// Order follows a working day: what waits, new work, records, equipment, evidence, tools.
export const NAV_ITEMS: NavItem[] = [
  { href: "/", label: "Overview" },
  { href: "/cycles/new", label: "New cycle", permission: "cycle:create" },
  { href: "/cycles", label: "Cycles", permission: "cycle:read" },
  { href: "/review", label: "Review queue", permission: "review:queue" },
  { href: "/sterilizers", label: "Sterilizers", permission: "equipment:read" },
  { href: "/instruments", label: "Instruments", permission: "equipment:read" },
  { href: "/periodic-tests", label: "Periodic tests", permission: "equipment:read" },
  { href: "/studies", label: "Studies", permission: "study:read" },
  { href: "/archive", label: "Signed archive", permission: "archive:read" },
  { href: "/audit", label: "Audit ledger", permission: "audit:read" },
  { href: "/steam", label: "Steam calculator", permission: "steam:calculate" },
  { href: "/tokens", label: "API tokens", permission: "api-token:manage" },
  { href: "/admin/users", label: "Users", permission: "users:manage" },
  { href: "/admin/site", label: "Site settings", permission: "settings:manage" },
  { href: "/admin/mail", label: "Mail", permission: "mail:read-outbox" },
];

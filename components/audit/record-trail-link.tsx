import Link from "next/link";
import { can } from "@/lib/auth/permissions";
import type { Role } from "@/lib/domain";

/** "Show this record's trail": the audit ledger filtered to one record, for the roles that may read it. */
export function RecordTrailLink({ role, recordId, className = "btn-secondary" }: { role: Role; recordId: string; className?: string }) {
  if (!can(role, "audit:read")) return null;
  return (
    <Link href={`/audit?${new URLSearchParams({ record: recordId })}`} className={className} data-testid="record-trail-link">
      Show this record&apos;s trail
    </Link>
  );
}

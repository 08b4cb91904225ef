import Link from "next/link";
import { requirePageActor } from "@/lib/auth/page-guard";
import { getProfilesPage } from "@/lib/services/profiles";
import { EmptyState, PageHeader, Panel } from "@/components/ui/panel";
import { Badge } from "@/components/ui/badge";
import { ProfileForm } from "@/components/equipment/profile-form";
import { formatDate } from "@/lib/format";
import { describeBasis, formatDuration, plural } from "@/lib/domain";
import { TableFrame } from "@/components/ui/table-frame";

export const metadata = { title: "Acceptance profiles" };

export default async function ProfilesPage() {
  const actor = await requirePageActor("equipment:read");
  const { active, retired, mayManage: manage } = await getProfilesPage({ actor });
  return (
    <>
      <PageHeader
        title="Acceptance profiles"
        subtitle="The limits each cycle is judged against. A profile that cycles were analysed with is never changed in place: an edit creates a new version and retires the old one."
        actions={
          <Link href="/sterilizers" className="btn-secondary">
            Sterilizers
          </Link>
        }
      />
      <div className={`grid gap-gutter ${manage ? "2xl:grid-cols-[minmax(0,1fr)_26rem]" : ""}`}>
        <div className="min-w-0 space-y-gutter">
          <Panel title={`${plural(active.length, "profile")} in use`}>{active.length === 0 ? <EmptyState title="No acceptance profile yet." /> : <ProfileTable rows={active} />}</Panel>
          {retired.length > 0 && (
            <Panel title={plural(retired.length, "retired version")}>
              <p className="mb-3 text-sm text-ink-muted">Kept because cycles were analysed against them; they cannot be chosen for new cycles.</p>
              <ProfileTable rows={retired} />
            </Panel>
          )}
        </div>
        {manage && (
          <Panel title="New acceptance profile">
            <ProfileForm />
          </Panel>
        )}
      </div>
    </>
  );
}

function ProfileTable({ rows }: { rows: Awaited<ReturnType<typeof getProfilesPage>>["active"] }) {
  return (
    <TableFrame label="Acceptance profiles">
      <table className="data-table" data-testid="profiles-table">
        <thead>
          <tr>
            <th>Profile</th>
            <th>Band</th>
            <th>Hold ≥</th>
            <th>Equil. ≤</th>
            <th>Spread ≤</th>
            <th>Saturation ±</th>
            <th>F0</th>
            <th>Used by</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((p) => (
            <tr key={p.id}>
              <td className="min-w-[15rem]">
                <Link href={`/profiles/${p.id}`} className="font-medium text-steam-700 hover:underline">
                  {p.name}
                </Link>
                {!p.active && (
                  <>
                    {" "}
                    <Badge>Retired</Badge>
                  </>
                )}
                <p className="max-w-xs text-xs text-ink-muted" data-testid="profile-basis">
                  {describeBasis(p.basis, p.basisReason)}
                </p>
                <p className="text-2xs text-ink-faint">Created {formatDate(p.createdAt)}</p>
              </td>
              <td className="whitespace-nowrap">
                {p.sterilizationTempC}–{+(p.sterilizationTempC + p.bandK).toFixed(2)} °C
              </td>
              <td className="whitespace-nowrap">{formatDuration(p.holdingTimeS)}</td>
              <td>{p.maxEquilibrationS} s</td>
              <td>{p.maxSpreadK} K</td>
              <td>{p.saturationLimitK} K</td>
              <td className="whitespace-nowrap text-xs">
                {p.f0ReferenceC} °C, z {p.f0ZK} K
              </td>
              <td className="min-w-[9rem] text-xs">
                {plural(p.cycleCount, "cycle")}
                {p.defaultFor.length > 0 && <p className="text-ink-muted">Default for {p.defaultFor.join(", ")}</p>}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </TableFrame>
  );
}

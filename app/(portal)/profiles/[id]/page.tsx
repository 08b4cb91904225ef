import Link from "next/link";
import { orNotFound, requirePageActor } from "@/lib/auth/page-guard";
import { getProfilePage } from "@/lib/services/profiles";
import { PageHeader, Panel } from "@/components/ui/panel";
import { RecordTrailLink } from "@/components/audit/record-trail-link";
import { Badge } from "@/components/ui/badge";
import { ProfileForm } from "@/components/equipment/profile-form";
import { formatDateTime } from "@/lib/format";
import { describeBasis, formatDuration, formatLeakRate } from "@/lib/domain";

export const metadata = { title: "Acceptance profile" };

export default async function ProfilePage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const actor = await requirePageActor("equipment:read");
  const { profile: p, mayManage: manage } = await orNotFound(getProfilePage({ actor, id }));
  const rows: Array<[string, string]> = [
    ["Sterilization temperature", `${p.sterilizationTempC} °C`],
    ["Band", `${p.sterilizationTempC}–${+(p.sterilizationTempC + p.bandK).toFixed(2)} °C (${p.bandK} K)`],
    ["Minimum holding time", formatDuration(p.holdingTimeS)],
    ["Longest equilibration", `${p.maxEquilibrationS} s`],
    ["Largest spread during holding", `${p.maxSpreadK} K`],
    ["Saturation limit", `± ${p.saturationLimitK} K from Tsat(chamber pressure)`],
    ["F0", `reference ${p.f0ReferenceC} °C, z = ${p.f0ZK} K`],
    ["Air leakage test", `at most ${formatLeakRate(p.leakRateLimitKpaPerMin)} after evacuating to ${p.leakVacuumSetPointKpaAbs} kPa abs or deeper`],
    ["Basis", describeBasis(p.basis, p.basisReason)],
    ["Created", formatDateTime(p.createdAt)],
    ["Cycles analysed with it", String(p.cycleCount)],
  ];
  return (
    <>
      <PageHeader
        title={p.name}
        subtitle={p.active ? "Acceptance profile in use" : "Retired version: kept for the cycles analysed with it"}
        actions={
          <>
            <Link href="/profiles" className="btn-secondary">
              All profiles
            </Link>
            <RecordTrailLink role={actor.role} recordId={p.id} />
          </>
        }
      />
      <div className={`grid gap-gutter ${(manage && p.active) || p.replacedBy ? "xl:grid-cols-[minmax(0,1fr)_26rem]" : ""}`}>
        <Panel title={<>Limits {!p.active && <Badge>Retired</Badge>}</>}>
          <dl className="grid grid-cols-1 sm:grid-cols-[14rem_minmax(0,1fr)] gap-x-3 gap-y-2 text-sm">
            {rows.map(([k, v]) => (
              <div key={k} className="contents">
                <dt className="text-ink-muted">{k}</dt>
                <dd>{v}</dd>
              </div>
            ))}
          </dl>
        </Panel>
        {p.replacedBy && (
          <Panel title="Replaced">
            <p className="text-sm">
              This version was retired when its limits were changed. The current version is{" "}
              <Link href={`/profiles/${p.replacedBy.id}`} className="font-medium text-steam-700 underline">
                {p.replacedBy.name}
              </Link>
              .
            </p>
          </Panel>
        )}
        {manage && p.active && (
          <Panel title="Edit limits">
            <ProfileForm profile={p} />
          </Panel>
        )}
      </div>
    </>
  );
}

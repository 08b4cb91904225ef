import { forbidden } from "next/navigation";
import { currentUser } from "@/lib/auth/guards";
import { can } from "@/lib/auth/permissions";
import { getSiteById } from "@/db/queries/sites";
import { siteAtmosphereKpa } from "@/lib/cycles/analyze-file";
import { EmptyState, PageHeader, Panel } from "@/components/ui/panel";
import { SiteSettingsForm } from "@/components/admin/site-form";
import { formatNumber } from "@/lib/format";

export const metadata = { title: "Site settings" };

function atmosphereInUse(site: { atmosphereKpa: number | null; altitudeM: number | null }) {
  try {
    const kpa = siteAtmosphereKpa(site);
    const source = site.atmosphereKpa
      ? "From the measured pressure entered here"
      : site.altitudeM !== null
        ? `From the altitude of ${formatNumber(site.altitudeM, 0)} m, through the standard atmosphere`
        : "The standard atmosphere at sea level, since neither pressure nor altitude is set";
    return { kpa, source };
  } catch (error) {
    return { kpa: null, source: error instanceof Error ? error.message : "The stored altitude cannot be converted." };
  }
}

export default async function SiteSettingsPage() {
  const user = await currentUser();
  if (!user || !can(user.role, "settings:manage")) forbidden();
  const site = user.siteId ? await getSiteById({ id: user.siteId }) : undefined;
  if (!site) {
    return (
      <>
        <PageHeader title="Site settings" />
        <EmptyState title="Your account is not attached to a site">There are no site settings to change.</EmptyState>
      </>
    );
  }
  const atmosphere = atmosphereInUse(site);
  return (
    <>
      <PageHeader title="Site settings" subtitle={`${site.name} · code ${site.code}. Every change is written to the audit ledger.`} />
      <div className="grid gap-gutter xl:grid-cols-[1fr_24rem]">
        <Panel title="Site">
          <SiteSettingsForm
            site={{ name: site.name, timeZone: site.timeZone, atmosphereKpa: site.atmosphereKpa, altitudeM: site.altitudeM, address: site.address }}
            timeZones={Intl.supportedValuesOf("timeZone")}
          />
        </Panel>
        <Panel title="Atmospheric pressure in use">
          <p className="text-2xl font-semibold" data-testid="atmosphere-in-use">
            {atmosphere.kpa === null ? "—" : <>{formatNumber(atmosphere.kpa, 3)} <span className="text-base font-normal text-ink-muted">kPa</span></>}
          </p>
          <p className="mt-1 text-sm text-ink-muted">{atmosphere.source}.</p>
          <p className="mt-3 text-sm text-ink-soft">
            Papin adds this to gauge readings to get absolute pressure; a measured barometer reading is better than the standard atmosphere, and a change
            applies to analyses made from now on (stored analyses are not recomputed).
          </p>
        </Panel>
      </div>
    </>
  );
}

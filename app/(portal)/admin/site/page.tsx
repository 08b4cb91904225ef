import { requirePageActor } from "@/lib/auth/page-guard";
import { getSiteSettings } from "@/lib/services/site";
import { EmptyState, PageHeader, Panel } from "@/components/ui/panel";
import { SiteSettingsForm } from "@/components/admin/site-form";
import { formatNumber } from "@/lib/format";

export const metadata = { title: "Site settings" };

export default async function SiteSettingsPage() {
  const actor = await requirePageActor("settings:manage");
  const settings = await getSiteSettings({ actor });
  if (!settings) {
    return (
      <>
        <PageHeader title="Site settings" />
        <EmptyState title="Your account is not attached to a site">There are no site settings to change.</EmptyState>
      </>
    );
  }
  const { site, atmosphere } = settings;
  return (
    <>
      <PageHeader title="Site settings" subtitle={`${site.name} · code ${site.code}. Every change is written to the audit ledger.`} />
      <div className="grid gap-gutter xl:grid-cols-[minmax(0,1fr)_24rem]">
        <Panel title="Site">
          <SiteSettingsForm
            site={{ name: site.name, timeZone: site.timeZone, atmosphereKpa: site.atmosphereKpa, altitudeM: site.altitudeM, address: site.address }}
            timeZones={Intl.supportedValuesOf("timeZone")}
          />
        </Panel>
        <Panel title="Atmospheric pressure in use">
          <p className="text-2xl font-semibold" data-testid="atmosphere-in-use">
            {atmosphere.kpa === null ? (
              "—"
            ) : (
              <>
                {formatNumber(atmosphere.kpa, 3)} <span className="text-base font-normal text-ink-muted">kPa</span>
              </>
            )}
          </p>
          <p className="mt-1 text-sm text-ink-muted">{atmosphere.source}.</p>
          <p className="mt-3 text-sm text-ink-soft">
            Papin adds this to gauge readings to get absolute pressure; a measured barometer reading is better than the standard atmosphere, and a change applies to analyses made from now on (stored
            analyses are not recomputed).
          </p>
        </Panel>
      </div>
    </>
  );
}

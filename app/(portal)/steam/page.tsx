import { forbidden } from "next/navigation";
import { currentUser } from "@/lib/auth/guards";
import { can } from "@/lib/auth/permissions";
import { getSiteById } from "@/db/queries/sites";
import { STANDARD_ATMOSPHERE_KPA, atmosphereAtAltitudeKpa } from "@/lib/steam";
import { PageHeader } from "@/components/ui/panel";
import { SteamCalculator, type SiteAtmosphere } from "@/components/steam/steam-calculator";

export const metadata = { title: "Steam calculator" };

export default async function SteamPage() {
  const user = await currentUser();
  if (!user || !can(user.role, "steam:calculate")) forbidden();
  const site = user.siteId ? await getSiteById({ id: user.siteId }) : undefined;
  const atmosphere: SiteAtmosphere =
    site?.atmosphereKpa != null
      ? { siteName: site.name, atmosphereKpa: site.atmosphereKpa, source: "site", altitudeM: site.altitudeM ?? null }
      : site?.altitudeM != null
        ? { siteName: site.name, atmosphereKpa: atmosphereAtAltitudeKpa(site.altitudeM), source: "site-altitude", altitudeM: site.altitudeM }
        : { siteName: site?.name ?? null, atmosphereKpa: STANDARD_ATMOSPHERE_KPA, source: "standard", altitudeM: null };

  return (
    <>
      <PageHeader
        title="Steam calculator"
        subtitle="Saturated steam, IAPWS-IF97 region 4: temperature ⇄ pressure in any unit, gauge ⇄ absolute."
      />
      <SteamCalculator site={atmosphere} />
      <p className="mt-6 max-w-3xl rounded-md border border-caution-500/30 bg-caution-50 px-4 py-3 text-sm text-caution-700" role="note">
        <strong>Caution.</strong> Saturation figures assume pure, dry saturated steam. They do not tell you what a particular
        sterilizer, gauge or load will do, and never justify adjusting a sterilizer&apos;s controls or safety valves: follow its
        instructions, local codes and a competent person&apos;s judgement.
      </p>
    </>
  );
}

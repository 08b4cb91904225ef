import { requirePageActor } from "@/lib/auth/page-guard";
import { getSiteAtmosphere } from "@/lib/services/site";
import { PageHeader } from "@/components/ui/panel";
import { SteamCalculator } from "@/components/steam/steam-calculator";

export const metadata = { title: "Steam calculator" };

export default async function SteamPage() {
  const actor = await requirePageActor("steam:calculate");
  const atmosphere = await getSiteAtmosphere({ actor });

  return (
    <>
      <PageHeader title="Steam calculator" subtitle="Saturated steam, IAPWS-IF97 region 4: temperature ⇄ pressure in any unit, gauge ⇄ absolute." />
      <SteamCalculator site={atmosphere} />
      <p className="mt-6 max-w-3xl rounded-md border border-caution-500/30 bg-caution-50 px-4 py-3 text-sm text-caution-700" role="note">
        <strong>Caution.</strong> Saturation figures assume pure, dry saturated steam. They do not tell you what a particular sterilizer, gauge or load will do, and never justify adjusting a
        sterilizer&apos;s controls or safety valves: follow its instructions, local codes and a competent person&apos;s judgement.
      </p>
    </>
  );
}

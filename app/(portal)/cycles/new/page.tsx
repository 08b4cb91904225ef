import { forbidden } from "next/navigation";
import { currentUser } from "@/lib/auth/guards";
import { can } from "@/lib/auth/permissions";
import { env } from "@/lib/env";
import { listInstrumentsForSite, listProfilesForSite, listSterilizersForSite } from "@/db/queries/catalog";
import { PageHeader } from "@/components/ui/panel";
import { IntakeForm } from "@/components/intake/intake-form";

export const metadata = { title: "New test cycle" };

export default async function NewCyclePage() {
  const user = await currentUser();
  if (!user || !can(user.role, "cycle:create")) forbidden();
  const [sterilizers, profiles, instruments] = await Promise.all([
    listSterilizersForSite({ actor: user }),
    listProfilesForSite({ actor: user }),
    listInstrumentsForSite({ actor: user }),
  ]);
  return (
    <>
      <PageHeader
        title="New test cycle"
        subtitle="Drop the logger file, confirm what each column holds, say which sterilizer and profile it belongs to, and analyse."
      />
      <IntakeForm
        limitMb={env().PAPIN_UPLOAD_LIMIT_MB}
        sterilizers={sterilizers.map((s) => ({ id: s.id, name: s.name, serialNumber: s.serialNumber, chamberVolumeL: s.chamberVolumeL, defaultProfileId: s.defaultProfileId }))}
        profiles={profiles.map((p) => ({ id: p.id, name: p.name, sterilizationTempC: p.sterilizationTempC, holdingTimeS: p.holdingTimeS, bandK: p.bandK }))}
        instruments={instruments.map((i) => ({ id: i.id, name: i.name, serialNumber: i.serialNumber, kind: i.kind, hasSavedMapping: i.hasSavedMapping }))}
      />
    </>
  );
}

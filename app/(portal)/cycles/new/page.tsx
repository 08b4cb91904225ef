import { requirePageActor } from "@/lib/auth/page-guard";
import { env } from "@/lib/env";
import { getIntakeOptions } from "@/lib/services/intake";
import { PageHeader } from "@/components/ui/panel";
import { IntakeForm } from "@/components/intake/intake-form";

export const metadata = { title: "New test cycle" };

export default async function NewCyclePage() {
  const actor = await requirePageActor("cycle:create");
  const { sterilizers, profiles, instruments, timeZone } = await getIntakeOptions({ actor });
  return (
    <>
      <PageHeader title="New test cycle" subtitle="Drop the logger file, confirm what each column holds, say which sterilizer and profile it belongs to, and analyse." />
      <IntakeForm limitMb={env().PAPIN_UPLOAD_LIMIT_MB} sterilizers={sterilizers} profiles={profiles} instruments={instruments} timeZone={timeZone} />
    </>
  );
}

import { PageHeader } from "@/components/ui/panel";
import { StudyForm } from "@/components/studies/study-form";
import { requirePageActor } from "@/lib/auth/page-guard";
import { getStudyPlanningOptions } from "@/lib/services/study-planning";

export const metadata = { title: "Plan a qualification study" };

export default async function NewStudyPage() {
  const actor = await requirePageActor("study:plan");
  const options = await getStudyPlanningOptions({ actor });
  return (
    <>
      <PageHeader
        title="Plan a qualification study"
        subtitle="The sterilizer and profile, the loading pattern with its probe positions, the acceptance criteria and the protocol. It is saved as a draft for a second engineer to approve."
      />
      <StudyForm options={options} />
    </>
  );
}

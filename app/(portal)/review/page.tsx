import { Suspense } from "react";
import { requirePageActor } from "@/lib/auth/page-guard";
import { getCycleListContext } from "@/lib/services/cycles";
import { listPeriodicTestsForReview } from "@/lib/services/periodic-test-review";
import { PageHeader } from "@/components/ui/panel";
import { PeriodicReviewList } from "@/components/periodic-tests/review-list";
import { CyclesTable } from "@/components/cycles/list/cycles-table";
import { CycleListSkeleton } from "@/components/cycles/list/list-skeleton";

export const metadata = { title: "Review queue" };

export default async function ReviewQueuePage() {
  const actor = await requirePageActor("review:queue");
  const [{ sterilizers, timeZone }, periodicRecords] = await Promise.all([getCycleListContext({ actor, queue: true }), listPeriodicTestsForReview({ actor })]);
  return (
    <>
      <PageHeader title="Review queue" subtitle="Cycles submitted for review, the longest-waiting first. Open one to check it and sign." />
      <Suspense fallback={<CycleListSkeleton />}>
        <CyclesTable
          caption="Cycles awaiting review"
          fixed={{ status: "submitted" }}
          sterilizers={sterilizers}
          timeZone={timeZone}
          defaultSort="submittedAt:asc"
          emptyTitle="Nothing waits for review."
          emptyHint="Cycles appear here when a technician submits them."
        />
      </Suspense>
      <PeriodicReviewList records={periodicRecords} timeZone={timeZone} actorId={actor.id} />
    </>
  );
}

import { Suspense } from "react";
import { forbidden } from "next/navigation";
import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { listSterilizersForSite } from "@/db/queries/catalog";
import { getSiteById } from "@/db/queries/sites";
import { PageHeader } from "@/components/ui/panel";
import { CyclesTable } from "@/components/cycles/list/cycles-table";
import { CycleListSkeleton } from "@/components/cycles/list/list-skeleton";

export const metadata = { title: "Review queue" };

async function reviewer() {
  try {
    return await requireRole("review:queue");
  } catch (error) {
    if (error instanceof AppError && (error.status === 401 || error.status === 403)) forbidden();
    throw error;
  }
}

export default async function ReviewQueuePage() {
  const user = await reviewer();
  const [sterilizers, site] = await Promise.all([listSterilizersForSite({ actor: user }), user.siteId ? getSiteById({ id: user.siteId }) : undefined]);
  return (
    <>
      <PageHeader title="Review queue" subtitle="Cycles submitted for review, the longest-waiting first. Open one to check it and sign." />
      <Suspense fallback={<CycleListSkeleton />}>
        <CyclesTable
          caption="Cycles awaiting review"
          fixed={{ status: "submitted" }}
          sterilizers={sterilizers.map((s) => ({ id: s.id, name: s.name }))}
          timeZone={site?.timeZone ?? "UTC"}
          defaultSort="submittedAt:asc"
          emptyTitle="Nothing waits for review."
          emptyHint="Cycles appear here when a technician submits them."
        />
      </Suspense>
    </>
  );
}

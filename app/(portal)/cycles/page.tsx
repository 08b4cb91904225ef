import Link from "next/link";
import { Suspense } from "react";
import { requirePageActor } from "@/lib/auth/page-guard";
import { getCycleListContext } from "@/lib/services/cycles";
import { PageHeader } from "@/components/ui/panel";
import { CyclesTable } from "@/components/cycles/list/cycles-table";
import { CycleListSkeleton } from "@/components/cycles/list/list-skeleton";

export const metadata = { title: "Cycles" };

export default async function CyclesPage() {
  const actor = await requirePageActor("cycle:read");
  const { sterilizers, timeZone, mayCreate } = await getCycleListContext({ actor });
  return (
    <>
      <PageHeader
        title="Cycles"
        subtitle="Every test cycle registered on your site, newest first. Filter, sort and open a record."
        actions={
          mayCreate ? (
            <Link href="/cycles/new" className="btn-primary">
              Upload a test cycle
            </Link>
          ) : undefined
        }
      />
      <Suspense fallback={<CycleListSkeleton />}>
        <CyclesTable
          caption="Test cycles"
          sterilizers={sterilizers}
          timeZone={timeZone}
          defaultSort="startedAt:desc"
          emptyTitle="No cycle has been registered yet."
          emptyHint={
            mayCreate ? (
              <Link className="text-steam-700 underline" href="/cycles/new">
                Upload a logger file to register the first one.
              </Link>
            ) : (
              "Technicians and engineers register cycles."
            )
          }
        />
      </Suspense>
    </>
  );
}

import Link from "next/link";
import { Suspense } from "react";
import { forbidden } from "next/navigation";
import { currentUser } from "@/lib/auth/guards";
import { can } from "@/lib/auth/permissions";
import { listSterilizersForSite } from "@/db/queries/catalog";
import { getSiteById } from "@/db/queries/sites";
import { PageHeader } from "@/components/ui/panel";
import { CyclesTable } from "@/components/cycles/list/cycles-table";
import { CycleListSkeleton } from "@/components/cycles/list/list-skeleton";

export const metadata = { title: "Cycles" };

export default async function CyclesPage() {
  const user = await currentUser();
  if (!user || !can(user.role, "cycle:read")) forbidden();
  const [sterilizers, site] = await Promise.all([listSterilizersForSite({ actor: user }), user.siteId ? getSiteById({ id: user.siteId }) : undefined]);
  const mayCreate = can(user.role, "cycle:create");
  return (
    <>
      <PageHeader
        title="Cycles"
        subtitle="Every test cycle registered on your site, newest first. Filter, sort and open a record."
        actions={mayCreate ? <Link href="/cycles/new" className="btn-primary">Upload a test cycle</Link> : undefined}
      />
      <Suspense fallback={<CycleListSkeleton />}>
        <CyclesTable
          caption="Test cycles"
          sterilizers={sterilizers.map((s) => ({ id: s.id, name: s.name }))}
          timeZone={site?.timeZone ?? "UTC"}
          defaultSort="startedAt:desc"
          emptyTitle="No cycle has been registered yet."
          emptyHint={mayCreate ? <Link className="text-steam-700 underline" href="/cycles/new">Upload a logger file to register the first one.</Link> : "Technicians and engineers register cycles."}
        />
      </Suspense>
    </>
  );
}

import { CycleListSkeleton } from "@/components/cycles/list/list-skeleton";

export default function Loading() {
  return (
    <>
      <div className="mb-6">
        <h1>Cycles</h1>
        <p className="mt-1 text-sm text-ink-muted">Loading the list…</p>
      </div>
      <CycleListSkeleton />
    </>
  );
}

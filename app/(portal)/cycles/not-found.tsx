import Link from "next/link";
import { EmptyState } from "@/components/ui/panel";

export default function CycleNotFound() {
  return (
    <div className="mx-auto max-w-lg py-10">
      <h1 className="mb-4">Cycle not found</h1>
      <EmptyState title="There is no cycle at this address on your site.">
        The link may be mistyped, or the record belongs to another site.{" "}
        <Link href="/cycles" className="text-steam-700 underline">
          Go to the cycles list
        </Link>
        .
      </EmptyState>
    </div>
  );
}

import Link from "next/link";
import { EmptyState } from "@/components/ui/panel";

export default function StudyNotFound() {
  return (
    <div className="mx-auto max-w-lg py-10">
      <h1 className="mb-4">Study not found</h1>
      <EmptyState title="There is no study at this address on your site.">
        The link may be mistyped, or the study belongs to another site.{" "}
        <Link href="/studies" className="text-steam-700 underline">
          Go to the studies list
        </Link>
        .
      </EmptyState>
    </div>
  );
}

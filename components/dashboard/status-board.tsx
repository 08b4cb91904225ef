import Link from "next/link";
import { EmptyState } from "@/components/ui/panel";
import { SterilizerStatusLine } from "@/components/equipment/sterilizer-status";
import type { SterilizerStatus } from "@/lib/domain";
import { plural, agree } from "@/lib/domain";

/** notices: loads this sterilizer may not run although it is in use (a pattern required before use and not requalified). */
type Item = { id: string; name: string; status: SterilizerStatus; statusReason: string; statusSince: string; notices?: string[] };

/** Each sterilizer of the site, in use or out of use, with the reason and since when; out of use first. */
export function StatusBoard({ items, timeZone, linked }: { items: Item[]; timeZone: string; linked: boolean }) {
  if (items.length === 0) return <EmptyState title="No sterilizer is registered for this site yet." />;
  const out = items.filter((i) => i.status === "out-of-use").length;
  return (
    <div data-testid="status-board">
      <p className="mb-2 text-sm text-ink-muted">{out === 0 ? "Every sterilizer is in use." : `${out} of ${plural(items.length, "sterilizer")} ${agree(out, "is", "are")} out of use.`}</p>
      <ul className="grid gap-3 sm:grid-cols-2">
        {items.map((s) => (
          <li key={s.id} className={`rounded-md border px-3 py-2 ${s.status === "out-of-use" ? "border-fail-500/40 bg-fail-50/40" : "border-ink-line"}`} data-sterilizer={s.name}>
            {linked ? (
              <Link href={`/sterilizers/${s.id}`} className="font-medium text-steam-700 hover:underline">
                {s.name}
              </Link>
            ) : (
              <p className="font-medium">{s.name}</p>
            )}
            <div className="mt-1">
              <SterilizerStatusLine status={s.status} reason={s.statusReason} since={s.statusSince} timeZone={timeZone} />
            </div>
            {s.notices?.map((notice) => (
              <p key={notice} className="mt-1 text-sm font-medium text-fail-700" data-testid="load-notice">
                ✕ {notice}
              </p>
            ))}
          </li>
        ))}
      </ul>
    </div>
  );
}

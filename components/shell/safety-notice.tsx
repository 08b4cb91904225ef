import Link from "next/link";
import { SAFETY_SHORT } from "@/lib/safety";

export function SafetyNotice() {
  return (
    <aside aria-label="Safety notice" className="border-t border-ink-line bg-paper-sunk px-gutter py-3 text-xs text-ink-muted">
      <span className="font-semibold text-caution-700">⚠ Safety: </span>
      {SAFETY_SHORT}{" "}
      <Link href="/safety" className="font-medium text-steam-700 underline underline-offset-2">
        Read the safety notes
      </Link>
    </aside>
  );
}

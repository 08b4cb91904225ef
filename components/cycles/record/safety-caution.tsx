import Link from "next/link";
import { SAFETY_NOTES, SAFETY_SHORT } from "@/lib/safety";

const ON_THE_RECORD = ["Pressure equipment", "Steam, hot surfaces and hot loads", "What this record is and is not"];

export function SafetyCaution() {
  const notes = SAFETY_NOTES.filter((n) => ON_THE_RECORD.includes(n.title));
  return (
    <section aria-labelledby="record-safety" className="rounded-panel border border-caution-500/30 bg-caution-50 px-4 py-3 text-sm" data-testid="record-safety">
      <h2 id="record-safety" className="text-sm font-semibold text-caution-700">
        ⚠ Steam and pressure equipment
      </h2>
      <p className="mt-1 text-ink-soft">{SAFETY_SHORT}</p>
      <details className="mt-2">
        <summary className="cursor-pointer text-xs font-medium text-caution-700">More cautions</summary>
        <ul className="mt-2 space-y-2 text-xs text-ink-soft">
          {notes.map((n) => (
            <li key={n.title}>
              <span className="font-semibold">{n.title}.</span> {n.text}
            </li>
          ))}
        </ul>
      </details>
      <p className="mt-2 text-xs">
        <Link href="/safety" className="font-medium text-steam-700 underline underline-offset-2">
          All safety notes
        </Link>
      </p>
    </section>
  );
}

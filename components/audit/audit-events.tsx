import Link from "next/link";
import type { AuditLine } from "@/lib/domain/audit-words";

/** The trail as stacked rows: one column on a phone, when | who | what | why side by side on a wide screen. */
export function AuditEvents({ lines }: { lines: AuditLine[] }) {
  return (
    <ol className="divide-y divide-ink-line" data-testid="audit-events">
      <li className="hidden gap-3 pb-2 text-xs font-semibold text-ink-muted xl:grid xl:grid-cols-[4rem_11rem_10rem_minmax(0,1fr)_12rem]" aria-hidden>
        <span>#</span>
        <span>When</span>
        <span>Who</span>
        <span>What</span>
        <span>Why</span>
      </li>
      {lines.map((line) => (
        <li key={line.seq} className="grid grid-cols-[minmax(0,1fr)] gap-1 py-3 text-sm xl:grid-cols-[4rem_11rem_10rem_minmax(0,1fr)_12rem] xl:gap-3" data-testid="audit-event">
          <span className="mono text-xs text-ink-muted">
            <span className="xl:hidden">Event </span>
            {line.seq}
          </span>
          <span className="text-xs">
            <span className="block">{line.when.site}</span>
            <span className="mono block text-ink-muted">{line.when.utc}</span>
          </span>
          <span className="text-xs">
            <span className="block font-medium">{line.who}</span>
            {line.role && <span className="block text-ink-muted">{line.role}</span>}
          </span>
          <div className="min-w-0">
            <p className="break-words [overflow-wrap:anywhere]" data-testid="audit-what">
              {line.what}
            </p>
            {line.record && (
              <p className="text-xs">
                {line.record.href ? (
                  <Link className="text-steam-700 underline" href={line.record.href}>
                    Open the {line.record.label}
                  </Link>
                ) : (
                  <span className="text-ink-muted">{line.record.label}</span>
                )}
              </p>
            )}
            {line.changes.length > 0 && (
              <dl className="mt-1 grid grid-cols-[auto_minmax(0,1fr)] gap-x-2 text-xs" aria-label="Old and new values">
                {line.changes.map((c, i) => (
                  <div key={i} className="contents">
                    <dt className="text-ink-muted">{c.field}</dt>
                    <dd className="break-words [overflow-wrap:anywhere]">
                      {c.old !== null && <span className="text-fail-700">{c.old}</span>}
                      {c.old !== null && c.new !== null && " → "}
                      {c.new !== null && <span className="text-pass-700">{c.new}</span>}
                      {c.old !== null && c.new === null && " → removed"}
                    </dd>
                  </div>
                ))}
              </dl>
            )}
          </div>
          <span className="break-words [overflow-wrap:anywhere] text-xs">{line.reason ? <span>Why: {line.reason}</span> : <span className="text-ink-muted xl:inline hidden">—</span>}</span>
        </li>
      ))}
    </ol>
  );
}

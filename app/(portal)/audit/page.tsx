import Link from "next/link";
import { requirePageActor } from "@/lib/auth/page-guard";
import { getAuditLedger, type AnchorState as Anchors } from "@/lib/services/audit";
import { EmptyState, PageHeader, Panel } from "@/components/ui/panel";
import { Badge } from "@/components/ui/badge";

export const metadata = { title: "Audit ledger" };

/** The comparison with the copies of the ledger head kept outside the database (the anchor file). */
function AnchorState({ anchors }: { anchors: Anchors }) {
  return (
    <div className="mb-gutter" data-testid="anchor-state">
      {anchors.status === "match" ? (
        <Badge tone="pass">
          ✓ Matches its {anchors.anchors} outside anchor{anchors.anchors === 1 ? "" : "s"}; the last, of {anchors.last.at.replace("T", " ").slice(0, 19)} UTC, holds {anchors.last.events} events
        </Badge>
      ) : anchors.status === "none" ? (
        <Badge tone="caution">⚠ {anchors.problem}</Badge>
      ) : anchors.status === "unchecked" ? (
        <Badge tone="caution">⚠ {anchors.problem}</Badge>
      ) : null}
    </div>
  );
}

type Search = { action?: string; actor?: string; entity?: string; from?: string; to?: string; page?: string };

export default async function AuditPage({ searchParams }: { searchParams: Promise<Search> }) {
  const actor = await requirePageActor("audit:read");
  const s = await searchParams;
  const page = Math.max(Number(s.page ?? 1) || 1, 1);
  const filter = {
    action: s.action || undefined,
    actor: s.actor || undefined,
    entityId: s.entity || undefined,
    from: s.from || undefined,
    to: s.to ? `${s.to}T23:59:59.999Z` : undefined,
    page,
    pageSize: 50,
  };
  const { chain, items, total } = await getAuditLedger({ actor, filter });
  const pages = Math.max(Math.ceil(total / 50), 1);
  const link = (p: number) => `/audit?${new URLSearchParams({ ...Object.fromEntries(Object.entries(s).filter(([, v]) => v)), page: String(p) })}`;
  return (
    <>
      <PageHeader title="Audit ledger" subtitle="Every change, submission, signature, sign-in and export, append-only and hash-chained." />
      <div className="mb-2" data-testid="chain-state">
        {chain.ok ? (
          <Badge tone="pass">✓ Chain intact: {chain.events} events, each linked to the one before</Badge>
        ) : (
          <Badge tone="fail">
            ✕ {chain.anchors.status === "mismatch" ? "Ledger disagrees with its outside anchor" : `Chain broken at event ${chain.firstBrokenAt}`}: {chain.problem}
          </Badge>
        )}
      </div>
      <AnchorState anchors={chain.anchors} />
      <Panel title={`${total} event${total === 1 ? "" : "s"}`}>
        <form className="mb-4 flex flex-wrap items-end gap-2" role="search">
          <div>
            <label className="field-label" htmlFor="action">
              Action
            </label>
            <input id="action" name="action" defaultValue={s.action} placeholder="cycle.sign.approved" className="field-input" />
          </div>
          <div>
            <label className="field-label" htmlFor="actor">
              Who (e-mail)
            </label>
            <input id="actor" name="actor" defaultValue={s.actor} className="field-input" />
          </div>
          <div>
            <label className="field-label" htmlFor="entity">
              Record id
            </label>
            <input id="entity" name="entity" defaultValue={s.entity} className="field-input" />
          </div>
          <div>
            <label className="field-label" htmlFor="from">
              From
            </label>
            <input id="from" name="from" type="date" defaultValue={s.from} className="field-input" />
          </div>
          <div>
            <label className="field-label" htmlFor="to">
              To
            </label>
            <input id="to" name="to" type="date" defaultValue={s.to} className="field-input" />
          </div>
          <button className="btn-secondary">Filter</button>
        </form>
        {items.length === 0 ? (
          <EmptyState title="No event matches these filters." />
        ) : (
          <div className="overflow-x-auto">
            <table className="data-table" data-testid="audit-table">
              <thead>
                <tr>
                  <th>#</th>
                  <th>When (UTC)</th>
                  <th>Who</th>
                  <th>Action</th>
                  <th>Record</th>
                  <th>Old → new</th>
                  <th>Reason</th>
                </tr>
              </thead>
              <tbody>
                {items.map((e) => (
                  <tr key={e.seq}>
                    <td className="mono">{e.seq}</td>
                    <td className="mono whitespace-nowrap">{e.at.replace("T", " ").slice(0, 19)}</td>
                    <td className="text-xs">{e.actorEmail ?? "—"}</td>
                    <td className="mono">{e.action}</td>
                    <td className="text-xs">
                      {e.entityType === "cycle" && e.entityId ? (
                        <Link className="text-steam-700 underline" href={`/cycles/${e.entityId}`}>
                          cycle
                        </Link>
                      ) : (
                        e.entityType
                      )}
                      {e.entityId && <span className="mono block text-ink-faint">{e.entityId.slice(0, 8)}</span>}
                    </td>
                    <td className="mono max-w-md break-all text-2xs">
                      {e.oldValue && <span className="text-fail-700">{e.oldValue.slice(0, 160)}</span>}
                      {e.oldValue && e.newValue && " → "}
                      {e.newValue && <span className="text-pass-700">{e.newValue.slice(0, 240)}</span>}
                    </td>
                    <td className="text-xs">{e.reason ?? ""}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
        <nav aria-label="Pages" className="mt-3 flex items-center gap-3 text-sm">
          {page > 1 && (
            <Link className="text-steam-700 underline" href={link(page - 1)}>
              ← Newer
            </Link>
          )}
          <span className="text-ink-muted">
            Page {page} of {pages}
          </span>
          {page < pages && (
            <Link className="text-steam-700 underline" href={link(page + 1)}>
              Older →
            </Link>
          )}
        </nav>
      </Panel>
    </>
  );
}

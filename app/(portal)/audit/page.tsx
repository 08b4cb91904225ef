import { Pager } from "@/components/ui/pager";
import { requirePageActor } from "@/lib/auth/page-guard";
import { getAuditTrail } from "@/lib/services/audit-trail";
import type { AnchorState as Anchors } from "@/lib/services/audit";
import { EmptyState, PageHeader, Panel } from "@/components/ui/panel";
import { Badge } from "@/components/ui/badge";
import { AuditEvents } from "@/components/audit/audit-events";
import { AuditFilters } from "@/components/audit/audit-filters";

export const metadata = { title: "Audit ledger" };

/** The comparison with the copies of the ledger head kept outside the database (the anchor file). */
function AnchorState({ anchors }: { anchors: Anchors }) {
  return (
    <div className="mb-gutter" data-testid="anchor-state">
      {anchors.status === "match" ? (
        <Badge tone="pass">
          ✓ Matches its {anchors.anchors} outside anchor{anchors.anchors === 1 ? "" : "s"}; the last, of {anchors.last.at.replace("T", " ").slice(0, 19)} UTC, holds {anchors.last.events} events
        </Badge>
      ) : anchors.status === "none" || anchors.status === "unchecked" ? (
        <Badge tone="caution">⚠ {anchors.problem}</Badge>
      ) : null}
    </div>
  );
}

type Search = { person?: string; action?: string; record?: string; from?: string; to?: string; page?: string };
const FILTER_KEYS = ["person", "action", "record", "from", "to"] as const;

export default async function AuditPage({ searchParams }: { searchParams: Promise<Search> }) {
  const actor = await requirePageActor("audit:read");
  const s = await searchParams;
  const page = Math.max(Number(s.page ?? 1) || 1, 1);
  const values = Object.fromEntries(FILTER_KEYS.filter((k) => typeof s[k] === "string" && s[k]).map((k) => [k, s[k] as string]));
  const { chain, lines, total, pages, filterWords, problem, choices } = await getAuditTrail({ actor, query: values, page });
  const query = new URLSearchParams(values).toString();
  const exportQuery = query ? `?${query}` : "";
  const link = (p: number) => `/audit?${new URLSearchParams({ ...values, page: String(p) })}`;
  return (
    <>
      <PageHeader title="Audit ledger" subtitle="Every change, submission, signature, sign-in and export of your site, append-only and hash-chained, in words." />
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
      <Panel title={`${total} event${total === 1 ? "" : "s"}${filterWords.length ? `: ${filterWords.join(", ")}` : ""}`}>
        <AuditFilters values={values} people={choices.people} actions={choices.actions} exportQuery={exportQuery} />
        {problem && (
          <p role="alert" className="mb-3 rounded-md bg-fail-50 px-3 py-2 text-sm text-fail-700">
            {problem}
          </p>
        )}
        {lines.length === 0 ? <EmptyState title="No event matches these filters." /> : <AuditEvents lines={lines} />}
        <Pager page={page} pages={pages} href={link} />
      </Panel>
    </>
  );
}

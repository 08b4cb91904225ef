import Link from "next/link";
import { Pager } from "@/components/ui/pager";
import { EmptyState, PageHeader, Panel } from "@/components/ui/panel";
import { TableFrame } from "@/components/ui/table-frame";
import { StudyStatusBadge } from "@/components/studies/status-badge";
import { requirePageActor } from "@/lib/auth/page-guard";
import { can } from "@/lib/auth/permissions";
import { plural, STUDY_KIND_LABELS, STUDY_STATUS_LABELS, STUDY_STATUSES } from "@/lib/domain";
import { formatDate } from "@/lib/format";
import { listStudies } from "@/lib/services/studies";
import { siteTimeZone } from "@/lib/services/study-planning";
import { studyListFilterSchema } from "@/lib/validations/study-forms";

export const metadata = { title: "Qualification studies" };

type Search = Record<string, string | string[] | undefined>;

export default async function StudiesPage({ searchParams }: { searchParams: Promise<Search> }) {
  const actor = await requirePageActor("study:read");
  const raw = await searchParams;
  const first = (k: string) => (Array.isArray(raw[k]) ? raw[k]![0] : (raw[k] as string | undefined)) || undefined;
  const filter = studyListFilterSchema.parse({ status: first("status"), page: first("page") });
  const page = filter.page ?? 1;
  const [{ rows, total, pageSize }, timeZone] = await Promise.all([listStudies({ actor, status: filter.status, page }), siteTimeZone({ actor })]);
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const pageHref = (n: number) => `/studies?${new URLSearchParams({ ...(filter.status ? { status: filter.status } : {}), page: String(n) }).toString()}`;
  return (
    <>
      <PageHeader
        title="Qualification studies"
        subtitle="Consecutive runs of one loading pattern with probes at mapped positions, judged together and signed by author, reviewer and quality assurance."
        actions={
          can(actor.role, "study:plan") ? (
            <Link href="/studies/new" className="btn-primary">
              Plan a study
            </Link>
          ) : undefined
        }
      />
      <Panel title={plural(total, "study", "studies")}>
        <form method="get" action="/studies" className="mb-4 flex flex-wrap items-end gap-3" aria-label="Filter the studies">
          <div>
            <label className="field-label" htmlFor="f-status">
              State
            </label>
            <select id="f-status" name="status" defaultValue={filter.status ?? ""} className="field-input">
              <option value="">Any</option>
              {STUDY_STATUSES.map((s) => (
                <option key={s} value={s}>
                  {STUDY_STATUS_LABELS[s]}
                </option>
              ))}
            </select>
          </div>
          <button className="btn-secondary">Filter</button>
          {filter.status && (
            <Link href="/studies" className="btn-secondary">
              Clear
            </Link>
          )}
        </form>
        {rows.length === 0 ? (
          <EmptyState title={filter.status ? "No study in this state." : "No qualification study yet."}>
            {can(actor.role, "study:plan") ? "Plan one: choose the sterilizer, the loading pattern and the criteria." : "An engineer plans studies."}
          </EmptyState>
        ) : (
          <TableFrame label="Qualification studies">
            <table className="data-table" data-testid="studies-table">
              <thead>
                <tr>
                  <th>Study</th>
                  <th>Title</th>
                  <th>Sterilizer and pattern</th>
                  <th>Kind</th>
                  <th>State</th>
                  <th>Runs</th>
                  <th>Open deviations</th>
                </tr>
              </thead>
              <tbody>
                {rows.map((s) => (
                  <tr key={s.id}>
                    <td className="whitespace-nowrap font-medium">
                      <Link href={`/studies/${s.id}`} className="text-steam-700 hover:underline">
                        {s.studyNumber}
                      </Link>
                      <span className="block text-xs font-normal text-ink-muted">{formatDate(s.createdAt, timeZone)}</span>
                    </td>
                    <td className="text-sm">{s.title}</td>
                    <td className="text-sm">
                      {s.sterilizer.name}
                      <span className="block text-xs text-ink-muted">{s.loadingPattern.name}</span>
                    </td>
                    <td className="text-sm">{STUDY_KIND_LABELS[s.kind].split(" (")[0]}</td>
                    <td>
                      <StudyStatusBadge status={s.status} />
                    </td>
                    <td className="whitespace-nowrap text-sm">
                      {s.runsAttached} attached · {s.runsRequired} required
                    </td>
                    <td className={`text-sm ${s.openDeviations > 0 ? "font-semibold text-caution-700" : ""}`}>{s.openDeviations > 0 ? `⚠ ${s.openDeviations}` : "None"}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </TableFrame>
        )}
        <Pager page={page} pages={pages} href={pageHref} />
      </Panel>
    </>
  );
}

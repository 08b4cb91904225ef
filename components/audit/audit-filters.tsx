import Link from "next/link";

type Choice = { value: string; label: string };
export type AuditFilterValues = { person?: string; action?: string; record?: string; from?: string; to?: string };

/** The trail's filters as a plain GET form: the address holds the filter, so a filtered view can be linked and exported. */
export function AuditFilters({ values, people, actions, exportQuery }: { values: AuditFilterValues; people: Choice[]; actions: Choice[]; exportQuery: string }) {
  return (
    <form className="mb-4 grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-6 lg:items-end" role="search" aria-label="Filter the audit trail">
      <div>
        <label className="field-label" htmlFor="person">
          Person
        </label>
        <select id="person" name="person" defaultValue={values.person ?? ""} className="field-input w-full">
          <option value="">Anyone</option>
          {people.map((p) => (
            <option key={p.value} value={p.value}>
              {p.label}
            </option>
          ))}
        </select>
      </div>
      <div>
        <label className="field-label" htmlFor="action">
          Action
        </label>
        <select id="action" name="action" defaultValue={values.action ?? ""} className="field-input w-full">
          <option value="">Any action</option>
          {actions.map((a) => (
            <option key={a.value} value={a.value}>
              {a.label}
            </option>
          ))}
        </select>
      </div>
      <div>
        <label className="field-label" htmlFor="record">
          Record (cycle number or id)
        </label>
        <input id="record" name="record" defaultValue={values.record} className="field-input w-full" placeholder="e.g. a cycle number" />
      </div>
      <div>
        <label className="field-label" htmlFor="from">
          From (site date)
        </label>
        <input id="from" name="from" type="date" defaultValue={values.from} className="field-input w-full" />
      </div>
      <div>
        <label className="field-label" htmlFor="to">
          To (site date)
        </label>
        <input id="to" name="to" type="date" defaultValue={values.to} className="field-input w-full" />
      </div>
      <div className="flex flex-wrap gap-2">
        <button className="btn-secondary">Filter</button>
        <Link className="btn-secondary" href="/audit">
          Clear
        </Link>
      </div>
      <p className="text-sm sm:col-span-2 lg:col-span-6">
        Export these events:{" "}
        <a className="text-steam-700 underline" href={`/api/audit/export${exportQuery}`} download data-testid="export-csv">
          CSV
        </a>{" "}
        ·{" "}
        <a className="text-steam-700 underline" href={`/api/audit/extract${exportQuery}`} download data-testid="export-pdf">
          signed PDF extract
        </a>{" "}
        <span className="text-ink-muted">(each export is written to the ledger)</span>
      </p>
    </form>
  );
}

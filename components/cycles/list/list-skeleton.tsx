/** Placeholder rows while the list loads: the table's shape, without content. */
export function ListSkeletonRows({ columns, rows = 8 }: { columns: number; rows?: number }) {
  return (
    <>
      {Array.from({ length: rows }, (_, r) => (
        <tr key={r} aria-hidden="true">
          {Array.from({ length: columns }, (_, c) => (
            <td key={c}>
              <span className="block h-3.5 animate-pulse rounded bg-paper-sunk" style={{ width: `${55 + ((r * 7 + c * 13) % 40)}%` }} />
            </td>
          ))}
        </tr>
      ))}
    </>
  );
}

export function CycleListSkeleton({ withFilters = true }: { withFilters?: boolean }) {
  return (
    <div className="space-y-4" role="status" aria-label="Loading cycles">
      {withFilters && (
        <div className="panel flex flex-wrap gap-3 px-panel py-4">
          {Array.from({ length: 6 }, (_, i) => (
            <span key={i} className="block h-9 w-36 animate-pulse rounded-md bg-paper-sunk" />
          ))}
        </div>
      )}
      <div className="panel overflow-hidden">
        <table className="data-table">
          <tbody>
            <ListSkeletonRows columns={7} />
          </tbody>
        </table>
      </div>
      <span className="sr-only">Loading cycles…</span>
    </div>
  );
}

"use client";

import Link from "next/link";
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { useEffect, useId, useMemo, useRef, useState } from "react";
import useSWR from "swr";
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import type { CycleListItem, CycleListResponse } from "@/lib/cycles/contracts";
import { fetchJson, type RequestError } from "@/lib/client/fetch-json";
import { formatDateTime } from "@/lib/format";
import { StatusBadge, VerdictBadge } from "@/components/ui/badge";
import { EmptyState } from "@/components/ui/panel";
import { ListSkeletonRows } from "./list-skeleton";
import { PAGE_SIZES, apiListQuery, exportListQuery, hasFilters, readListQuery, writeListQuery, type CycleListQuery } from "./list-query";
import { CYCLE_STATUS_LABELS, CYCLE_STATUSES, testKindLabel } from "@/lib/domain";
import { TableFrame } from "@/components/ui/table-frame";

export type SterilizerOption = { id: string; name: string };

type Props = {
  sterilizers: SterilizerOption[];
  timeZone: string;
  /** filters the page fixes (the review queue: status=submitted); hidden from the filter bar */
  fixed?: Partial<Pick<CycleListQuery, "status">>;
  defaultSort: string;
  /** what to say when nothing at all is there yet */
  emptyTitle: string;
  emptyHint?: React.ReactNode;
  exportable?: boolean;
  caption: string;
};

const fetchList = (url: string) => fetchJson<CycleListResponse>(url, { what: "the cycle list" });

const STATUS_OPTIONS = CYCLE_STATUSES.map((value) => ({ value, label: CYCLE_STATUS_LABELS[value] }));

// Column id → the server's sort key; columns without one are not sortable.
const SORT_KEYS: Record<string, string | undefined> = {
  cycleNumber: "cycleNumber",
  startedAt: "startedAt",
  sterilizer: "sterilizer",
  verdict: "verdict",
  status: "status",
};

const column = createColumnHelper<CycleListItem>();

export function CyclesTable({ sterilizers, timeZone, fixed = {}, defaultSort, emptyTitle, emptyHint, exportable = true, caption }: Props) {
  const ids = useId();
  const router = useRouter();
  const pathname = usePathname();
  const searchParams = useSearchParams();
  const defaults = useMemo(() => ({ sort: defaultSort }), [defaultSort]);
  const query = useMemo(() => readListQuery(new URLSearchParams(searchParams.toString()), defaults), [searchParams, defaults]);

  const [searchText, setSearchText] = useState(query.q);
  useEffect(() => setSearchText((text) => (text.trim() === query.q.trim() ? text : query.q)), [query.q]);
  // Timers and handlers read the latest URL state, never the one of the render that created them.
  const latest = useRef(query);
  latest.current = query;

  function navigate(next: Partial<CycleListQuery>, resetPage = true) {
    const current = latest.current;
    const merged: CycleListQuery = { ...current, ...next, page: resetPage && next.page === undefined ? 1 : (next.page ?? current.page) };
    latest.current = merged;
    const qs = writeListQuery(merged, defaults);
    router.replace(qs ? `${pathname}?${qs}` : pathname, { scroll: false });
  }

  const key = `/api/cycles?${apiListQuery(query, fixed)}`;
  const { data, error, isLoading, isValidating, mutate } = useSWR<CycleListResponse, RequestError>(key, fetchList, { keepPreviousData: true, revalidateOnFocus: true });

  // Typing waits for a pause before it asks the server.
  useEffect(() => {
    if (searchText.trim() === latest.current.q.trim()) return;
    const timer = setTimeout(() => {
      if (searchText.trim() !== latest.current.q.trim()) navigate({ q: searchText });
    }, 350);
    return () => clearTimeout(timer);
    // eslint-disable-next-line react-hooks/exhaustive-deps -- navigate and query are read fresh when the timer fires
  }, [searchText]);

  // A page number past the end (an old link, rows gone) goes to the last page.
  useEffect(() => {
    if (data && data.total > 0 && data.items.length === 0 && query.page > 1) navigate({ page: Math.max(1, Math.ceil(data.total / data.pageSize)) }, false);
    // eslint-disable-next-line react-hooks/exhaustive-deps -- runs when new rows arrive, not when the query object is rebuilt
  }, [data]);

  const sorting: SortingState = useMemo(() => {
    const [id, dir] = query.sort.split(":");
    const columnId = Object.entries(SORT_KEYS).find(([, v]) => v === id)?.[0];
    return columnId ? [{ id: columnId, desc: dir === "desc" }] : [];
  }, [query.sort]);

  const columns = useMemo(
    () => [
      column.accessor("cycleNumber", {
        header: "Cycle",
        cell: (info) => (
          <Link href={`/cycles/${info.row.original.id}`} className="mono whitespace-nowrap font-medium text-steam-700 hover:underline" data-testid="cycle-link">
            {info.getValue()}
          </Link>
        ),
      }),
      column.accessor("startedAt", { header: "Started", cell: (info) => <span className="whitespace-nowrap">{formatDateTime(info.getValue(), timeZone)}</span> }),
      column.accessor((row) => row.sterilizer.name, { id: "sterilizer", header: "Sterilizer" }),
      column.accessor("testKind", { header: "Test", enableSorting: false, cell: (info) => testKindLabel(info.getValue()) }),
      column.accessor((row) => row.profile.name, { id: "profile", header: "Profile", enableSorting: false, cell: (info) => <span className="text-ink-soft">{info.getValue()}</span> }),
      column.accessor("verdict", {
        header: "Verdict",
        cell: (info) => (
          <span className="whitespace-nowrap">
            <VerdictBadge verdict={info.getValue()} />
          </span>
        ),
      }),
      column.accessor("status", {
        header: "Status",
        cell: (info) => (
          <span className="whitespace-nowrap">
            <StatusBadge status={info.getValue()} />
          </span>
        ),
      }),
      column.accessor("createdByName", { header: "Registered by", enableSorting: false, cell: (info) => <span className="text-ink-muted">{info.getValue()}</span> }),
    ],
    [timeZone],
  );

  const pageCount = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;
  // eslint-disable-next-line react-hooks/incompatible-library -- TanStack Table 8 returns fresh functions each render; the compiler leaves this component alone
  const table = useReactTable({
    data: data?.items ?? [],
    columns,
    getCoreRowModel: getCoreRowModel(),
    manualSorting: true,
    manualPagination: true,
    manualFiltering: true,
    enableMultiSort: false,
    sortDescFirst: true,
    pageCount,
    state: { sorting, pagination: { pageIndex: query.page - 1, pageSize: query.pageSize }, columnVisibility: { status: !("status" in fixed) } },
    onSortingChange: (updater) => {
      const next = typeof updater === "function" ? updater(sorting) : updater;
      const first = next[0];
      const sortKey = first ? SORT_KEYS[first.id] : undefined;
      navigate({ sort: sortKey ? `${sortKey}:${first!.desc ? "desc" : "asc"}` : defaultSort });
    },
    getRowId: (row) => row.id,
  });

  const filtersOn = hasFilters(query, fixed);
  const first = data && data.total > 0 ? (data.page - 1) * data.pageSize + 1 : 0;
  const last = data ? Math.min(data.total, data.page * data.pageSize) : 0;
  const exportHref = `/api/cycles/export${exportListQuery(query, fixed) ? `?${exportListQuery(query, fixed)}` : ""}`;

  return (
    <div className="space-y-4">
      <form
        role="search"
        aria-label="Filter cycles"
        className="panel flex flex-wrap items-end gap-3 px-panel py-4"
        onSubmit={(e) => {
          e.preventDefault();
          navigate({ q: searchText });
        }}
      >
        <div className="min-w-52 flex-1">
          <label className="field-label" htmlFor={`${ids}-q`}>
            Search
          </label>
          <input
            id={`${ids}-q`}
            type="search"
            className="field-input"
            placeholder="Cycle number, load, sterilizer"
            value={searchText}
            maxLength={100}
            onChange={(e) => setSearchText(e.target.value)}
          />
        </div>
        {!("status" in fixed) && (
          <div>
            <label className="field-label" htmlFor={`${ids}-status`}>
              Status
            </label>
            <select id={`${ids}-status`} className="field-input" value={query.status} onChange={(e) => navigate({ status: e.target.value as CycleListQuery["status"] })}>
              <option value="">Any</option>
              {STATUS_OPTIONS.map((s) => (
                <option key={s.value} value={s.value}>
                  {s.label}
                </option>
              ))}
            </select>
          </div>
        )}
        <div>
          <label className="field-label" htmlFor={`${ids}-verdict`}>
            Verdict
          </label>
          <select id={`${ids}-verdict`} className="field-input" value={query.verdict} onChange={(e) => navigate({ verdict: e.target.value as CycleListQuery["verdict"] })}>
            <option value="">Any</option>
            <option value="pass">Pass</option>
            <option value="fail">Fail</option>
          </select>
        </div>
        <div>
          <label className="field-label" htmlFor={`${ids}-sterilizer`}>
            Sterilizer
          </label>
          <select id={`${ids}-sterilizer`} className="field-input" value={query.sterilizer} onChange={(e) => navigate({ sterilizer: e.target.value })}>
            <option value="">All</option>
            {sterilizers.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label className="field-label" htmlFor={`${ids}-from`}>
            Started from
          </label>
          <input id={`${ids}-from`} type="date" className="field-input" value={query.from} max={query.to || undefined} onChange={(e) => navigate({ from: e.target.value })} />
        </div>
        <div>
          <label className="field-label" htmlFor={`${ids}-to`}>
            to
          </label>
          <input id={`${ids}-to`} type="date" className="field-input" value={query.to} min={query.from || undefined} onChange={(e) => navigate({ to: e.target.value })} />
        </div>
        {filtersOn && (
          <button
            type="button"
            className="btn-secondary"
            onClick={() => {
              setSearchText("");
              navigate({ status: "", verdict: "", sterilizer: "", from: "", to: "", q: "" });
            }}
          >
            Clear filters
          </button>
        )}
      </form>

      <div className="panel">
        <div className="flex flex-wrap items-center justify-between gap-3 border-b border-ink-line px-panel py-3">
          <p className="text-sm text-ink-soft" aria-live="polite" data-testid="list-count">
            {data ? (data.total === 0 ? "No cycles" : `${first}–${last} of ${data.total.toLocaleString("en-GB")} ${data.total === 1 ? "cycle" : "cycles"}`) : "Loading…"}
            {isValidating && data && <span className="ml-2 text-xs text-ink-faint">updating…</span>}
          </p>
          {exportable && data && data.total > 0 && (
            <a className="btn-secondary px-3 py-1.5 text-xs" href={exportHref} download data-testid="export-csv">
              Download CSV
            </a>
          )}
        </div>
        <TableFrame label="Cycles">
          <table className="data-table" data-testid="cycles-table">
            <caption className="sr-only">{caption}</caption>
            <thead>
              {table.getHeaderGroups().map((group) => (
                <tr key={group.id}>
                  {group.headers.map((header) => {
                    const sorted = header.column.getIsSorted();
                    const canSort = header.column.getCanSort() && SORT_KEYS[header.column.id] !== undefined;
                    return (
                      <th key={header.id} scope="col" aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : canSort ? "none" : undefined}>
                        {canSort ? (
                          <button type="button" className="inline-flex items-center gap-1 uppercase tracking-wide hover:text-ink" onClick={header.column.getToggleSortingHandler()}>
                            {flexRender(header.column.columnDef.header, header.getContext())}
                            <span aria-hidden="true" className={sorted ? "text-steam-700" : "text-ink-faint"}>
                              {sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}
                            </span>
                          </button>
                        ) : (
                          flexRender(header.column.columnDef.header, header.getContext())
                        )}
                      </th>
                    );
                  })}
                </tr>
              ))}
            </thead>
            <tbody className={isValidating && data ? "opacity-70 transition-opacity" : ""}>
              {isLoading && !data ? (
                <ListSkeletonRows columns={columns.length} />
              ) : (
                table.getRowModel().rows.map((row) => (
                  <tr
                    key={row.id}
                    className="cursor-pointer hover:bg-paper-sunk/50"
                    onClick={(e) => {
                      if ((e.target as HTMLElement).closest("a,button")) return;
                      router.push(`/cycles/${row.original.id}`);
                    }}
                  >
                    {row.getVisibleCells().map((cell) => (
                      <td key={cell.id}>{flexRender(cell.column.columnDef.cell, cell.getContext())}</td>
                    ))}
                  </tr>
                ))
              )}
            </tbody>
          </table>
        </TableFrame>
        {error && (
          <div className="border-t border-ink-line px-panel py-4 text-sm text-fail-700" role="alert">
            {error.status === 401 ? "Your session has ended; sign in again to see the list." : error.message}{" "}
            <button type="button" className="underline" onClick={() => void mutate()}>
              Try again
            </button>
          </div>
        )}
        {data && data.total === 0 && !error && (
          <div className="px-panel py-6" data-testid="list-empty">
            {filtersOn ? <EmptyState title="No cycles match these filters.">Widen the dates or clear the filters.</EmptyState> : <EmptyState title={emptyTitle}>{emptyHint}</EmptyState>}
          </div>
        )}
        {data && data.total > 0 && (
          <nav className="flex flex-wrap items-center justify-between gap-3 border-t border-ink-line px-panel py-3 text-sm" aria-label="Pages">
            <div className="flex items-center gap-2">
              <label htmlFor={`${ids}-size`} className="text-ink-muted">
                Rows per page
              </label>
              <select id={`${ids}-size`} className="field-input w-20 py-1" value={query.pageSize} onChange={(e) => navigate({ pageSize: Number(e.target.value) })}>
                {PAGE_SIZES.map((n) => (
                  <option key={n} value={n}>
                    {n}
                  </option>
                ))}
              </select>
            </div>
            <div className="flex items-center gap-2">
              <button type="button" className="btn-secondary px-2.5 py-1" disabled={query.page <= 1} onClick={() => navigate({ page: 1 }, false)} aria-label="First page">
                «
              </button>
              <button type="button" className="btn-secondary px-2.5 py-1" disabled={query.page <= 1} onClick={() => navigate({ page: query.page - 1 }, false)}>
                Previous
              </button>
              <span className="px-1 text-ink-soft" data-testid="page-indicator">
                Page {Math.min(query.page, pageCount)} of {pageCount}
              </span>
              <button type="button" className="btn-secondary px-2.5 py-1" disabled={query.page >= pageCount} onClick={() => navigate({ page: query.page + 1 }, false)}>
                Next
              </button>
              <button type="button" className="btn-secondary px-2.5 py-1" disabled={query.page >= pageCount} onClick={() => navigate({ page: pageCount }, false)} aria-label="Last page">
                »
              </button>
            </div>
          </nav>
        )}
      </div>
    </div>
  );
}

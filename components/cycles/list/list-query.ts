import { CYCLE_STATUSES, VERDICTS, type CycleStatus, type Verdict } from "@/lib/domain";

/** The list's state as it sits in the URL and in GET /api/cycles. */
export type CycleListQuery = {
  status: CycleStatus | "";
  verdict: Verdict | "";
  sterilizer: string;
  from: string;
  to: string;
  q: string;
  page: number;
  pageSize: number;
  sort: string;
};

export const PAGE_SIZES = [10, 25, 50, 100] as const;
const SORT_RE = /^(startedAt|createdAt|cycleNumber|status|verdict|sterilizer|submittedAt):(asc|desc)$/;
const DATE_RE = /^\d{4}-\d{2}-\d{2}$/;

export function readListQuery(params: URLSearchParams, defaults: { sort: string; pageSize?: number }): CycleListQuery {
  const status = params.get("status") ?? "";
  const verdict = params.get("verdict") ?? "";
  const page = Number(params.get("page") ?? "1");
  const pageSize = Number(params.get("pageSize") ?? String(defaults.pageSize ?? 25));
  const sort = params.get("sort") ?? "";
  const from = params.get("from") ?? "";
  const to = params.get("to") ?? "";
  return {
    status: (CYCLE_STATUSES as readonly string[]).includes(status) ? (status as CycleStatus) : "",
    verdict: (VERDICTS as readonly string[]).includes(verdict) ? (verdict as Verdict) : "",
    sterilizer: params.get("sterilizer") ?? "",
    from: DATE_RE.test(from) ? from : "",
    to: DATE_RE.test(to) ? to : "",
    q: (params.get("q") ?? "").slice(0, 100),
    page: Number.isInteger(page) && page >= 1 ? page : 1,
    pageSize: (PAGE_SIZES as readonly number[]).includes(pageSize) ? pageSize : (defaults.pageSize ?? 25),
    sort: SORT_RE.test(sort) ? sort : defaults.sort,
  };
}

/** Query string for the URL and the API; values equal to the defaults are left out to keep links short. */
export function writeListQuery(query: CycleListQuery, defaults: { sort: string; pageSize?: number }, options: { paging: boolean } = { paging: true }): string {
  const params = new URLSearchParams();
  if (query.status) params.set("status", query.status);
  if (query.verdict) params.set("verdict", query.verdict);
  if (query.sterilizer) params.set("sterilizer", query.sterilizer);
  if (query.from) params.set("from", query.from);
  if (query.to) params.set("to", query.to);
  if (query.q.trim()) params.set("q", query.q.trim());
  if (query.sort !== defaults.sort) params.set("sort", query.sort);
  if (options.paging) {
    if (query.page > 1) params.set("page", String(query.page));
    if (query.pageSize !== (defaults.pageSize ?? 25)) params.set("pageSize", String(query.pageSize));
  }
  return params.toString();
}

/** The API always gets the sort, so that the server never has to guess the default. */
export function apiListQuery(query: CycleListQuery, fixed: Partial<CycleListQuery>): string {
  const merged = { ...query, ...fixed };
  const params = new URLSearchParams(writeListQuery(merged, { sort: "" }, { paging: false }));
  params.set("page", String(merged.page));
  params.set("pageSize", String(merged.pageSize));
  return params.toString();
}

export function exportListQuery(query: CycleListQuery, fixed: Partial<CycleListQuery>): string {
  return writeListQuery({ ...query, ...fixed }, { sort: "" }, { paging: false });
}

export function hasFilters(query: CycleListQuery, fixed: Partial<CycleListQuery>): boolean {
  const keys = ["status", "verdict", "sterilizer", "from", "to", "q"] as const;
  return keys.some((k) => !(k in fixed) && String(query[k]).trim() !== "");
}

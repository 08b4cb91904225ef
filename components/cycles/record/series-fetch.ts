"use client";

import useSWR from "swr";
import type { SeriesResponse } from "@/lib/cycles/contracts";
import { OVERVIEW_POINTS, seriesUrl, type TimeWindow } from "@/lib/cycles/chart-model";
import { fetchJson, type RequestError } from "@/lib/client/fetch-json";

/** Points asked for the whole-record view; the time chart and the phase diagram share this request (and the server keeps it ready). */
export { OVERVIEW_POINTS };
/** Points asked for a zoomed window or the plateau: up to this many samples come at full resolution. */
export const WINDOW_POINTS = 4000;

const fetchSeries = (url: string) => fetchJson<SeriesResponse>(url, { what: "the chart data" });

const SWR_OPTIONS = { revalidateOnFocus: false, revalidateOnReconnect: false, shouldRetryOnError: false, keepPreviousData: true } as const;

export function useSeries(cycleId: string, window: TimeWindow | null, points: number, enabled = true) {
  return useSWR<SeriesResponse, RequestError>(enabled ? seriesUrl(cycleId, { points, window }) : null, fetchSeries, SWR_OPTIONS);
}

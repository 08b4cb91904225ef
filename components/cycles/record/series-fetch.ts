"use client";

import useSWR from "swr";
import type { SeriesResponse } from "@/lib/cycles/contracts";
import { seriesUrl, type TimeWindow } from "@/lib/cycles/chart-model";

/** Points asked for the whole-record view; the time chart and the phase diagram share this request. */
export const OVERVIEW_POINTS = 2400;
/** Points asked for a zoomed window or the plateau: up to this many samples come at full resolution. */
export const WINDOW_POINTS = 4000;

export class SeriesFetchError extends Error {}

async function fetchSeries(url: string): Promise<SeriesResponse> {
  let response: Response;
  try {
    response = await fetch(url, { headers: { accept: "application/json" } });
  } catch {
    throw new SeriesFetchError("The chart data could not be reached. Check the connection and try again.");
  }
  if (!response.ok) {
    let message = `The chart data could not be loaded (HTTP ${response.status}).`;
    try {
      const body = (await response.json()) as { error?: string };
      if (body.error) message = body.error;
    } catch {
      // not JSON: keep the status message
    }
    throw new SeriesFetchError(message);
  }
  return (await response.json()) as SeriesResponse;
}

const SWR_OPTIONS = { revalidateOnFocus: false, revalidateOnReconnect: false, shouldRetryOnError: false, keepPreviousData: true } as const;

export function useSeries(cycleId: string, window: TimeWindow | null, points: number, enabled = true) {
  return useSWR<SeriesResponse, Error>(enabled ? seriesUrl(cycleId, { points, window }) : null, fetchSeries, SWR_OPTIONS);
}

"use client";

import type { Busy } from "./use-logger-files";

const STAGE_TEXT: Record<NonNullable<Busy>["label"], string> = {
  "Reading the file": "Reading the file…",
  Analysing: "Analysing…",
  "Opening the record": "Analysed. Opening the record…",
};

/** Upload progress with a Cancel button, then a pulsing bar while the server works. */
export function ProgressLine({ busy }: { busy: NonNullable<Busy> }) {
  const uploading = busy.progress.stage === "uploading";
  const fraction = busy.progress.stage === "uploading" ? busy.progress.fraction : 1;
  return (
    <div className="rounded-md border border-steam-100 bg-steam-50 px-4 py-3" role="status" aria-live="polite" data-testid="intake-progress">
      <div className="flex items-center justify-between gap-3 text-sm">
        <span className="font-medium text-steam-700">{uploading ? `Uploading… ${Math.round(fraction * 100)} %` : STAGE_TEXT[busy.label]}</span>
        {uploading && (
          <button type="button" className="text-xs text-steam-700 underline" onClick={busy.cancel}>
            Cancel
          </button>
        )}
      </div>
      <div className="mt-2 h-1.5 overflow-hidden rounded-full bg-steam-100" aria-hidden="true">
        <div className={`h-full rounded-full bg-steam-500 transition-[width] ${uploading ? "" : "animate-pulse"}`} style={{ width: `${Math.max(3, Math.round(fraction * 100))}%` }} />
      </div>
      {!uploading && busy.label === "Analysing" && <p className="mt-1 text-xs text-ink-muted">The server is checking every sample; a day-long file takes a few seconds.</p>}
    </div>
  );
}

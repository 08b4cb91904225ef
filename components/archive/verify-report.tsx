"use client";

import Link from "next/link";
import { useState } from "react";
import { useDropzone } from "react-dropzone";
import { fetchJson } from "@/lib/client/fetch-json";
import { ActionMessage } from "@/components/ui/action-message";

type Outcome =
  | { match: true; kind?: undefined; sha256: string; cycleId: string; reportNumber: string; cycleNumber: string; archivedAt: string }
  | { match: true; kind: "audit-extract"; sha256: string; seq: number; exportedAt: string; exportedBy: string | null; events: number | null }
  | { match: false; sha256: string; problem?: string };

export function VerifyReport() {
  const [outcome, setOutcome] = useState<Outcome | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [name, setName] = useState<string>("");

  async function check(file: File) {
    setBusy(true);
    setError(null);
    setOutcome(null);
    setName(file.name);
    try {
      const form = new FormData();
      form.set("file", file);
      setOutcome(await fetchJson<Outcome>("/api/reports/verify", { form, what: "the archive check" }));
    } catch (e) {
      setError(e instanceof Error ? e.message : "The check failed.");
    } finally {
      setBusy(false);
    }
  }

  const { getRootProps, getInputProps, isDragActive } = useDropzone({
    multiple: false,
    accept: { "application/pdf": [".pdf"] },
    maxSize: 50 * 1024 * 1024,
    onDropAccepted: (files) => void check(files[0]),
    onDropRejected: (rejections) => setError(rejections[0]?.errors[0]?.code === "file-too-large" ? "That file is over 50 MB; archived reports are much smaller." : "Drop one PDF file."),
  });

  return (
    <div className="space-y-3">
      <div
        {...getRootProps({
          className: `cursor-pointer rounded-md border-2 border-dashed px-4 py-8 text-center text-sm ${isDragActive ? "border-steam-500 bg-steam-50" : "border-ink-line bg-paper"}`,
          "aria-label": "Drop a report PDF here, or press Enter to choose one",
        })}
      >
        <input {...getInputProps()} data-testid="verify-input" />
        <p className="font-medium">{busy ? "Checking…" : "Drop a report PDF here, or click to choose one"}</p>
        <p className="mt-1 text-xs text-ink-muted">The file is compared byte for byte with the archive; nothing is stored but the check itself, in the audit ledger.</p>
      </div>
      {error && <ActionMessage state={{ status: "error", message: error }} />}
      {outcome && (
        <div role="status" data-testid="verify-outcome" className={`rounded-md px-3 py-2 text-sm ${outcome.match ? "bg-pass-50 text-pass-700" : "bg-fail-50 text-fail-700"}`}>
          {outcome.match && outcome.kind === "audit-extract" ? (
            <p>
              ✓ <strong>{name}</strong> is byte for byte the audit-trail extract{outcome.events === null ? "" : ` of ${outcome.events} events`} exported by {outcome.exportedBy ?? "an unknown person"}{" "}
              on {new Date(outcome.exportedAt).toUTCString()}, as ledger event {outcome.seq} recorded it.
            </p>
          ) : outcome.match ? (
            <p>
              ✓ <strong>{name}</strong> is byte for byte the archived report <span className="mono">{outcome.reportNumber}</span> of cycle{" "}
              <Link className="underline" href={`/cycles/${outcome.cycleId}`}>
                {outcome.cycleNumber}
              </Link>
              , archived {new Date(outcome.archivedAt).toUTCString()}.
            </p>
          ) : (
            <p>
              ✕ <strong>{name}</strong> does not match any archived report of this site. {outcome.problem ?? "It may have been altered, or it is a draft."}
            </p>
          )}
          <p className="mono mt-1 break-all opacity-80">SHA-256 {outcome.sha256}</p>
        </div>
      )}
    </div>
  );
}

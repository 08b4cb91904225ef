"use client";

import Link from "next/link";
import { useReducer, useRef } from "react";
import { useDropzone } from "react-dropzone";
import { fetchJson } from "@/lib/client/fetch-json";
import { ActionMessage } from "@/components/ui/action-message";
import { plural } from "@/lib/domain";
import { VERIFY_IDLE, verifyReducer, type VerifyOutcome } from "./verify-state";

export function VerifyReport() {
  const [state, dispatch] = useReducer(verifyReducer, VERIFY_IDLE);
  const checks = useRef(0);
  const { outcome, error, busy, name } = state;

  async function check(file: File) {
    dispatch({ type: "start", name: file.name });
    const current = ++checks.current;
    try {
      const form = new FormData();
      form.set("file", file);
      dispatch({ type: "answered", check: current, outcome: await fetchJson<VerifyOutcome>("/api/reports/verify", { form, what: "the archive check" }) });
    } catch (e) {
      dispatch({ type: "failed", check: current, error: e instanceof Error ? e.message : "The check failed." });
    }
  }

  function refuse(name: string, error: string) {
    checks.current++;
    dispatch({ type: "refused", name, error });
  }

  const { getRootProps, getInputProps, isDragActive } = useDropzone({
    multiple: false,
    accept: { "application/pdf": [".pdf"] },
    maxSize: 50 * 1024 * 1024,
    onDropAccepted: (files) => void check(files[0]),
    onDropRejected: (rejections) =>
      refuse(rejections[0]?.file.name ?? "", rejections[0]?.errors[0]?.code === "file-too-large" ? "That file is over 50 MB; archived reports are much smaller." : "Drop one PDF file."),
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
              ✓ <strong>{name}</strong> is byte for byte the audit-trail extract{outcome.events === null ? "" : ` of ${plural(outcome.events, "event")}`} exported by{" "}
              {outcome.exportedBy ?? "an unknown person"} on {new Date(outcome.exportedAt).toUTCString()}, as ledger event {outcome.seq} recorded it.
            </p>
          ) : outcome.match && outcome.kind === "study-report" ? (
            <p>
              ✓ <strong>{name}</strong> is byte for byte the archived report <span className="mono">{outcome.reportNumber}</span> of qualification study{" "}
              <Link className="underline" href={`/studies/${outcome.studyId}`}>
                {outcome.studyNumber}
              </Link>
              , archived {new Date(outcome.archivedAt).toUTCString()}.
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

"use client";

import { formatBytes } from "@/lib/format";
import { Panel } from "@/components/ui/panel";
import { LoggerDropzone } from "./logger-dropzone";
import { MAX_FILES, type LoggerFiles } from "./use-logger-files";

type Props = {
  logger: LoggerFiles;
  limitMb: number;
  busy: boolean;
  onFiles: (files: File[]) => void;
  onRemove: (index: number) => void;
};

/** Step 1: the drop area, then the list of files with the first one marked as the one analysed. */
export function FilePanel({ logger, limitMb, busy, onFiles, onRemove }: Props) {
  const { files, rejections, fileError } = logger;
  return (
    <Panel title="1 · Logger file">
      {files.length === 0 ? (
        <LoggerDropzone limitMb={limitMb} disabled={busy} onFiles={onFiles} onRejected={logger.setRejections} />
      ) : (
        <div className="grid items-start gap-4 lg:grid-cols-[1fr_16rem]">
          <ul className="divide-y divide-ink-line/60 rounded-md border border-ink-line" aria-label="Files for this cycle">
            {files.map((file, i) => (
              <li key={`${file.name}-${i}`} className="flex items-center justify-between gap-3 px-3 py-2 text-sm">
                <div className="min-w-0">
                  <p className="mono truncate font-medium">{file.name}</p>
                  <p className="text-xs text-ink-muted">
                    {formatBytes(file.size)} · {i === 0 ? "analysed as this cycle's logger file" : "kept with the record, not analysed"}
                  </p>
                </div>
                <button type="button" className="btn-secondary px-2 py-1 text-xs" disabled={busy} onClick={() => onRemove(i)} aria-label={`Remove ${file.name}`}>
                  Remove
                </button>
              </li>
            ))}
          </ul>
          <LoggerDropzone limitMb={limitMb} compact disabled={busy || files.length >= MAX_FILES} onFiles={onFiles} onRejected={logger.setRejections} />
        </div>
      )}
      <p className="mt-3 text-xs text-ink-muted">
        One cycle per upload. The first file is read and analysed; further files (a second logger&apos;s export, a printout saved as text) are stored with the record, unanalysed. The original bytes of
        every file are kept with their SHA-256.
      </p>
      {rejections.length > 0 && (
        <ul className="mt-3 space-y-1" role="alert" data-testid="dropzone-rejections">
          {rejections.map((r) => (
            <li key={r} className="field-error text-sm">
              {r}
            </li>
          ))}
        </ul>
      )}
      {fileError && (
        <p className="field-error mt-3 text-sm" role="alert" data-testid="file-error">
          {fileError}
        </p>
      )}
    </Panel>
  );
}

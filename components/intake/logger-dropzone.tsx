"use client";

import { useDropzone, type FileRejection } from "react-dropzone";
import { LOGGER_FILE_EXTENSIONS } from "@/lib/validations/intake";

const ACCEPT = {
  "text/csv": [".csv"],
  "text/tab-separated-values": [".tsv"],
  "text/plain": [".txt", ".log", ".dat"],
  "application/octet-stream": [".dat", ".log"],
};

/** Plain sentences for the files the drop area refused, one per file. */
export function describeRejections(rejections: readonly FileRejection[], limitMb: number): string[] {
  return rejections.map(({ file, errors }) => {
    const codes = errors.map((e) => e.code);
    if (codes.includes("file-too-large")) {
      return `${file.name} is ${(file.size / 1048576).toFixed(1)} MB; the limit is ${limitMb} MB per file. Split the export or ask an administrator to raise the limit.`;
    }
    if (codes.includes("file-invalid-type")) {
      return `${file.name} is not a logger text file: Papin reads ${LOGGER_FILE_EXTENSIONS.join(", ")} exports.`;
    }
    if (codes.includes("file-too-small")) return `${file.name} is empty.`;
    if (codes.includes("too-many-files")) return `${file.name} was not added: at most 10 files go with one cycle.`;
    return `${file.name}: ${errors.map((e) => e.message).join("; ")}`;
  });
}

export function LoggerDropzone({
  limitMb,
  disabled,
  compact,
  onFiles,
  onRejected,
}: {
  limitMb: number;
  disabled?: boolean;
  compact?: boolean;
  onFiles: (files: File[]) => void;
  onRejected: (messages: string[]) => void;
}) {
  const { getRootProps, getInputProps, isDragActive, isDragReject, isFocused } = useDropzone({
    accept: ACCEPT,
    maxSize: limitMb * 1024 * 1024,
    minSize: 1,
    maxFiles: 10,
    multiple: true,
    disabled,
    onDrop: (accepted, rejected) => {
      onRejected(describeRejections(rejected, limitMb));
      if (accepted.length > 0) onFiles(accepted);
    },
  });
  const tone = isDragReject ? "border-fail-500 bg-fail-50" : isDragActive ? "border-steam-500 bg-steam-50" : isFocused ? "border-steam-500" : "border-ink-line hover:border-steam-500";
  // The file input sits beside the drop area, not in it: a control inside a role="button" is nested interaction.
  return (
    <>
      <input {...getInputProps({ "aria-label": "Choose logger files" })} data-testid="logger-file-input" />
      <div
        {...getRootProps({
          role: "button",
          "aria-label": `Logger files: drop them here, or press Enter to choose. ${LOGGER_FILE_EXTENSIONS.join(", ")}, up to ${limitMb} MB each.`,
          "aria-disabled": disabled || undefined,
        })}
        data-testid="logger-dropzone"
        className={`flex cursor-pointer flex-col items-center justify-center rounded-panel border-2 border-dashed text-center transition-colors ${compact ? "px-4 py-4" : "px-6 py-10"} ${tone} ${disabled ? "cursor-not-allowed opacity-60" : ""}`}
      >
        <svg aria-hidden="true" viewBox="0 0 24 24" className={`${compact ? "h-6 w-6" : "h-9 w-9"} text-steam-600`} fill="none" stroke="currentColor" strokeWidth="1.6">
          <path d="M12 16V4m0 0-4 4m4-4 4 4" strokeLinecap="round" strokeLinejoin="round" />
          <path d="M4 16v2a2 2 0 0 0 2 2h12a2 2 0 0 0 2-2v-2" strokeLinecap="round" />
        </svg>
        <p className="mt-2 text-sm font-medium">
          {isDragReject ? "These files cannot be used" : isDragActive ? "Drop to add" : compact ? "Add more files" : "Drop the logger file here, or click to choose it"}
        </p>
        <p className="mt-1 text-xs text-ink-muted">
          {LOGGER_FILE_EXTENSIONS.join(" ")} · up to {limitMb} MB per file
        </p>
      </div>
    </>
  );
}

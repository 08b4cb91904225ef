"use client";

import { useEffect, useRef, useState } from "react";
import { useDropzone } from "react-dropzone";
import { checkIndicatorPhoto, INDICATOR_PHOTO_MAX_BYTES } from "@/lib/periodic-tests/bowie-dick";

/**
 * The photo of an indicator sheet: a drop area (JPEG or PNG, up to 10 MB) whose chosen file sits
 * in a real file input named `name`, so the surrounding form sends it. The content is checked
 * here for a quick answer and again on the server, which alone decides.
 */
export function IndicatorPhotoField({ id, name = "photo", error, disabled, resetKey }: { id: string; name?: string; error?: string; disabled?: boolean; resetKey?: unknown }) {
  const inputRef = useRef<HTMLInputElement>(null);
  const [chosen, setChosen] = useState<{ name: string; size: number; preview: string } | null>(null);
  const [problem, setProblem] = useState<string | null>(null);

  useEffect(() => () => (chosen ? URL.revokeObjectURL(chosen.preview) : undefined), [chosen]);
  useEffect(() => {
    // A saved form starts again with no photo.
    if (inputRef.current) inputRef.current.value = "";
    setChosen(null); // eslint-disable-line react-hooks/set-state-in-effect -- cleared once per successful save
    setProblem(null);
  }, [resetKey]);

  async function choose(file: File) {
    const check = checkIndicatorPhoto({ name: file.name, bytes: new Uint8Array(await file.slice(0, 16).arrayBuffer()) });
    const tooBig = file.size > INDICATOR_PHOTO_MAX_BYTES;
    if (tooBig || !check.ok) {
      setProblem(tooBig ? `${file.name} is ${(file.size / 1048576).toFixed(1)} MB; the photo of the indicator sheet may be at most 10 MB.` : check.ok ? null : check.message);
      if (inputRef.current) inputRef.current.value = "";
      setChosen(null);
      return;
    }
    const transfer = new DataTransfer();
    transfer.items.add(file);
    if (inputRef.current) inputRef.current.files = transfer.files;
    setProblem(null);
    setChosen({ name: file.name, size: file.size, preview: URL.createObjectURL(file) });
  }

  const { getRootProps, isDragActive } = useDropzone({
    multiple: false,
    disabled,
    noClick: true,
    noKeyboard: true,
    onDrop: (accepted) => {
      if (accepted[0]) void choose(accepted[0]);
    },
  });
  const shown = problem ?? error;
  return (
    <div
      {...getRootProps()}
      data-testid="indicator-photo-drop"
      className={`rounded-panel border-2 border-dashed px-4 py-4 ${isDragActive ? "border-steam-500 bg-steam-50" : shown ? "border-fail-500" : "border-ink-line"}`}
    >
      <label htmlFor={id} className="field-label">
        Photo of the indicator sheet
      </label>
      <p className="text-xs text-ink-muted" id={`${id}-hint`}>
        Drop a JPEG or PNG here or choose one (up to 10 MB). Photograph the whole sheet, flat and evenly lit.
      </p>
      <input
        ref={inputRef}
        id={id}
        name={name}
        type="file"
        accept="image/jpeg,image/png"
        disabled={disabled}
        aria-invalid={!!shown}
        aria-describedby={`${id}-hint${shown ? ` ${id}-error` : ""}`}
        className="mt-2 block text-sm"
        data-testid="indicator-photo-input"
        onChange={(e) => {
          const file = e.currentTarget.files?.[0];
          if (file) void choose(file);
          else setChosen(null);
        }}
      />
      {chosen && (
        <div className="mt-2 flex items-center gap-3">
          {/* eslint-disable-next-line @next/next/no-img-element -- a local preview (blob: URL), not an optimisable asset */}
          <img src={chosen.preview} alt="Preview of the chosen indicator sheet photo" className="h-20 w-auto rounded border border-ink-line object-contain" />
          <span className="text-xs text-ink-muted">
            {chosen.name} · {(chosen.size / 1048576).toFixed(2)} MB
          </span>
        </div>
      )}
      {shown && (
        <p className="field-error" id={`${id}-error`} role="alert">
          {shown}
        </p>
      )}
    </div>
  );
}

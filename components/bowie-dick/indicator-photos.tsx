import { formatBytes, formatDateTime } from "@/lib/format";

export type IndicatorPhotoView = { id: string; name: string; contentType: string; sizeBytes: number; sha256: string; url: string; uploadedAt?: string };

/** The stored photos of an indicator sheet, each with its name, size and SHA-256. */
export function IndicatorPhotos({ photos, timeZone }: { photos: IndicatorPhotoView[]; timeZone: string }) {
  if (photos.length === 0) return <p className="text-sm text-fail-700">No photo of the indicator sheet is stored with this record.</p>;
  return (
    <ul className="space-y-4">
      {photos.map((p) => (
        <li key={p.id}>
          <a href={p.url} target="_blank" rel="noreferrer" className="inline-block">
            {/* eslint-disable-next-line @next/next/no-img-element -- served by a guarded route handler, not a static asset */}
            <img src={p.url} alt={`Indicator sheet photo ${p.name}`} className="max-h-96 w-auto rounded border border-ink-line object-contain" data-testid="indicator-photo" />
          </a>
          <p className="mt-1 text-xs text-ink-muted">
            {p.name} · {p.contentType} · {formatBytes(p.sizeBytes)}
            {p.uploadedAt ? ` · uploaded ${formatDateTime(p.uploadedAt, timeZone)}` : ""}
          </p>
          <p className="mono break-all text-xs text-ink-faint">SHA-256 {p.sha256}</p>
        </li>
      ))}
    </ul>
  );
}

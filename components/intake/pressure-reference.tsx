"use client";

/** Where the absolute/gauge reading of the pressure column came from; null while nobody has said (the file has no marker). */
export type GaugeSource = "header" | "saved" | "user" | null;

/** The unit part of a header that carries the marker: "Chamber (kPa abs)" → "kPa abs"; the whole header when nothing is bracketed. */
function markerOf(header: string): string {
  const bracketed = /[([]([^)\]]+)[)\]]/.exec(header);
  return bracketed ? bracketed[1].trim() : header;
}

function caption(gauge: boolean | null, from: GaugeSource, header: string): string {
  const kind = gauge ? "gauge" : "absolute";
  if (from === "header") return `${kind}, from the header “${markerOf(header)}”`;
  if (from === "saved") return `${kind}, as confirmed in the instrument's saved mapping`;
  if (from === "user") return `${kind}, chosen by you`;
  return "The header does not say whether this is absolute or gauge pressure: choose one.";
}

/**
 * Absolute or gauge for the chamber pressure. A header marker or a saved confirmation is shown and
 * can be corrected; without either, neither radio is selected and the analysis waits for a choice.
 */
export function PressureReferenceChoice({
  header,
  gauge,
  from,
  name,
  error,
  onChoose,
}: {
  header: string;
  gauge: boolean | null;
  from: GaugeSource;
  name: string;
  error: string | null;
  onChoose: (gauge: boolean) => void;
}) {
  const errorId = `${name}-error`;
  const open = gauge === null;
  return (
    <div className="space-y-1" data-testid="pressure-reference" data-source={from ?? "none"}>
      <div className="flex gap-2 text-xs" role="radiogroup" aria-label={`Gauge or absolute: ${header}`} aria-invalid={error ? true : undefined} aria-describedby={error ? errorId : undefined}>
        <label className="flex items-center gap-1">
          <input type="radio" name={name} checked={gauge === false} onChange={() => onChoose(false)} />
          absolute
        </label>
        <label className="flex items-center gap-1">
          <input type="radio" name={name} checked={gauge === true} onChange={() => onChoose(true)} />
          gauge
        </label>
      </div>
      <p className={`text-2xs leading-snug ${open ? "text-caution-700" : "text-ink-muted"}`} data-testid="pressure-reference-source">
        {caption(gauge, from, header)}
      </p>
      {error && (
        <p id={errorId} className="field-error text-2xs leading-snug" data-field-error="pressureReference">
          {error}
        </p>
      )}
    </div>
  );
}
